import { createQueryKeys } from '@/lib/query-keys';

export const partKeys = createQueryKeys('parts');
export const supplierKeys = createQueryKeys('suppliers');
