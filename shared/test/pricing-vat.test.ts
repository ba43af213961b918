import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { Dec, MoneyError, lineVatRounded, VAT_ROUNDING_METHODS, fromMinorUnits, minorUnits, vatFraction, vatTotals, type VatRounding } from '../src/index.js';

const GBP = (rounding: VatRounding) => ({ currency: 'GBP', rounding });

describe('vatTotals — HMRC vectors', () => {
  // HMRC "Calculating VAT for VAT-inclusive and VAT-exclusive prices": £100 at 20% → £20, £120; at 5% → £5, £105.
  it.each(VAT_ROUNDING_METHODS)('£100 at 20%% is £20 VAT and £120 gross under %s [source: HMRC, calculating VAT]', (m) => {
    const r = vatTotals([{ net: '100.00', vatRate: '20' }], GBP(m));
    expect(r).toEqual({ net: '100.00', vat: '20.00', gross: '120.00', byRate: [{ rate: '20', net: '100.00', vat: '20.00' }], rounding: m });
    const reduced = vatTotals([{ net: '100', vatRate: '5' }], GBP(m));
    expect([reduced.vat, reduced.gross]).toEqual(['5.00', '105.00']);
  });

  // VAT Notice 700 §17.5 / §17.5.1 [derived]: £10.03 + £20.03 + £30.03 at 20% (exact VAT 12.018).
  it.each([
    ['invoice-down', '12.01'], // §17.5: total VAT rounded down to a whole penny
    ['invoice-nearest', '12.02'], // §17.5 with VATREC12030: nearest penny, half up
    ['line-nearest', '12.03'], // §17.5.1: each line to the nearest penny (2.006 + 4.006 + 6.006 → 2.01 + 4.01 + 6.01)
    ['line-down-tenth', '12.01'], // §17.5.1: each line down to 0.1p (2.006 → 2.006, exact here), total down: 12.018 → 12.01
  ] as const)('three-line example under %s gives £%s [derived from VAT Notice 700 §17.5, §17.5.1]', (method, vat) => {
    const r = vatTotals(
      [
        { net: '10.03', vatRate: '20' },
        { net: '20.03', vatRate: '20' },
        { net: '30.03', vatRate: '20' },
      ],
      GBP(method),
    );
    expect(r.net).toBe('60.09');
    expect(r.vat).toBe(vat);
    expect(r.gross).toBe(new Dec('60.09').plus(vat).toFixed(2));
    expect(r.rounding).toBe(method);
  });

  // VAT Notice 700 §17.5.1: a line's 86.76p rounds down to 86.7p, or to the nearest penny 87p.
  // £4.338 net at 20% carries exactly 86.76p of VAT.
  it('86.76p per line → 86.7p kept to 0.1p then total down to 86p, or 87p to the nearest penny [source: VAT Notice 700 §17.5.1]', () => {
    expect(lineVatRounded('0.8676', 'line-down-tenth', 'GBP')).toBe('0.867');
    expect(lineVatRounded('0.8676', 'line-nearest', 'GBP')).toBe('0.87');
    const line = [{ net: '4.338', vatRate: '20' }];
    // A stored net may not have fractions of a penny: the line amount is refused, not rounded.
    expect(() => vatTotals(line, GBP('line-down-tenth'))).toThrow(MoneyError);
    // With two lines of 86.76p each the 0.1p step is visible in the total: 86.7 + 86.7 = 173.4p → £1.73,
    // nearest-per-line: 87 + 87 = £1.74, invoice-nearest on 173.52p → £1.74.
    // A net of £4.34 at 20% is 86.8p, so use the 0.1p route through the VAT-per-line figure instead:
    const twoLines = [
      { net: '433.80', vatRate: '0.2' }, // 433.80 × 0.2% = 0.8676 → VAT of exactly 86.76p
      { net: '433.80', vatRate: '0.2' },
    ];
    expect(vatTotals(twoLines, GBP('line-down-tenth')).vat).toBe('1.73');
    expect(vatTotals(twoLines, GBP('line-nearest')).vat).toBe('1.74');
    expect(vatTotals(twoLines, GBP('invoice-nearest')).vat).toBe('1.74');
    expect(vatTotals(twoLines, GBP('invoice-down')).vat).toBe('1.73');
    expect(vatTotals([twoLines[0]!], GBP('line-down-tenth')).vat).toBe('0.86');
    expect(vatTotals([twoLines[0]!], GBP('line-nearest')).vat).toBe('0.87');
  });

  it('breaks VAT down by rate, highest rate first, groups adding up to the total', () => {
    const r = vatTotals(
      [
        { net: '0.05', vatRate: '5' },
        { net: '10.03', vatRate: '20' },
        { net: '7.50', vatRate: '0' },
        { net: '0.05', vatRate: '5' },
        { net: '20.03', vatRate: '20' },
      ],
      GBP('invoice-down'),
    );
    // Exact: 20% on 30.06 = 6.012; 5% on 0.10 = 0.005; total 6.017 → 6.01 down.
    expect(r.vat).toBe('6.01');
    expect(r.byRate).toEqual([
      { rate: '20', net: '30.06', vat: '6.01' },
      { rate: '5', net: '0.10', vat: '0.00' },
      { rate: '0', net: '7.50', vat: '0.00' },
    ]);
    const near = vatTotals([{ net: '0.10', vatRate: '5' }, { net: '30.06', vatRate: '20' }], GBP('invoice-nearest'));
    // 6.017 → 6.02: the spare penny goes to the larger remainder (the 5% group's 0.5p beats 20%'s 0.2p).
    expect(near.vat).toBe('6.02');
    expect(near.byRate).toEqual([
      { rate: '20', net: '30.06', vat: '6.01' },
      { rate: '5', net: '0.10', vat: '0.01' },
    ]);
  });

  it('works in zero- and three-decimal currencies', () => {
    expect(vatTotals([{ net: '1001', vatRate: '10' }], { currency: 'JPY', rounding: 'invoice-nearest' })).toMatchObject({
      net: '1001',
      vat: '100',
      gross: '1101',
    });
    expect(vatTotals([{ net: '1.005', vatRate: '10' }], { currency: 'BHD', rounding: 'invoice-nearest' }).vat).toBe('0.101');
    expect(vatTotals([{ net: '1.005', vatRate: '10' }], { currency: 'BHD', rounding: 'invoice-down' }).vat).toBe('0.100');
  });

  it('throws typed errors on bad input', () => {
    const codeOf = (fn: () => unknown) => {
      try {
        fn();
      } catch (e) {
        return e instanceof MoneyError ? e.code : 'not-a-money-error';
      }
      return 'nothing-thrown';
    };
    expect(codeOf(() => vatTotals([{ net: '1.00', vatRate: '20' }], { currency: 'XXX', rounding: 'invoice-down' }))).toBe('unknown_currency');
    expect(codeOf(() => vatTotals([{ net: 'ten', vatRate: '20' }], GBP('invoice-down')))).toBe('invalid_amount');
    expect(codeOf(() => vatTotals([{ net: '-1.00', vatRate: '20' }], GBP('invoice-down')))).toBe('negative_amount');
    expect(codeOf(() => vatTotals([{ net: '1.001', vatRate: '20' }], GBP('invoice-down')))).toBe('too_many_decimals');
    expect(codeOf(() => vatTotals([{ net: '1.00', vatRate: '120' }], GBP('invoice-down')))).toBe('out_of_range');
    expect(codeOf(() => vatTotals([{ net: '1.00', vatRate: '20' }], { currency: 'GBP', rounding: 'bankers' as VatRounding }))).toBe('invalid_input');
  });
});

