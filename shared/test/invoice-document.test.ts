import { describe, expect, it } from 'vitest';
import { buildInvoiceDocument, creditNoteAmounts, priceEstimate, VAT_ROUNDING_METHODS, estimateEngineInput, sumAmounts, type EstimateLineDto } from '../src/index.js';

const party = { name: 'Owner', addressLines: ['1 Lane'], postcode: 'ZZ1 1ZZ', email: null };
const supplier = { ...party, name: 'Workshop', vatNumber: 'GB000000000', phone: null };
const job = { number: 'J-0001', title: 'Annual', registration: 'Q-TEST', aircraft: 'two-seat flex-wing trike' };

function lineDto(id: string, over: Partial<EstimateLineDto>): EstimateLineDto {
  return {
    id, stage: 'inspection', kind: 'fee', description: id, quantity: '1', labourRateCode: null, ratePerHour: null, partId: null, supplierId: null, unitCost: null,
    unitPrice: null, markupPercent: null, amount: '0.00', vatRate: 'standard', findingId: null, accessTaskId: null, discountPercent: null,
    agreedAt: '2026-11-01T10:00:00.000Z', agreedHow: 'phone', ...over,
  };
}

// Pence that round differently under each method [HMRC VAT Notice 700 §17.5, §17.5.1; sources.md].
const LINES: EstimateLineDto[] = [
  lineDto('a', { amount: '10.03' }),
  lineDto('b', { amount: '10.03' }),
  lineDto('c', { kind: 'labour', quantity: '1.5', ratePerHour: '62.33', amount: null }),
  lineDto('d', { amount: '4.17', vatRate: 'reduced' }),
  lineDto('e', { amount: '12.00', vatRate: 'zero' }),
  lineDto('f', { stage: 'approved', amount: '33.33', findingId: 'F1' }),
  lineDto('g', { stage: 'declined', amount: '999.00', findingId: 'F2' }),
  lineDto('h', { amount: '55.00', agreedAt: null, agreedHow: null }),
];

const build = (rounding: (typeof VAT_ROUNDING_METHODS)[number], deposits: Parameters<typeof buildInvoiceDocument>[0]['deposits'] = []) => {
  const priced = priceEstimate(estimateEngineInput(LINES, []), { currency: 'GBP', vatRounding: rounding, vatRates: { standard: '20', reduced: '5', zero: '0' }, partsMarkupPercent: '20', subcontractMarkupPercent: '10' });
  return {
    priced,
    doc: buildInvoiceDocument({
      number: 'INV-00001', issuedOn: '2026-12-02', taxPoint: '2026-12-02', dueOn: '2027-01-01', paymentTermsDays: 30, supplier, customer: party, job,
      lines: LINES, accessTasks: [], priced, findingNames: { F1: 'F-1 Clamp' }, deposits,
    }),
  };
};

describe('the VAT invoice document', () => {
  it.each(VAT_ROUNDING_METHODS)('under %s, its totals and VAT per rate are the engine’s committed totals, and declined or unagreed lines never appear', (rounding) => {
    const { priced, doc } = build(rounding);
    expect(doc.totals).toEqual({ net: priced.committed.net, vat: priced.committed.vat, gross: priced.committed.gross });
    expect(doc.byRate.map((r) => [r.vatRate, r.net, r.vat])).toEqual(priced.committed.byRate.map((r) => [r.code, r.net, r.vat]));
    expect(doc.lines.map((l) => l.description).sort()).toEqual(['a', 'b', 'c', 'd', 'e', 'f']);
    expect(doc.rounding).toBe(rounding);
    expect(doc.notes).toContain('Lines at 0% are zero-rated supplies.');
    expect(doc.balanceDue).toBe(doc.totals.gross);
  });

  it('a deposit received in one VAT period keeps its own tax point and VAT; the balance carries the rest [VAT Act 1994 s6(4); sources.md vector]', () => {
    const lines = [lineDto('x', { amount: '1200.00' })];
    const priced = priceEstimate(estimateEngineInput(lines, []), { currency: 'GBP', vatRounding: 'invoice-nearest', vatRates: { standard: '20', reduced: '5', zero: '0' }, partsMarkupPercent: '0', subcontractMarkupPercent: '0' });
    const doc = buildInvoiceDocument({
      number: 'INV-00002', issuedOn: '2027-01-05', taxPoint: '2027-01-05', dueOn: '2027-02-04', paymentTermsDays: 30, supplier, customer: party, job, lines, accessTasks: [], priced,
      findingNames: {}, deposits: [{ paymentId: 'p1', amount: '300.00', refunded: '0.00', receivedOn: '2026-12-20', method: 'card', reference: null, vatMix: [] }],
    });
    expect(doc.totals).toEqual({ net: '1200.00', vat: '240.00', gross: '1440.00' });
    expect(doc.deposits).toEqual([{ paymentId: 'p1', receivedOn: '2026-12-20', amount: '300.00', vat: '50.00', method: 'card', reference: null }]);
    expect(doc.balance).toEqual({ net: '950.00', vat: '190.00', gross: '1140.00' });
    expect(doc.balanceDue).toBe('1140.00');
  });

  it('a credit note shares a reduction across the invoice’s rates with the VAT fraction, and crediting all that is left hands back exactly the VAT left', () => {
    const byRate = [
      { vatRate: 'standard', vatPercent: '20', net: '100.00', vat: '20.00' },
      { vatRate: 'reduced', vatPercent: '5', net: '40.00', vat: '2.00' },
    ];
    const part = creditNoteAmounts(byRate, [], '81.00', 'GBP', 'Goodwill');
    expect(part.totals.gross).toBe('81.00');
    const rest = creditNoteAmounts(byRate, part.byRate, '81.00', 'GBP', 'Rest');
    expect(sumAmounts([part.totals.vat, rest.totals.vat], 'GBP')).toBe('22.00');
    expect(() => creditNoteAmounts(byRate, [...part.byRate, ...rest.byRate], '0.01', 'GBP', 'Too much')).toThrow(/cannot be more than the 0.00/);
  });
});
