import { describe, expect, it } from 'vitest';
import { calendarDateOf, formatCalendarDate, formatMoment, instantFromWorkshopInput, workshopDateTimeInput, workshopToday, WORKSHOP_TIME_ZONE } from '../src/index.js';

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

describe('formatMoment', () => {
  // Summer Time Order 2002 (SI 2002/262): British Summer Time runs from 01:00 GMT on the last Sunday
  // of March to 01:00 GMT on the last Sunday of October. In 2026 those are 29 March and 25 October.
  it('when a moment falls in British Summer Time, then it reads an hour on from UTC on the workshop clock', () => {
    expect(formatMoment('2026-07-01T13:03:00Z')).toBe('1 Jul 2026, 14:03');
    expect(formatMoment('2026-07-01T23:30:00Z', 'date')).toBe('2 Jul 2026');
    expect(formatMoment('2026-07-01T23:30:00Z', 'day-month')).toBe('2 Jul');
    expect(calendarDateOf(new Date('2026-07-01T23:30:00Z'))).toBe('2026-07-02');
  });
  it('when a moment falls in winter, then the workshop clock reads UTC, named GMT on documents', () => {
    expect(formatMoment('2026-12-02T14:03:00Z')).toBe('2 Dec 2026, 14:03');
    expect(formatMoment(new Date('2026-12-02T14:03:00Z'), 'long-zone')).toMatch(/^2 December 2026(,| at) 14:03 GMT$/);
  });
  it('when the clocks change, then the hour either side reads as the workshop clock showed it', () => {
    expect(formatMoment('2026-03-29T00:59:00Z')).toBe('29 Mar 2026, 00:59');
    expect(formatMoment('2026-03-29T01:00:00Z')).toBe('29 Mar 2026, 02:00');
    expect(formatMoment('2026-10-25T00:59:00Z')).toBe('25 Oct 2026, 01:59');
    expect(formatMoment('2026-10-25T01:00:00Z')).toBe('25 Oct 2026, 01:00');
  });
  it('when the machine writing it keeps another clock, then the text is the same (the zone is always named)', () => {
    expect(formatMoment('2026-07-01T13:03:00Z', 'date-time', WORKSHOP_TIME_ZONE)).toBe(formatMoment('2026-07-01T13:03:00Z'));
    expect(formatMoment('2026-07-01T13:03:00Z', 'date-time', 'America/New_York')).toBe('1 Jul 2026, 09:03');
  });
  it('when given something that is not a moment, then it comes back unchanged', () => {
    expect(formatMoment('not a moment')).toBe('not a moment');
  });
});

describe('form defaults on the workshop’s clock', () => {
  // UK clocks: GMT in winter, BST (UTC+1) from the last Sunday of March to the last Sunday of October
  // [Summer Time Order 2002, SI 2002/262, cited from memory]; 2026's change back is 25 October at 02:00 BST.
  it('gives today as the workshop’s day, not UTC’s: 23:30 UTC on 30 June is already 1 July in the UK', () => {
    expect(workshopToday(new Date('2026-06-30T23:30:00Z'))).toBe('2026-07-01');
    expect(workshopToday(new Date('2026-12-01T23:30:00Z'))).toBe('2026-12-01');
  });

  it('writes a moment for a date-time box on UK time and reads the box back as the same moment, in winter and summer', () => {
    expect(workshopDateTimeInput(new Date('2026-12-02T10:30:00Z'))).toBe('2026-12-02T10:30');
    expect(workshopDateTimeInput(new Date('2026-07-01T13:03:00Z'))).toBe('2026-07-01T14:03');
    expect(instantFromWorkshopInput('2026-12-02T10:30')).toBe('2026-12-02T10:30:00.000Z');
    expect(instantFromWorkshopInput('2026-07-01T14:03')).toBe('2026-07-01T13:03:00.000Z');
    for (const iso of ['2026-03-29T00:59:00.000Z', '2026-03-29T01:00:00.000Z', '2026-10-25T00:30:00.000Z', '2026-10-25T01:30:00.000Z', '2026-01-01T00:00:00.000Z']) {
      const box = workshopDateTimeInput(new Date(iso));
      expect(workshopDateTimeInput(new Date(instantFromWorkshopInput(box)))).toBe(box);
    }
    // The repeated hour when the clocks go back: the earlier reading (still BST).
    expect(instantFromWorkshopInput('2026-10-25T01:30')).toBe('2026-10-25T00:30:00.000Z');
    expect(instantFromWorkshopInput('not a time')).toBe('not a time');
  });
});
