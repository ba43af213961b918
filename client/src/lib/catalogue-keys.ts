import { createQueryKeys } from './query-keys';

/**
 * Parts and suppliers: the catalogue feature edits them, and the estimate builder, the template
 * editor and the finding form pick from them, so their lists live here rather than in one feature.
 */

export const partKeys = createQueryKeys('parts');
export const supplierKeys = createQueryKeys('suppliers');
