import { createQueryKeys } from '@/lib/query-keys';

export const templateKeys = createQueryKeys('templates');
