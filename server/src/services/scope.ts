import { Op, type WhereOptions } from 'sequelize';
import type { Role } from '@wingstage/shared';
import { forbidden } from '../errors/app-error.js';

/** Who is asking: every service call carries one, and every query is narrowed by it. */
export interface Scope {
  workshopId: string;
  userId: string;
  role: Role;
  /** Set for owners only: the customer record whose rows they may see. */
  customerId: string | null;
}

/**
 * The workshop boundary lives here: scoped queries always carry workshop_id, and for owners
 * also their customer, so a service that forgets a check still cannot reach another workshop's rows.
 */
export function inWorkshop<T>(scope: Scope, where: WhereOptions<T> = {}): WhereOptions<T> {
  return { ...(where as object), workshopId: scope.workshopId } as unknown as WhereOptions<T>;
}

/**
 * Rows owned through a customer (customers by their id, aircraft by customer_id). For owners the
 * customer condition is ANDed with whatever the caller asked, so no filter can widen it.
 */
export function ownedRows<T>(scope: Scope, column: 'id' | 'customerId', where: WhereOptions<T> = {}): WhereOptions<T> {
  const scoped = inWorkshop(scope, where);
  if (scope.role !== 'owner') return scoped;
  // An owner without a customer record sees nothing rather than everything.
  const own = { [column]: scope.customerId ?? { [Op.is]: null } };
  return { [Op.and]: [scoped, own] } as unknown as WhereOptions<T>;
}

export function requireStaff(scope: Scope): void {
  if (scope.role === 'owner') throw forbidden();
}
