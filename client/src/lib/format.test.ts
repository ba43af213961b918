import { describe, expect, it } from 'vitest';
import { formatDate, formatMoney, moneyForInput, todayIso } from './format';

describe('formatMoney', () => {
  it('shows the currency, thousands separators, pence and the VAT basis', () => {
    expect(formatMoney('1234.5', 'GBP', { vat: 'incl' })).toBe('£1,234.50 incl. VAT');
    expect(formatMoney('62.00', 'GBP', { vat: 'excl' })).toBe('£62.00 excl. VAT');
  });

  it('keeps every digit of a large amount that a float would round', () => {
    expect(formatMoney('90071992547409.93')).toBe('£90,071,992,547,409.93');
  });

  it('shows a negative amount with a minus sign and leaves malformed input as it came', () => {
    expect(formatMoney('-5')).toBe('−£5.00');
    expect(formatMoney('about ten')).toBe('about ten');
  });
});

describe('dates', () => {
  it('reads a calendar date without shifting it across a time zone', () => {
    expect(formatDate('2026-12-01')).toBe('1 Dec 2026');
    expect(formatDate(null)).toBe('—');
  });

  it('writes today as an ISO calendar date', () => {
    expect(todayIso(new Date(2026, 0, 5))).toBe('2026-01-05');
  });
});

describe('moneyForInput', () => {
  it('shows a stored four-decimal amount with two decimals unless more are meaningful', () => {
    expect(moneyForInput('11.4000')).toBe('11.40');
    expect(moneyForInput('0.1250')).toBe('0.125');
    expect(moneyForInput('12')).toBe('12.00');
    expect(moneyForInput('3.1416')).toBe('3.1416');
  });
});
