/**
 * Dates as people read them in Wingstage, written by one set of functions on the server (first
 * views, e-mails, documents) and in the browser alike, so a page never reads differently on a
 * phone set to another time zone than on the server that drew it.
 *
 * A moment (a timestamp) is shown on the workshop's clock. Every workshop Wingstage serves today
 * keeps UK time (VAT invoices, GBP), so the workshop's clock is Europe/London, Greenwich Mean Time
 * in winter and British Summer Time in summer; a workshop elsewhere would need a setting of its own.
 */
export const WORKSHOP_TIME_ZONE = 'Europe/London';

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

/**
 * How much of a moment to write:
 * - `date`: "2 Dec 2026" (the day it fell on, on the workshop's clock);
 * - `day-month`: "2 Dec" (for a sentence where the year goes without saying);
 * - `date-time`: "2 Dec 2026, 14:03" (pages);
 * - `long`: "2 December 2026, 14:03" (e-mails);
 * - `long-zone`: "2 December 2026, 14:03 GMT" (documents, which are kept and read later).
 */
export type MomentStyle = 'date' | 'day-month' | 'date-time' | 'long' | 'long-zone';

const STYLES: Record<MomentStyle, Intl.DateTimeFormatOptions> = {
  date: { day: 'numeric', month: 'short', year: 'numeric' },
  'day-month': { day: 'numeric', month: 'short' },
  'date-time': { day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit' },
  long: { day: 'numeric', month: 'long', year: 'numeric', hour: '2-digit', minute: '2-digit' },
  'long-zone': { day: 'numeric', month: 'long', year: 'numeric', hour: '2-digit', minute: '2-digit', timeZoneName: 'short' },
};

// Building a formatter is the slow part of Intl: one per style and zone, made on first use.
const formatters = new Map<string, Intl.DateTimeFormat>();
function formatterFor(style: MomentStyle, timeZone: string): Intl.DateTimeFormat {
  const key = `${style}|${timeZone}`;
  let f = formatters.get(key);
  if (!f) {
    f = new Intl.DateTimeFormat('en-GB', { ...STYLES[style], timeZone });
    formatters.set(key, f);
  }
  return f;
}

/**
 * A moment on the workshop's clock, whatever the clock of the machine that writes it:
 * `2026-07-01T13:03:00Z` → "1 Jul 2026, 14:03" (British Summer Time). An ISO string that is not a
 * moment comes back as given.
 */
export function formatMoment(at: Date | string, style: MomentStyle = 'date-time', timeZone: string = WORKSHOP_TIME_ZONE): string {
  const d = typeof at === 'string' ? new Date(at) : at;
  if (Number.isNaN(d.getTime())) return typeof at === 'string' ? at : '';
  return formatterFor(style, timeZone).format(d);
}

const ISO_DAY = new Map<string, Intl.DateTimeFormat>();
/** The calendar date a moment falls on, on the workshop's clock, as `YYYY-MM-DD`. */
export function calendarDateOf(at: Date, timeZone: string = WORKSHOP_TIME_ZONE): string {
  let f = ISO_DAY.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' });
    ISO_DAY.set(timeZone, f);
  }
  return f.format(at);
}

/**
 * Today on the workshop's clock, as `YYYY-MM-DD`: the default of every date box in a staff form and
 * the "not in the future" bound of the schemas, so a device set to another time zone (or a server on
 * UTC just after midnight in summer) never offers or checks yesterday or tomorrow.
 */
export function workshopToday(now: Date = new Date()): string {
  return calendarDateOf(now);
}

const WALL_PARTS = new Map<string, Intl.DateTimeFormat>();
/** The wall-clock fields of a moment in a time zone. */
function wallClock(at: Date, timeZone: string): { y: number; mo: number; d: number; h: number; mi: number } {
  let f = WALL_PARTS.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-GB', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' });
    WALL_PARTS.set(timeZone, f);
  }
  const n = (type: string) => Number(f.formatToParts(at).find((p) => p.type === type)?.value);
  return { y: n('year'), mo: n('month'), d: n('day'), h: n('hour'), mi: n('minute') };
}

/** A moment as a date-time box shows it ("2026-12-02T10:30"), on the workshop's clock whatever the device's. */
export function workshopDateTimeInput(at: Date, timeZone: string = WORKSHOP_TIME_ZONE): string {
  const w = wallClock(at, timeZone);
  const p = (x: number) => String(x).padStart(2, '0');
  return `${w.y}-${p(w.mo)}-${p(w.d)}T${p(w.h)}:${p(w.mi)}`;
}

/**
 * A date-time box's value read as the workshop's wall-clock time, as an ISO instant: "2026-07-01T14:03"
 * → "2026-07-01T13:03:00.000Z" (British Summer Time). In the hour the clocks go back the earlier of the
 * two readings is taken. Anything unreadable comes back as given, for the schema to refuse.
 */
export function instantFromWorkshopInput(v: string, timeZone: string = WORKSHOP_TIME_ZONE): string {
  const m = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})$/.exec(v);
  if (!m) return v;
  const asUtc = Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3]), Number(m[4]), Number(m[5]));
  if (Number.isNaN(asUtc)) return v;
  // The zone's offset at a moment: its wall clock read as if UTC, less the moment.
  const offsetAt = (t: number) => {
    const w = wallClock(new Date(t), timeZone);
    return Date.UTC(w.y, w.mo - 1, w.d, w.h, w.mi) - t;
  };
  // The zone's offsets a day either side cover any change of the clocks: keep the readings that give
  // the box's wall-clock time back, the earlier when both do (the repeated hour); in the hour that
  // never happens (clocks going forward) the offset before the change is used.
  const day = 24 * 3600_000;
  const candidates = [asUtc - offsetAt(asUtc - day), asUtc - offsetAt(asUtc + day)];
  const fits = candidates.filter((t) => workshopDateTimeInput(new Date(t), timeZone) === v);
  return new Date(fits.length ? Math.min(...fits) : candidates[0]!).toISOString();
}
