import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { MoneyError, formatMoney } from '../src/index.js';

describe('formatMoney', () => {
  it('when an amount has thousands, then it is grouped in threes with the currency and two decimals', () => {
    expect(formatMoney('1234.5', 'GBP')).toBe('£1,234.50');
    expect(formatMoney('1234567.89', 'GBP')).toBe('£1,234,567.89');
    expect(formatMoney('0', 'GBP')).toBe('£0.00');
  });

  it('when the VAT basis is given, then the figure says whether it includes VAT', () => {
    expect(formatMoney('1234.5', 'GBP', { vat: 'incl' })).toBe('£1,234.50 incl. VAT');
    expect(formatMoney('62.00', 'GBP', { vat: 'excl' })).toBe('£62.00 excl. VAT');
  });

  // ISO 4217 minor units [source: ISO 4217 list one; sources.md "Money and currencies"]: GBP, EUR,
  // USD 2; JPY 0; BHD 3. A code written out is kept to its figure by a no-break space.
  it.each([
    ['GBP', '1234.5', '£1,234.50'],
    ['EUR', '1234.5', '€1,234.50'],
    ['JPY', '1234', 'JP¥1,234'],
    ['BHD', '1234.5', 'BHD\u00a01,234.500'],
  ])('when the currency is %s, then it shows that currency’s minor units (%s → %s)', (currency, amount, shown) => {
    expect(formatMoney(amount, currency)).toBe(shown);
  });

  // Half-up at the minor unit [derived, sources.md: 0.125 → 0.13 half-up (0.12 half-even);
  // 0.135 → 0.14; −0.125 → −0.13]; HMRC's "nearest" is half-up [source: HMRC VATREC12030].
  it('when an amount has more decimals than the currency, then it is rounded half-up, never cut off', () => {
    expect(formatMoney('0.125', 'GBP')).toBe('£0.13');
    expect(formatMoney('0.135', 'GBP')).toBe('£0.14');
    expect(formatMoney('0.124', 'GBP')).toBe('£0.12');
    expect(formatMoney('-0.125', 'GBP')).toBe('-£0.13');
    expect(formatMoney('11.4999', 'GBP')).toBe('£11.50');
    expect(formatMoney('999.995', 'GBP')).toBe('£1,000.00');
    // JPY has no minor unit, BHD three [ISO 4217].
    expect(formatMoney('1234.5', 'JPY')).toBe('JP¥1,235');
    expect(formatMoney('1.0005', 'BHD')).toBe('BHD\u00a01.001');
  });

  it('when an amount is negative, then it carries a minus sign, and a rounded-away amount shows no sign', () => {
    expect(formatMoney('-5', 'GBP')).toBe('-£5.00');
    expect(formatMoney('-1234.5', 'EUR')).toBe('-€1,234.50');
    expect(formatMoney('-0.001', 'GBP')).toBe('£0.00');
  });

  it('when a change is shown with its sign, then a rise has "+" and nothing has a sign on zero', () => {
    expect(formatMoney('12.5', 'GBP', { signDisplay: 'always' })).toBe('+£12.50');
    expect(formatMoney('-12.5', 'GBP', { signDisplay: 'exceptZero' })).toBe('-£12.50');
    expect(formatMoney('0.00', 'GBP', { signDisplay: 'exceptZero' })).toBe('£0.00');
  });

  it('when a unit cost is shown exactly, then its own decimals are kept and padded, never rounded', () => {
    expect(formatMoney('0.1250', 'GBP', { exact: true })).toBe('£0.125');
    expect(formatMoney('11.4', 'GBP', { exact: true })).toBe('£11.40');
    expect(formatMoney('1234.5678', 'GBP', { exact: true, vat: 'excl' })).toBe('£1,234.5678 excl. VAT');
  });

  it('when an amount is larger than a float holds exactly, then every digit is kept', () => {
    expect(formatMoney('90071992547409.93', 'GBP')).toBe('£90,071,992,547,409.93');
    expect(formatMoney('123456789012345.675', 'GBP')).toBe('£123,456,789,012,345.68');
  });

  it('when the amount is not a decimal string or the currency is unknown, then it throws a MoneyError that says so', () => {
    expect(() => formatMoney('about ten', 'GBP')).toThrow(MoneyError);
    expect(() => formatMoney('about ten', 'GBP')).toThrow(/not a decimal number/);
    expect(() => formatMoney('1e3', 'GBP')).toThrow(MoneyError);
    expect(() => formatMoney(12 as unknown as string, 'GBP')).toThrow(/expected a decimal string/);
    expect(() => formatMoney('12.00', 'XYZ')).toThrow(/Unknown or unsupported currency/);
  });

  it('when any two-decimal amount is formatted, then its digits read back to the same amount', () => {
    fc.assert(
      fc.property(fc.bigInt({ min: -(10n ** 14n), max: 10n ** 14n }), (pence) => {
        const neg = pence < 0n;
        const abs = neg ? -pence : pence;
        const amount = `${neg ? '-' : ''}${abs / 100n}.${String(abs % 100n).padStart(2, '0')}`;
        const shown = formatMoney(amount, 'GBP');
        const back = shown.replace('£', '').replace(/,/g, '');
        expect(back).toBe(amount === '-0.00' ? '0.00' : amount);
      }),
    );
  });
});
