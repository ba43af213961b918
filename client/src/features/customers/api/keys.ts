import { createQueryKeys } from '@/lib/query-keys';

export const customerKeys = createQueryKeys('customers');
