import { Op, type WhereOptions } from 'sequelize';
import type { CustomerCreate, CustomerDto, CustomerUpdateInput, ListQuery, Page } from '@wingstage/shared';
import { notFound, staleVersion } from '../errors/app-error.js';
import { Customer, boundSequelize } from '../models/index.js';
import { inTransaction } from '../db/transaction.js';
import { recordAudit } from './audit.js';
import { likePattern, orderFrom, pageWindow } from './list-helpers.js';
import { ownedRows, requireStaff, type Scope } from './scope.js';

type CustomerRow = Customer & { get(key: 'aircraftCount' | 'hasSignIn'): unknown };

const extraAttributes = () => {
  const s = boundSequelize();
  return {
    include: [
      [s.literal('(SELECT count(*) FROM aircraft a WHERE a.customer_id = "Customer"."id")::int'), 'aircraftCount'],
      [s.literal('EXISTS (SELECT 1 FROM users u WHERE u.customer_id = "Customer"."id" AND u.active)'), 'hasSignIn'],
    ] as [ReturnType<typeof s.literal>, string][],
  };
};

function toDto(c: CustomerRow): CustomerDto {
  return {
    id: c.id,
    name: c.name,
    kind: c.kind,
    email: c.email,
    phone: c.phone,
    addressLines: c.addressLines,
    postcode: c.postcode,
    notes: c.notes,
    aircraftCount: Number(c.get('aircraftCount') ?? 0),
    hasSignIn: Boolean(c.get('hasSignIn')),
    version: c.version,
    createdAt: c.createdAt.toISOString(),
  };
}

export async function listCustomers(scope: Scope, q: ListQuery): Promise<Page<CustomerDto>> {
  requireStaff(scope);
  const where: Record<string | symbol, unknown> = {};
  if (q.q) {
    const like = likePattern(q.q);
    where[Op.or] = [{ name: { [Op.iLike]: like } }, { email: { [Op.iLike]: like } }, { phone: { [Op.iLike]: like } }];
  }
  const order = orderFrom(q, { name: 'lower("Customer"."name")', email: '"Customer"."email"', createdAt: '"Customer"."created_at"' }, 'name');
  const { rows, count } = await Customer.findAndCountAll({
    where: ownedRows(scope, 'id', where as WhereOptions<Customer>),
    attributes: extraAttributes(),
    order: boundSequelize().literal(`${order}, "Customer"."id" ASC`),
    ...pageWindow(q),
  });
  return { items: rows.map((r) => toDto(r as CustomerRow)), total: count, page: q.page, pageSize: q.pageSize };
}

export async function getCustomer(scope: Scope, id: string): Promise<CustomerDto> {
  requireStaff(scope);
  const c = await Customer.findOne({ where: ownedRows(scope, 'id', { id }), attributes: extraAttributes() });
  if (!c) throw notFound('That owner');
  return toDto(c as CustomerRow);
}

export async function createCustomer(scope: Scope, input: CustomerCreate): Promise<CustomerDto> {
  const id = await inTransaction(async (t) => {
    const c = await Customer.create({ ...input, workshopId: scope.workshopId }, { transaction: t });
    await recordAudit(scope, t, { action: 'customer.created', summary: `Added owner ${c.name}`, detail: { customerId: c.id } });
    return c.id;
  });
  return getCustomer(scope, id);
}

export async function updateCustomer(scope: Scope, id: string, input: CustomerUpdateInput): Promise<CustomerDto> {
  await inTransaction(async (t) => {
    const c = await Customer.findOne({ where: ownedRows(scope, 'id', { id }), transaction: t, lock: t.LOCK.UPDATE });
    if (!c) throw notFound('That owner');
    if (c.version !== input.version) throw staleVersion();
    const { version: _v, ...changes } = input;
    await c.update(changes, { transaction: t });
    await recordAudit(scope, t, { action: 'customer.updated', summary: `Changed owner ${c.name}`, detail: { customerId: c.id, fields: Object.keys(changes) } });
  });
  return getCustomer(scope, id);
}
