import type { VatRounding } from './pricing/vat.js';

/**
 * The VAT rounding methods in words, for the settings page and the documents. Wording follows the
 * options HMRC VAT Notice 700 §17.5 allows: VAT on the invoice total rounded down (or to the
 * nearest penny), or worked out per line.
 */
export const VAT_ROUNDING_LABELS: Record<VatRounding, string> = {
  'invoice-down': 'On the invoice total, rounded down to the penny',
  'invoice-nearest': 'On the invoice total, rounded to the nearest penny',
  'line-nearest': 'On each line, rounded to the nearest penny',
  'line-down-tenth': 'On each line, rounded down to a tenth of a penny, the total rounded down',
};

/** The label for a stored method, or the stored text itself for one Wingstage no longer offers. */
export function vatRoundingWords(r: string): string {
  return (VAT_ROUNDING_LABELS as Record<string, string>)[r] ?? r;
}
