import { Op, type WhereOptions } from 'sequelize';
import type { AircraftCreate, AircraftDto, AircraftUpdateInput, ListQuery, Page } from '@wingstage/shared';
import { AppError, notFound, staleVersion } from '../errors/app-error.js';
import { Aircraft, Customer, boundSequelize } from '../models/index.js';
import { inTransaction } from '../db/transaction.js';
import { recordAudit } from './audit.js';
import { likePattern, orderFrom, pageWindow } from './list-helpers.js';
import { inWorkshop, ownedRows, type Scope } from './scope.js';

type AircraftRow = Aircraft & { customer: Customer; get(key: 'openJobCount'): unknown };

const extraAttributes = () => ({
  include: [
    [
      boundSequelize().literal(`(SELECT count(*) FROM jobs j WHERE j.aircraft_id = "Aircraft"."id" AND j.state NOT IN ('closed', 'cancelled'))::int`),
      'openJobCount',
    ],
  ] as [ReturnType<ReturnType<typeof boundSequelize>['literal']>, string][],
});

const withCustomer = () => [{ model: Customer, as: 'customer', required: true, attributes: ['id', 'name'] }];

function toDto(a: AircraftRow): AircraftDto {
  return {
    id: a.id,
    customerId: a.customerId,
    customerName: a.customer.name,
    registration: a.registration,
    type: a.type,
    serial: a.serial,
    airframeHours: String(a.airframeHours),
    engine: a.engine,
    engineHours: String(a.engineHours),
    notes: a.notes,
    openJobCount: Number(a.get('openJobCount') ?? 0),
    version: a.version,
    createdAt: a.createdAt.toISOString(),
  };
}

export async function listAircraft(scope: Scope, q: ListQuery & { customerId?: string }): Promise<Page<AircraftDto>> {
  const where: Record<string | symbol, unknown> = {};
  if (q.customerId) where.customerId = q.customerId;
  if (q.q) {
    const like = likePattern(q.q);
    where[Op.or] = [{ registration: { [Op.iLike]: like } }, { type: { [Op.iLike]: like } }, { '$customer.name$': { [Op.iLike]: like } }];
  }
  const order = orderFrom(
    q,
    { registration: '"Aircraft"."registration"', type: 'lower("Aircraft"."type")', customerName: 'lower("customer"."name")', createdAt: '"Aircraft"."created_at"' },
    'registration',
  );
  const { rows, count } = await Aircraft.findAndCountAll({
    where: ownedRows(scope, 'customerId', where as WhereOptions<Aircraft>),
    attributes: extraAttributes(),
    include: withCustomer(),
    order: boundSequelize().literal(`${order}, "Aircraft"."id" ASC`),
    ...pageWindow(q),
    subQuery: false,
  });
  return { items: rows.map((r) => toDto(r as AircraftRow)), total: count, page: q.page, pageSize: q.pageSize };
}

export async function getAircraft(scope: Scope, id: string): Promise<AircraftDto> {
  const a = await Aircraft.findOne({ where: ownedRows(scope, 'customerId', { id }), attributes: extraAttributes(), include: withCustomer() });
  if (!a) throw notFound('That aircraft');
  return toDto(a as AircraftRow);
}

async function requireCustomer(scope: Scope, customerId: string, t: import('sequelize').Transaction) {
  const c = await Customer.findOne({ where: inWorkshop(scope, { id: customerId }), transaction: t });
  if (!c) throw new AppError('not_found', 404, 'That owner was not found.', { customerId: 'That owner was not found.' });
  return c;
}

export async function createAircraft(scope: Scope, input: AircraftCreate): Promise<AircraftDto> {
  const id = await inTransaction(async (t) => {
    await requireCustomer(scope, input.customerId, t);
    const a = await Aircraft.create({ ...input, workshopId: scope.workshopId }, { transaction: t });
    await recordAudit(scope, t, { action: 'aircraft.created', summary: `Added aircraft ${a.registration}`, detail: { aircraftId: a.id } });
    return a.id;
  });
  return getAircraft(scope, id);
}

export async function updateAircraft(scope: Scope, id: string, input: AircraftUpdateInput): Promise<AircraftDto> {
  await inTransaction(async (t) => {
    const a = await Aircraft.findOne({ where: inWorkshop(scope, { id }), transaction: t, lock: t.LOCK.UPDATE });
    if (!a) throw notFound('That aircraft');
    if (a.version !== input.version) throw staleVersion();
    const { version: _v, ...changes } = input;
    if (changes.customerId && changes.customerId !== a.customerId) await requireCustomer(scope, changes.customerId, t);
    await a.update(changes as Partial<Aircraft>, { transaction: t });
    await recordAudit(scope, t, { action: 'aircraft.updated', summary: `Changed aircraft ${a.registration}`, detail: { aircraftId: a.id, fields: Object.keys(changes) } });
  });
  return getAircraft(scope, id);
}
