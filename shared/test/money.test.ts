import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  CURRENCY_MINOR_UNITS,
  Dec,
  MoneyError,
  SUPPORTED_CURRENCIES,
  allocate,
  fromMinorUnits,
  minorUnits,
  normaliseAmount,
  parseAmount,
  roundHalfEven,
  roundHalfUp,
  toMinorUnits,
} from '../src/index.js';

function expectMoneyError(fn: () => unknown, code: string) {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(MoneyError);
    expect((e as MoneyError).code).toBe(code);
    expect((e as MoneyError).message.length).toBeGreaterThan(10);
    return;
  }
  throw new Error(`expected MoneyError ${code}, nothing was thrown`);
}

describe('ISO 4217 minor units', () => {
  // ISO 4217 list one: GBP, EUR, USD 2; JPY 0; BHD, JOD, KWD, OMR, TND 3.
  it.each([
    ['GBP', 2],
    ['EUR', 2],
    ['USD', 2],
    ['JPY', 0],
    ['BHD', 3],
    ['JOD', 3],
    ['KWD', 3],
    ['OMR', 3],
    ['TND', 3],
  ])('%s has %i decimals [source: ISO 4217 list one]', (code, dp) => {
    expect(minorUnits(code)).toBe(dp);
  });

  // Cross-check every supported currency against the runtime's own CLDR data, so a typo in our table
  // cannot hide behind a test copied from the same table.
  it.each(SUPPORTED_CURRENCIES)('%s agrees with Intl.NumberFormat (CLDR) currency digits', (code) => {
    const cldr = new Intl.NumberFormat('en-GB', { style: 'currency', currency: code }).resolvedOptions().maximumFractionDigits;
    expect(CURRENCY_MINOR_UNITS[code]).toBe(cldr);
  });

  it('refuses an unknown or lower-case currency code', () => {
    expectMoneyError(() => minorUnits('XYZ'), 'unknown_currency');
    expectMoneyError(() => minorUnits('gbp'), 'unknown_currency');
    expectMoneyError(() => toMinorUnits('1.00', 'ZZZ'), 'unknown_currency');
  });
});

describe('minor units for card payments', () => {
  // Stripe docs "Currencies": amounts are integers in the smallest currency unit; JPY is zero-decimal.
  it('converts to and from the smallest unit [source: Stripe docs "Currencies"]', () => {
    expect(toMinorUnits('12.34', 'GBP')).toBe(1234);
    expect(toMinorUnits('0.05', 'GBP')).toBe(5);
    expect(toMinorUnits('500', 'JPY')).toBe(500);
    expect(toMinorUnits('1.234', 'KWD')).toBe(1234);
    expect(toMinorUnits('-3.10', 'EUR')).toBe(-310);
    expect(fromMinorUnits(500, 'JPY')).toBe('500');
    expect(fromMinorUnits(1234, 'GBP')).toBe('12.34');
    expect(fromMinorUnits(5, 'GBP')).toBe('0.05');
    expect(fromMinorUnits(1, 'OMR')).toBe('0.001');
    expect(fromMinorUnits(-310, 'EUR')).toBe('-3.10');
    expect(fromMinorUnits(0, 'USD')).toBe('0.00');
  });

  it('refuses more decimals than the currency has rather than rounding', () => {
    expectMoneyError(() => toMinorUnits('12.345', 'GBP'), 'too_many_decimals');
    expectMoneyError(() => toMinorUnits('500.5', 'JPY'), 'too_many_decimals');
  });

  it('refuses non-numeric amounts, floats and non-integers', () => {
    expectMoneyError(() => toMinorUnits('12,34', 'GBP'), 'invalid_amount');
    expectMoneyError(() => toMinorUnits('1e3', 'GBP'), 'invalid_amount');
    expectMoneyError(() => toMinorUnits('NaN', 'GBP'), 'invalid_amount');
    expectMoneyError(() => toMinorUnits('', 'GBP'), 'invalid_amount');
    expectMoneyError(() => toMinorUnits(12.34 as unknown as string, 'GBP'), 'invalid_amount');
    expectMoneyError(() => fromMinorUnits(12.5, 'GBP'), 'invalid_amount');
    expectMoneyError(() => fromMinorUnits(Number.NaN, 'GBP'), 'invalid_amount');
    expectMoneyError(() => fromMinorUnits(2 ** 53, 'GBP'), 'invalid_amount');
  });

  it('refuses an amount too large for an exact integer', () => {
    expectMoneyError(() => toMinorUnits('900719925474099.99', 'GBP'), 'out_of_range');
  });

  it('round-trips every safe integer for every currency (property)', () => {
    fc.assert(
      fc.property(fc.constantFrom(...SUPPORTED_CURRENCIES), fc.integer({ min: -1e12, max: 1e12 }), (cur, n) => {
        const s = fromMinorUnits(n, cur);
        const dp = minorUnits(cur);
        expect(s).toMatch(dp === 0 ? /^-?\d+$/ : new RegExp(`^-?\\d+\\.\\d{${dp}}$`));
        expect(toMinorUnits(s, cur)).toBe(n);
      }),
    );
  });
});

