import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { Dec, MoneyError, decidePreAuthorised, fromMinorUnits, priceEstimate, type WorkshopPricing } from '../src/index.js';

// The owner's example from the product brief (invented figures): anything up to £150 incl. VAT, up to £400 in total.
const limit = { perFinding: '150.00', perJob: '400.00' };

describe('pre-authorised limit', () => {
  it.each([
    ['149.99', true, 'inside'],
    ['150.00', true, 'inside'], // "up to £150" includes £150 [practice]
    ['150.01', false, 'over-finding-limit'],
    ['0.00', true, 'inside'],
  ] as const)('a single finding of £%s → inside=%s (%s)', (gross, inside, outcome) => {
    const r = decidePreAuthorised(limit, [{ id: 'F1', gross }], 'GBP');
    expect(r.decisions[0]).toMatchObject({ id: 'F1', gross, inside, outcome });
    const used = inside ? new Dec(gross) : new Dec(0);
    expect(r.approvedWithinLimit).toBe(used.toFixed(2));
    expect(r.headroom).toBe(new Dec('400.00').minus(used).toFixed(2));
  });

  it('fills the per-job limit in order, skips what does not fit and keeps going', () => {
    const r = decidePreAuthorised(
      limit,
      [
        { id: 'F1', gross: '150.00' },
        { id: 'F2', gross: '150.00' },
        { id: 'F3', gross: '100.01' }, // 300 + 100.01 = 400.01 > 400
        { id: 'F4', gross: '100.00' }, // 300 + 100 = 400: exactly at the limit, inside
        { id: 'F5', gross: '0.01' }, // nothing left
      ],
      'GBP',
    );
    expect(r.decisions.map((d) => [d.id, d.outcome, d.headroomAfter])).toEqual([
      ['F1', 'inside', '250.00'],
      ['F2', 'inside', '100.00'],
      ['F3', 'over-job-limit', '100.00'],
      ['F4', 'inside', '0.00'],
      ['F5', 'over-job-limit', '0.00'],
    ]);
    expect(r.approvedWithinLimit).toBe('400.00');
    expect(r.headroom).toBe('0.00');
  });

  it('counts what earlier findings on the job already used', () => {
    const r = decidePreAuthorised({ ...limit, usedSoFar: '399.99' }, [{ id: 'F1', gross: '0.02' }, { id: 'F2', gross: '0.01' }], 'GBP');
    expect(r.decisions.map((d) => d.outcome)).toEqual(['over-job-limit', 'inside']);
    expect(r.headroom).toBe('0.00');
  });

  it('works with only one of the two limits, and approves nothing with neither', () => {
    expect(decidePreAuthorised({ perFinding: '50.00' }, [{ id: 'a', gross: '50.00' }, { id: 'b', gross: '50.00' }], 'GBP')).toMatchObject({
      approvedWithinLimit: '100.00',
      headroom: null,
    });
    expect(decidePreAuthorised({ perJob: '60.00' }, [{ id: 'a', gross: '50.00' }, { id: 'b', gross: '10.01' }], 'GBP').decisions.map((d) => d.outcome)).toEqual([
      'inside',
      'over-job-limit',
    ]);
    const none = decidePreAuthorised({}, [{ id: 'a', gross: '0.01' }], 'GBP');
    expect(none.decisions[0]).toMatchObject({ inside: false, outcome: 'no-limit', headroomAfter: null });
    expect(decidePreAuthorised({ perFinding: '0.00', perJob: '0.00' }, [{ id: 'a', gross: '0.01' }], 'GBP').decisions[0]!.inside).toBe(false);
  });

  it('refuses bad amounts with a typed error', () => {
    expect(() => decidePreAuthorised({ perFinding: '150.001' }, [], 'GBP')).toThrow(MoneyError);
    expect(() => decidePreAuthorised(limit, [{ id: 'a', gross: '-1.00' }], 'GBP')).toThrow(/must not be negative/);
    expect(() => decidePreAuthorised(limit, [{ id: '', gross: '1.00' }], 'GBP')).toThrow(MoneyError);
  });

  it('never approves past either limit, and the headroom is what is left (property)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 100000 }),
        fc.integer({ min: 0, max: 300000 }),
        fc.array(fc.integer({ min: 0, max: 120000 }), { maxLength: 20 }),
        (pf, pj, grosses) => {
          const r = decidePreAuthorised(
            { perFinding: fromMinorUnits(pf, 'GBP'), perJob: fromMinorUnits(pj, 'GBP') },
            grosses.map((g, i) => ({ id: `F${i}`, gross: fromMinorUnits(g, 'GBP') })),
            'GBP',
          );
          let used = 0;
          r.decisions.forEach((d, i) => {
            const g = grosses[i]!;
            // Greedy in the given order: inside exactly when it fits both limits at that point.
            const fits = g <= pf && used + g <= pj;
            expect(d.inside).toBe(fits);
            if (fits) used += g;
          });
          expect(r.approvedWithinLimit).toBe(fromMinorUnits(used, 'GBP'));
          expect(r.headroom).toBe(fromMinorUnits(pj - used, 'GBP'));
        },
      ),
    );
  });

  it('takes each undecided finding at its own price incl. VAT from the priced estimate', () => {
    const pricing: WorkshopPricing = {
      currency: 'GBP',
      vatRounding: 'invoice-nearest',
      vatRates: { standard: '20', reduced: '5', zero: '0' },
      partsMarkupPercent: '20',
      subcontractMarkupPercent: '10',
    };
    const est = priceEstimate(
      {
        lines: [
          // F1: £125.00 net → £150.00 incl. VAT, exactly at the per-finding limit.
          { id: 'a', stage: 'discovered', kind: 'labour', hours: '2', ratePerHour: '62.50', vatRate: 'standard', findingId: 'F1' },
          // F2: £125.01 net → £150.01 incl. VAT (150.012 to the nearest penny), just over.
          { id: 'b', stage: 'discovered', kind: 'fee', amount: '125.01', vatRate: 'standard', findingId: 'F2' },
          // F3: 2 × £50.00 + 20% mark-up = £120.00 net → £144.00 incl. VAT.
          { id: 'c', stage: 'discovered', kind: 'part', quantity: '2', unitCost: '50.00', vatRate: 'standard', findingId: 'F3' },
        ],
      },
      pricing,
    );
    const offered = est.findings.filter((f) => f.stage === 'discovered').map((f) => ({ id: f.findingId, gross: f.price.gross }));
    expect(offered).toEqual([
      { id: 'F1', gross: '150.00' },
      { id: 'F2', gross: '150.01' },
      { id: 'F3', gross: '144.00' },
    ]);
    const r = decidePreAuthorised(limit, offered, 'GBP');
    expect(r.decisions.map((d) => d.outcome)).toEqual(['inside', 'over-finding-limit', 'inside']);
    expect(r.headroom).toBe('106.00');
  });
});
