import { createQueryKeys } from '@/lib/query-keys';

export const aircraftKeys = createQueryKeys('aircraft');