describe('rounding', () => {
  // sources.md [derived]: half-up vs half-even at 2 dp; HMRC "nearest" is half-up (VATREC12030).
  it.each([
    ['0.125', '0.13', '0.12'],
    ['0.135', '0.14', '0.14'],
    ['-0.125', '-0.13', '-0.12'],
  ])('%s → half-up %s, half-even %s [derived; HMRC manual VATREC12030]', (x, up, even) => {
    expect(roundHalfUp(new Dec(x), 2).toFixed(2)).toBe(up);
    expect(roundHalfEven(new Dec(x), 2).toFixed(2)).toBe(even);
  });

  it('normalises amounts to the currency decimals', () => {
    expect(normaliseAmount('12.3', 'GBP')).toBe('12.30');
    expect(normaliseAmount('7', 'BHD')).toBe('7.000');
    expect(normaliseAmount('-0', 'GBP')).toBe('0.00');
    expectMoneyError(() => normaliseAmount('0.001', 'GBP'), 'too_many_decimals');
    expectMoneyError(() => parseAmount('-1.00', 'GBP'), 'negative_amount');
  });
});

describe('allocate', () => {
  // Fowler, PoEAA "Money": 0.05 split 3:7 → 0.02 / 0.03.
  it('splits 0.05 in ratio 3:7 into 0.02 and 0.03 [source: Fowler, PoEAA "Money"]', () => {
    expect(allocate('0.05', ['3', '7'], 'GBP')).toEqual(['0.02', '0.03']);
  });

  it('gives left-over units to the largest remainders, ties to the earlier part', () => {
    expect(allocate('100.00', ['1', '1', '1'], 'GBP')).toEqual(['33.34', '33.33', '33.33']);
    expect(allocate('10', ['1', '1', '1'], 'JPY')).toEqual(['4', '3', '3']);
    // 1.00 by 0.2/0.35/0.45 → 20 / 35 / 45 exactly; no remainder to hand out.
    expect(allocate('1.00', ['0.2', '0.35', '0.45'], 'GBP')).toEqual(['0.20', '0.35', '0.45']);
    // 0.10 by 1:2 → 3.33.. / 6.66.. units: floors 3 + 6, the spare unit to the larger remainder (second).
    expect(allocate('0.10', ['1', '2'], 'GBP')).toEqual(['0.03', '0.07']);
    expect(allocate('-0.05', ['3', '7'], 'GBP')).toEqual(['-0.02', '-0.03']);
    expect(allocate('1.000', ['1', '0', '1'], 'KWD')).toEqual(['0.500', '0.000', '0.500']);
  });

  it('refuses bad ratios and stored amounts with too many decimals', () => {
    expectMoneyError(() => allocate('1.00', [], 'GBP'), 'invalid_ratio');
    expectMoneyError(() => allocate('1.00', ['0', '0'], 'GBP'), 'invalid_ratio');
    expectMoneyError(() => allocate('1.00', ['-1', '2'], 'GBP'), 'invalid_ratio');
    expectMoneyError(() => allocate('1.00', ['x'], 'GBP'), 'invalid_ratio');
    expectMoneyError(() => allocate('1.001', ['1'], 'GBP'), 'too_many_decimals');
  });

  it('always sums to the whole, never moves a part by a full unit or more from its exact share (property)', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...SUPPORTED_CURRENCIES),
        fc.integer({ min: -1e11, max: 1e11 }),
        fc.array(fc.integer({ min: 0, max: 100000 }), { minLength: 1, maxLength: 12 }).filter((a) => a.some((x) => x > 0)),
        (cur, minor, ratioInts) => {
          const amount = fromMinorUnits(minor, cur);
          const ratios = ratioInts.map((r) => new Dec(r).dividedBy(100).toString()); // decimals such as "12.5"
          const parts = allocate(amount, ratios, cur);
          expect(parts).toHaveLength(ratios.length);
          const sum = parts.reduce((a, p) => a + BigInt(toMinorUnits(p, cur)), 0n);
          expect(sum).toBe(BigInt(minor));
          const total = ratioInts.reduce((a, r) => a + r, 0);
          parts.forEach((p, i) => {
            const exact = new Dec(minor).times(ratioInts[i]!).dividedBy(total);
            expect(new Dec(toMinorUnits(p, cur)).minus(exact).abs().lessThan(1)).toBe(true);
          });
        },
      ),
    );
  });
});
