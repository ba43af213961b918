import { workshopPricingFrom } from '@wingstage/shared';
import { describe, expect, it } from 'vitest';
import { partSellPrice, vatRateLabel } from './pricing-preview';

const pricing = workshopPricingFrom({
  currency: 'GBP',
  vatRates: { standard: '20', reduced: '5', zero: '0' },
  settings: { vatRounding: 'invoice-nearest', partsMarkupPercent: '20', subcontractMarkupPercent: '10', approvalLinkDays: 14, chaseAfterHours: 48, contactPhone: '', contactEmail: '', depositPolicy: { kind: 'none' }, paymentTermsDays: 30 },
});

describe('partSellPrice', () => {
  it('asks the engine: cost plus the workshop mark-up, its own mark-up, or a fixed price', () => {
    // 6.80 × 1.20 = 8.16
    expect(partSellPrice({ unitCost: '6.80', unitPrice: null, markupPercent: null, vatRate: 'standard' }, pricing)).toBe('8.16');
    // 24.50 × 1.25 = 30.625, rounded half up to the penny
    expect(partSellPrice({ unitCost: '24.50', unitPrice: null, markupPercent: '25', vatRate: 'standard' }, pricing)).toBe('30.63');
    expect(partSellPrice({ unitCost: '1.15', unitPrice: '2.50', markupPercent: null, vatRate: 'standard' }, pricing)).toBe('2.50');
  });

  it('gives no price while the cost is still being typed', () => {
    expect(partSellPrice({ unitCost: '', unitPrice: null, markupPercent: null, vatRate: 'standard' }, pricing)).toBeNull();
    expect(partSellPrice({ unitCost: '6,80', unitPrice: null, markupPercent: null, vatRate: 'standard' }, pricing)).toBeNull();
  });

  it("labels VAT rates with the workshop's percentages", () => {
    expect(vatRateLabel('reduced', pricing)).toBe('Reduced (5%)');
    expect(vatRateLabel('exempt', pricing)).toBe('Exempt');
  });
});
