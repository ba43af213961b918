const CALENDAR_DAY = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });

/**
 * A calendar date as people read dates in Wingstage: `2026-12-01` → "1 Dec 2026". It is a date,
 * not a moment, so no time zone moves it a day. Anything that is not such a date comes back as given.
 */
export function formatCalendarDate(iso: string): string {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(iso);
  if (!m) return iso;
  return CALENDAR_DAY.format(new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3]))));
}
