import { describe, expect, it } from 'vitest';
import { formatDate, moneyForInput, todayIso } from './format';

describe('dates', () => {
  it('reads a calendar date without shifting it across a time zone', () => {
    expect(formatDate('2026-12-01')).toBe('1 Dec 2026');
    expect(formatDate(null)).toBe('—');
  });

  it('writes today as an ISO calendar date on the workshop’s clock', () => {
    expect(todayIso(new Date('2026-01-05T12:00:00Z'))).toBe('2026-01-05');
    // 23:30 UTC on 30 June is 00:30 on 1 July on the workshop's (British Summer Time) clock.
    expect(todayIso(new Date('2026-06-30T23:30:00Z'))).toBe('2026-07-01');
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
