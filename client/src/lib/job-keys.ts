import { createQueryKeys } from './query-keys';

/**
 * The jobs key root, shared by the features that hang data under a job (estimate, checklist,
 * findings, time) without importing the jobs feature.
 */
export const jobKeysBase = createQueryKeys('jobs');
