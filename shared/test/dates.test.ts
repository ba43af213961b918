import { describe, expect, it } from 'vitest';
import { formatCalendarDate } from '../src/index.js';

describe('formatCalendarDate', () => {
  it('when given a calendar date, then it reads as the app shows dates, and no time zone moves it a day', () => {
    expect(formatCalendarDate('2026-12-01')).toBe('1 Dec 2026');
    expect(formatCalendarDate('2027-01-31')).toBe('31 Jan 2027');
    expect(formatCalendarDate('2028-02-29')).toBe('29 Feb 2028');
  });
  it('when given anything else, then it comes back unchanged', () => {
    expect(formatCalendarDate('not a date')).toBe('not a date');
    expect(formatCalendarDate('2026-12-01T10:00:00Z')).toBe('2026-12-01T10:00:00Z');
  });
});
