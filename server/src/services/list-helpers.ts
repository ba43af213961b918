import type { ListQuery } from '@wingstage/shared';
import type { Scope } from './scope.js';

/** Sort keys a list accepts, mapped to safe SQL; anything else falls back to the default. */
export function orderFrom(q: ListQuery, allowed: Record<string, string>, fallback: string): string {
  const key = q.sort && Object.hasOwn(allowed, q.sort) ? q.sort : fallback;
  const dir = q.dir === 'desc' ? 'DESC' : 'ASC';
  return `${allowed[key]} ${dir}`;
}

export function likePattern(q: string): string {
  return `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

export function pageWindow(q: ListQuery): { limit: number; offset: number } {
  return { limit: q.pageSize, offset: (q.page - 1) * q.pageSize };
}

/**
 * The conditions and bind parameters of a money list (invoices, credit notes) the scope may see:
 * its workshop's rows (`$1`), and for an owner only those of their own aircraft (alias `a`).
 */
export function scopedMoneyFilter(scope: Scope, workshopColumn: string, where: string[], bind: unknown[]): { conds: string[]; params: unknown[] } {
  const conds = [`${workshopColumn} = $1`, ...where];
  const params: unknown[] = [scope.workshopId, ...bind];
  if (scope.role === 'owner') {
    params.push(scope.customerId);
    conds.push(`a.customer_id = ${"$" + String(params.length)}`);
  }
  return { conds, params };
}
