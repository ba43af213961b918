import { QueryTypes } from 'sequelize';
import { AppError } from '../errors/app-error.js';
import { boundSequelize } from '../models/index.js';
import type { Scope } from '../services/scope.js';

const quarterStart = (iso: string) => {
  const [y, m] = iso.split('-').map(Number) as [number, number];
  return `${y}-${String(Math.floor((m - 1) / 3) * 3 + 1).padStart(2, '0')}-01`;
};
const quarterEnd = (iso: string) => {
  const [y, m] = iso.split('-').map(Number) as [number, number];
  const endMonth = Math.floor((m - 1) / 3) * 3 + 3;
  return new Date(Date.UTC(y, endMonth, 0)).toISOString().slice(0, 10);
};

/**
 * A period must lie within the workshop's records: from the start of the quarter of its first
 * record (the workshop's own start, or its earliest payment, invoice or credit note) to the end of
 * the current quarter. Anything wider is a 400 that says where the records start and end.
 * (Wrong-way-round ranges are refused by the shared schema before this.)
 */
export async function checkPeriod(scope: Scope, from?: string, to?: string, today: string = new Date().toISOString().slice(0, 10)): Promise<void> {
  if (!from && !to) return;
  const [r] = await boundSequelize().query<{ first: string }>(
    `SELECT LEAST(
        (SELECT created_at::date FROM workshops WHERE id = $1),
        (SELECT MIN(received_at)::date FROM payments WHERE workshop_id = $1),
        (SELECT MIN(tax_point) FROM invoices WHERE workshop_id = $1),
        (SELECT MIN(tax_point) FROM credit_notes WHERE workshop_id = $1))::text AS first`,
    { bind: [scope.workshopId], type: QueryTypes.SELECT },
  );
  const start = quarterStart(r!.first);
  const end = quarterEnd(today);
  if (from && from < start) throw new AppError('validation_failed', 400, `The workshop's records start in the quarter beginning ${start}: choose a start on or after that date.`, { from: `Choose ${start} or later.` });
  if (to && to > end) throw new AppError('validation_failed', 400, `The records run to the end of this quarter, ${end}: choose an end on or before that date.`, { to: `Choose ${end} or earlier.` });
}