describe('vatFraction', () => {
  // VAT Notice 700: VAT fraction rate/(100+rate): 1/6 at 20%, 1/21 at 5%.
  it('takes 1/6 at 20% and 1/21 at 5% [source: HMRC VAT Notice 700, VAT fraction]', () => {
    expect(vatFraction('120.00', '20', 'GBP')).toBe('20.00');
    expect(vatFraction('300.00', '20', 'GBP')).toBe('50.00'); // the deposit vector in sources.md
    expect(vatFraction('105.00', '5', 'GBP')).toBe('5.00');
    expect(vatFraction('100.00', '20', 'GBP')).toBe('16.67'); // 16.666… → nearest penny
    expect(vatFraction('10.00', '0', 'GBP')).toBe('0.00');
    expect(vatFraction('1200', '10', 'JPY')).toBe('109'); // 109.09…
  });

  it('never drifts from gross × rate / (100 + rate) by half a unit or more (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 1e10 }), fc.constantFrom('20', '5', '0', '17.5', '10'), (minor, rate) => {
        const gross = fromMinorUnits(minor, 'GBP');
        const v = new Dec(vatFraction(gross, rate, 'GBP'));
        const exact = new Dec(gross).times(rate).dividedBy(new Dec(100).plus(rate));
        expect(v.minus(exact).abs().lessThanOrEqualTo('0.005')).toBe(true);
        expect(v.decimalPlaces()).toBeLessThanOrEqual(2);
      }),
    );
  });
});

