/**
 * Money is formatted by shared's one formatter (decimal strings, `Intl.NumberFormat`, half-up at the
 * currency's minor unit), the same one the e-mails and history use; re-exported so pages keep one
 * import for display helpers.
 */
import { formatCalendarDate, formatMoment, workshopToday } from '@wingstage/shared';

export { formatMoney, type MoneyFormatOptions } from '@wingstage/shared';

/**
 * `2026-12-01` (a calendar date) → "1 Dec 2026", never shifted a day; a moment → the day it fell
 * on, on the workshop's clock (shared's `formatMoment`, the same on the server's first view).
 */
export function formatDate(iso: string | null | undefined): string {
  if (!iso) return '—';
  if (/^\d{4}-\d{2}-\d{2}$/.test(iso)) return formatCalendarDate(iso);
  return formatMoment(iso, 'date');
}

/** A moment on the workshop's clock, whatever the device's: "2 Dec 2026, 14:03". */
export function formatDateTime(iso: string): string {
  return formatMoment(iso, 'date-time');
}

/** Today on the workshop's clock (`YYYY-MM-DD`), not the device's: the default of every date box in a form. */
export function todayIso(now = new Date()): string {
  return workshopToday(now);
}

/** Hours are decimal strings too; show them as they are, trimmed of a trailing ".0". */
export function formatHours(h: string): string {
  return `${h.replace(/\.0+$/, '')} h`;
}

/**
 * A stored money amount ready to edit: at least two decimals, no trailing zeros beyond them.
 * "11.4000" → "11.40", "0.1250" → "0.125", "12" → "12.00". String work only: no float.
 */
export function moneyForInput(v: string): string {
  const [whole, frac = ''] = v.split('.');
  const kept = frac.replace(/0+$/, '').padEnd(2, '0');
  return `${whole}.${kept}`;
}

/** "0.9700" → "0.97", "12.0000" → "12": measurements are stored with four decimals but read as taken. */
export function trimDecimal(v: string): string {
  return v.includes('.') ? v.replace(/0+$/, '').replace(/\.$/, '') : v;
}
