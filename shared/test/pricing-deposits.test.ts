import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { Dec, MoneyError, depositRequired, fromMinorUnits, priceEstimate, settleDeposits, type EstimateInput, type WorkshopPricing } from '../src/index.js';

const pricing: WorkshopPricing = {
  currency: 'GBP',
  vatRounding: 'invoice-nearest',
  vatRates: { standard: '20', reduced: '5', zero: '0' },
  partsMarkupPercent: '20',
  subcontractMarkupPercent: '10',
};

// sources.md [derived from VAT Act 1994 s6(4), HMRC manual VATTOS5105]: a job of £1,200 + £240 VAT.
const invoice = { net: '1200.00', vat: '240.00', gross: '1440.00', byRate: [{ code: 'standard' as const, rate: '20', net: '1200.00', vat: '240.00' }] };

describe('deposits and the VAT they carry', () => {
  it('a £300 deposit carries £50 VAT; the £1,140 balance carries £190 [derived from VAT Act 1994 s6(4); VATTOS5105]', () => {
    const s = settleDeposits(invoice, [{ id: 'd1', amount: '300.00', receivedOn: '2026-11-20', kind: 'advance' }], [], 'GBP');
    expect(s.payments).toEqual([{ id: 'd1', kind: 'advance', amount: '300.00', refunded: '0.00', vat: '50.00', taxPoint: '2026-11-20' }]);
    expect(s.paid).toEqual({ gross: '300.00', vat: '50.00' });
    expect(s.balance).toEqual({ net: '950.00', vat: '190.00', gross: '1140.00' });
    expect(s.due).toBe('1140.00');
    expect(s.toRefund).toBe('0.00');
  });

  it('a security deposit creates no tax point and carries no VAT [source: HMRC manual VATTOS5135]', () => {
    const s = settleDeposits(invoice, [{ id: 's1', amount: '300.00', receivedOn: '2026-11-20', kind: 'security' }], [], 'GBP');
    expect(s.payments[0]).toMatchObject({ vat: '0.00', taxPoint: null });
    expect(s.balance.vat).toBe('240.00');
    expect(s.due).toBe('1140.00');
  });

  it('refunds reverse their share of the VAT; a full refund reverses all of it', () => {
    const part = settleDeposits(invoice, [{ id: 'd1', amount: '300.00', receivedOn: '2026-11-20', kind: 'advance' }], [{ paymentId: 'd1', amount: '120.00' }], 'GBP');
    // Kept £180 carries 1/6 = £30; £20 of VAT goes back with the refund.
    expect(part.payments[0]).toMatchObject({ refunded: '120.00', vat: '30.00' });
    expect(part.balance).toEqual({ net: '1050.00', vat: '210.00', gross: '1260.00' });
    const full = settleDeposits(
      invoice,
      [{ id: 'd1', amount: '100.00', receivedOn: '2026-11-20', kind: 'advance' }],
      [
        { paymentId: 'd1', amount: '33.33' },
        { paymentId: 'd1', amount: '66.67' },
      ],
      'GBP',
    );
    // 100/6 = 16.67; the first refund takes back 5.56 (33.33 × 16.67/100), the last exactly what is left.
    expect(full.payments[0]).toMatchObject({ refunded: '100.00', vat: '0.00' });
    expect(full.balance).toEqual({ net: '1200.00', vat: '240.00', gross: '1440.00' });
    expect(() => settleDeposits(invoice, [{ id: 'd1', amount: '10.00', receivedOn: '2026-11-20', kind: 'advance' }], [{ paymentId: 'd1', amount: '10.01' }], 'GBP')).toThrow(
      /more than the 10.00 left/,
    );
    expect(() => settleDeposits(invoice, [], [{ paymentId: 'nope', amount: '1.00' }], 'GBP')).toThrow(MoneyError);
  });

  it('an overpaid job shows what to refund', () => {
    const s = settleDeposits(invoice, [{ id: 'd1', amount: '1500.00', receivedOn: '2026-11-20', kind: 'advance' }], [], 'GBP');
    expect(s.payments[0]!.vat).toBe('250.00');
    expect(s).toMatchObject({ due: '0.00', toRefund: '60.00', balance: { gross: '-60.00', vat: '-10.00', net: '-50.00' } });
  });

  it('works the deposit VAT over a mixed-rate job at the mix when it was paid', () => {
    const mixed = {
      net: '1100.00',
      vat: '205.00',
      gross: '1305.00',
      byRate: [
        { code: 'standard' as const, rate: '20', net: '1000.00', vat: '200.00' },
        { code: 'reduced' as const, rate: '5', net: '100.00', vat: '5.00' },
      ],
    };
    // £261 split by gross 1200:105 → 240.00 / 21.00 (allocation) → VAT 40.00 + 1.00.
    const s = settleDeposits(mixed, [{ id: 'd1', amount: '261.00', receivedOn: '2026-11-20', kind: 'advance' }], [], 'GBP');
    expect(s.payments[0]!.vat).toBe('41.00');
    // Paid when the whole job was still standard-rated: 1/6 of £261 = £43.50.
    const early = settleDeposits(mixed, [{ id: 'd1', amount: '261.00', receivedOn: '2026-11-01', kind: 'advance', vatMix: [{ rate: '20', gross: '600.00' }] }], [], 'GBP');
    expect(early.payments[0]!.vat).toBe('43.50');
    expect(early.balance.vat).toBe('161.50');
  });

  it('refuses bad input with typed errors', () => {
    expect(() => settleDeposits({ ...invoice, gross: '1440.01' }, [], [], 'GBP')).toThrow(/net \+ VAT must equal gross/);
    expect(() => settleDeposits(invoice, [{ id: 'd1', amount: '300.00', receivedOn: '20/11/2026', kind: 'advance' }], [], 'GBP')).toThrow(MoneyError);
    expect(() => settleDeposits(invoice, [{ id: 'd1', amount: '300.001', receivedOn: '2026-11-20', kind: 'advance' }], [], 'GBP')).toThrow(/more decimals/);
    expect(() =>
      settleDeposits(
        invoice,
        [
          { id: 'd1', amount: '1.00', receivedOn: '2026-11-20', kind: 'advance' },
          { id: 'd1', amount: '1.00', receivedOn: '2026-11-20', kind: 'advance' },
        ],
        [],
        'GBP',
      ),
    ).toThrow(/used twice/);
    const empty = { net: '0.00', vat: '0.00', gross: '0.00', byRate: [] };
    expect(() => settleDeposits(empty, [{ id: 'd1', amount: '5.00', receivedOn: '2026-11-20', kind: 'advance' }], [], 'GBP')).toThrow(/VAT mix/);
  });

  it('deposits plus balance always add back to the invoice, VAT included (property)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 1e8 }),
        fc.array(fc.record({ minor: fc.integer({ min: 0, max: 1e7 }), kind: fc.constantFrom('advance' as const, 'security' as const), refundPct: fc.integer({ min: 0, max: 100 }) }), {
          maxLength: 6,
        }),
        (netMinor, pays) => {
          const net = new Dec(fromMinorUnits(netMinor, 'GBP'));
          const vat = net.times('0.2').toDecimalPlaces(2, Dec.ROUND_HALF_UP);
          const inv = { net: net.toFixed(2), vat: vat.toFixed(2), gross: net.plus(vat).toFixed(2), byRate: [{ code: 'standard' as const, rate: '20', net: net.toFixed(2), vat: vat.toFixed(2) }] };
          const payments = pays.map((p, i) => ({ id: `p${i}`, amount: fromMinorUnits(p.minor, 'GBP'), receivedOn: '2026-11-20', kind: p.kind }));
          const refunds = pays.map((p, i) => ({ paymentId: `p${i}`, amount: fromMinorUnits(Math.floor((p.minor * p.refundPct) / 100), 'GBP') }));
          const s = settleDeposits(inv, payments, refunds, 'GBP');
          const sum = (xs: string[]) => xs.reduce((a, x) => a.plus(x), new Dec(0));
          expect(sum([s.paid.gross, s.balance.gross]).toFixed(2)).toBe(inv.gross);
          expect(sum([s.paid.vat, s.balance.vat]).toFixed(2)).toBe(inv.vat);
          expect(sum(s.payments.map((p) => p.vat)).toFixed(2)).toBe(s.paid.vat);
          for (const p of s.payments) {
            const kept = new Dec(p.amount).minus(p.refunded);
            if (p.kind === 'security') expect(p.vat).toBe('0.00');
            // Each advance's VAT is its VAT fraction, within a penny of rounding (one rounding on receipt, one on refund).
            else expect(new Dec(p.vat).minus(kept.dividedBy(6)).abs().lessThanOrEqualTo('0.01')).toBe(true);
          }
        },
      ),
    );
  });
});

