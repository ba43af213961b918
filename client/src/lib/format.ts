/**
 * Money is formatted by shared's one formatter (decimal strings, `Intl.NumberFormat`, half-up at the
 * currency's minor unit), the same one the e-mails and history use; re-exported so pages keep one
 * import for display helpers.
 */
import { formatCalendarDate } from '@wingstage/shared';

export { formatMoney, type MoneyFormatOptions } from '@wingstage/shared';

const dateFmt = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric' });
const dateTimeFmt = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit' });

/** `2026-12-01` (a calendar date) → "1 Dec 2026", read as a local date so it never shifts a day. */
export function formatDate(iso: string | null | undefined): string {
  if (!iso) return '—';
  if (/^\d{4}-\d{2}-\d{2}$/.test(iso)) return formatCalendarDate(iso);
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? iso : dateFmt.format(d);
}

export function formatDateTime(iso: string): string {
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? iso : dateTimeFmt.format(d);
}

export function todayIso(now = new Date()): string {
  const p = (n: number) => String(n).padStart(2, '0');
  return `${now.getFullYear()}-${p(now.getMonth() + 1)}-${p(now.getDate())}`;
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
