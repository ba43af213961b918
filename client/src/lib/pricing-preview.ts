import { priceEstimate, type VatRateCode, type WorkshopPricing } from '@wingstage/shared';

export const VAT_RATE_LABELS: Record<VatRateCode, string> = {
  standard: 'Standard',
  reduced: 'Reduced',
  zero: 'Zero-rated',
  exempt: 'Exempt',
  outside: 'Outside the scope',
};

export function vatRateLabel(code: VatRateCode, pricing?: Pick<WorkshopPricing, 'vatRates'>): string {
  const pct = pricing && (code === 'standard' || code === 'reduced' || code === 'zero') ? ` (${pricing.vatRates[code]}%)` : '';
  return `${VAT_RATE_LABELS[code]}${pct}`;
}

/**
 * The sell price of one unit of a part, excl. VAT, asked of the pricing engine itself (a one-line
 * estimate) so the form never carries a second mark-up formula. Null while the inputs are not yet
 * valid numbers (the person is still typing).
 */
export function partSellPrice(
  part: { unitCost: string; unitPrice: string | null; markupPercent: string | null; vatRate: VatRateCode },
  pricing: WorkshopPricing,
): string | null {
  try {
    const priced = priceEstimate(
      {
        lines: [
          {
            id: 'preview',
            stage: 'inspection',
            kind: 'part',
            quantity: '1',
            unitCost: part.unitCost || null,
            unitPrice: part.unitPrice || null,
            markupPercent: part.markupPercent || null,
            vatRate: part.vatRate,
          },
        ],
      },
      pricing,
    );
    return priced.lines[0]?.net ?? null;
  } catch {
    return null;
  }
}