describe('deposit policy', () => {
  const input: EstimateInput = {
    lines: [
      { id: 'i1', stage: 'inspection', kind: 'labour', hours: '4', ratePerHour: '60.00', vatRate: 'standard' },
      { id: 'p1', stage: 'inspection', kind: 'part', quantity: '1', unitCost: '250.00', vatRate: 'standard' }, // 300.00
      { id: 'p2', stage: 'approved', kind: 'subcontract', cost: '500.00', vatRate: 'standard', findingId: 'F1' }, // 550.00
      { id: 'p3', stage: 'discovered', kind: 'part', quantity: '1', unitCost: '1000.00', vatRate: 'standard', findingId: 'F2' }, // not yet approved
      { id: 'p4', stage: 'declined', kind: 'part', quantity: '1', unitCost: '1000.00', vatRate: 'standard', findingId: 'F3' },
    ],
  };

  it('takes a percentage of committed parts and sub-contract value (incl. VAT) above a threshold', () => {
    const est = priceEstimate(input, pricing);
    // Parts + sub-contract committed: 300 + 550 = 850 net, 1020 incl. VAT; labour and undecided or declined work excluded.
    expect(depositRequired(est, { percent: '50', threshold: '500.00' })).toEqual({ basis: '1020.00', applies: true, required: '510.00' });
    expect(depositRequired(est, { percent: '50', threshold: '500.00', of: 'excess' })).toEqual({ basis: '1020.00', applies: true, required: '260.00' });
    // At the threshold exactly, no deposit: "above" means strictly more.
    expect(depositRequired(est, { percent: '50', threshold: '1020.00' })).toMatchObject({ applies: false, required: '0.00' });
    expect(depositRequired(est, { percent: '33.3', threshold: '0.00' }).required).toBe('339.66'); // 339.66 exactly
    expect(depositRequired(est, null)).toEqual({ basis: '1020.00', applies: false, required: '0.00' });
    expect(() => depositRequired(est, { percent: '150', threshold: '0.00' })).toThrow(MoneyError);
  });
});