describe('vatTotals — properties', () => {
  const currencyArb = fc.constantFrom('GBP', 'JPY', 'KWD', 'EUR');
  const rateArb = fc.constantFrom('20', '5', '0', '17.5', '8.25');
  const linesArb = (cur: string) =>
    fc.array(
      fc.record({ minor: fc.integer({ min: 0, max: 5e9 }), vatRate: rateArb }).map((l) => ({ net: fromMinorUnits(l.minor, cur), vatRate: l.vatRate })),
      { minLength: 0, maxLength: 40 },
    );
  const caseArb = currencyArb.chain((cur) => fc.tuple(fc.constant(cur), linesArb(cur), fc.constantFrom(...VAT_ROUNDING_METHODS)));

  // The bound each method allows, from the rule itself (VAT Notice 700 §17.5, §17.5.1):
  // invoice-down: exact − 1 unit < vat ≤ exact; invoice-nearest: |vat − exact| ≤ ½ unit;
  // line-nearest: |vat − exact| ≤ n × ½ unit; line-down-tenth: exact − n × 0.1 unit − 1 unit < vat ≤ exact.
  it('keeps VAT within the bound its method allows of the exact VAT [derived from VAT Notice 700 §17.5]', () => {
    fc.assert(
      fc.property(caseArb, ([cur, lines, method]) => {
        const r = vatTotals(lines, { currency: cur, rounding: method });
        const unit = new Dec(10).pow(-minorUnits(cur));
        const exact = lines.reduce((a, l) => a.plus(new Dec(l.net).times(l.vatRate).dividedBy(100)), new Dec(0));
        const vat = new Dec(r.vat);
        const n = lines.length;
        switch (method) {
          case 'invoice-down':
            expect(vat.lessThanOrEqualTo(exact) && vat.greaterThan(exact.minus(unit))).toBe(true);
            break;
          case 'invoice-nearest':
            expect(vat.minus(exact).abs().lessThanOrEqualTo(unit.dividedBy(2))).toBe(true);
            break;
          case 'line-nearest':
            expect(vat.minus(exact).abs().lessThanOrEqualTo(unit.dividedBy(2).times(n))).toBe(true);
            break;
          case 'line-down-tenth':
            expect(vat.lessThanOrEqualTo(exact) && vat.greaterThan(exact.minus(unit.dividedBy(10).times(n)).minus(unit))).toBe(true);
            break;
        }
      }),
    );
  });

  it('sums parts to totals, never returns more decimals than the currency, and ignores line order', () => {
    fc.assert(
      fc.property(caseArb, fc.nat(), ([cur, lines, method], seed) => {
        const dp = minorUnits(cur);
        const shape = dp === 0 ? /^\d+$/ : new RegExp(`^\\d+\\.\\d{${dp}}$`);
        const r = vatTotals(lines, { currency: cur, rounding: method });
        for (const s of [r.net, r.vat, r.gross, ...r.byRate.flatMap((g) => [g.net, g.vat])]) expect(s).toMatch(shape);
        expect(new Dec(r.net).plus(r.vat).toFixed(dp)).toBe(r.gross);
        expect(r.byRate.reduce((a, g) => a.plus(g.net), new Dec(0)).toFixed(dp)).toBe(r.net);
        expect(r.byRate.reduce((a, g) => a.plus(g.vat), new Dec(0)).toFixed(dp)).toBe(r.vat);
        // Deterministic shuffle from the seed.
        const shuffled = lines
          .map((l, i) => ({ l, k: (i * 2654435761 + seed) % 4294967296 }))
          .sort((a, b) => a.k - b.k)
          .map((x) => x.l);
        expect(vatTotals(shuffled, { currency: cur, rounding: method })).toEqual(r);
      }),
    );
  });
});
