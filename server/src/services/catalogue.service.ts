import { Op, type Transaction, type WhereOptions } from 'sequelize';
import type { z } from 'zod';
import type { Page, PartDto, SupplierDto, listQuerySchema, partCreateSchema, partUpdateSchema, supplierCreateSchema, supplierUpdateSchema } from '@wingstage/shared';
import { AppError, notFound, staleVersion } from '../errors/app-error.js';
import { Part, Supplier, boundSequelize } from '../models/index.js';
import { inTransaction } from '../db/transaction.js';
import { recordAudit } from './audit.js';
import { likePattern, orderFrom, pageWindow } from './list-helpers.js';
import { loadWorkshop, partSellPrice, pricingOf } from './pricing.js';
import { inWorkshop, requireStaff, type Scope } from './scope.js';

type ListQuery = z.output<typeof listQuerySchema>;
export type PartListQuery = ListQuery & { ids?: string[]; supplierId?: string; active?: boolean };

function supplierDto(s: Supplier): SupplierDto {
  return { id: s.id, name: s.name, kind: s.kind, email: s.email, phone: s.phone, notes: s.notes, active: s.active, version: s.version };
}

export async function listSuppliers(scope: Scope, q: ListQuery & { ids?: string[] }): Promise<Page<SupplierDto>> {
  requireStaff(scope);
  const where: Record<string | symbol, unknown> = {};
  if (q.ids) where.id = { [Op.in]: q.ids };
  if (q.q) where[Op.or] = [{ name: { [Op.iLike]: likePattern(q.q) } }, { notes: { [Op.iLike]: likePattern(q.q) } }];
  const order = orderFrom(q, { name: 'lower("Supplier"."name")', kind: '"Supplier"."kind"' }, 'name');
  const { rows, count } = await Supplier.findAndCountAll({
    where: inWorkshop(scope, where as WhereOptions<Supplier>),
    order: boundSequelize().literal(`${order}, "Supplier"."id" ASC`),
    ...pageWindow(q),
  });
  return { items: rows.map(supplierDto), total: count, page: q.page, pageSize: q.pageSize };
}

export async function createSupplier(scope: Scope, input: z.output<typeof supplierCreateSchema>): Promise<SupplierDto> {
  requireStaff(scope);
  return inTransaction(async (t) => {
    const s = await Supplier.create({ ...input, workshopId: scope.workshopId }, { transaction: t });
    await recordAudit(scope, t, { action: 'supplier.created', summary: `Added supplier ${s.name}`, detail: { supplierId: s.id } });
    return supplierDto(s);
  });
}

export async function updateSupplier(scope: Scope, id: string, input: z.output<typeof supplierUpdateSchema>): Promise<SupplierDto> {
  requireStaff(scope);
  return inTransaction(async (t) => {
    const s = await Supplier.findOne({ where: inWorkshop(scope, { id }), transaction: t, lock: t.LOCK.UPDATE });
    if (!s) throw notFound('That supplier');
    if (s.version !== input.version) throw staleVersion();
    const { version: _v, ...changes } = input;
    await s.update(changes, { transaction: t });
    await recordAudit(scope, t, { action: 'supplier.updated', summary: `Changed supplier ${s.name}`, detail: { supplierId: s.id, fields: Object.keys(changes) } });
    return supplierDto(s);
  });
}

/** A reference from a request body to a supplier must be the caller's workshop's; otherwise the field is at fault. */
export async function assertSuppliers(scope: Scope, ids: (string | null | undefined)[], field: (i: number) => string, t?: Transaction): Promise<void> {
  const wanted = [...new Set(ids.filter((x): x is string => !!x))];
  if (!wanted.length) return;
  const found = new Set((await Supplier.findAll({ where: inWorkshop(scope, { id: wanted }), attributes: ['id'], transaction: t })).map((s) => s.id));
  const fields: Record<string, string> = {};
  ids.forEach((id, i) => {
    if (id && !found.has(id)) fields[field(i)] = 'That supplier is not in the catalogue.';
  });
  if (Object.keys(fields).length) throw new AppError('validation_failed', 400, 'Some fields need attention.', fields);
}

/** Loads the named parts of the caller's workshop; an unknown id is a field error. */
export async function loadParts(scope: Scope, ids: (string | null | undefined)[], field: (i: number) => string, t?: Transaction): Promise<Map<string, Part>> {
  const wanted = [...new Set(ids.filter((x): x is string => !!x))];
  const map = new Map<string, Part>();
  if (!wanted.length) return map;
  for (const p of await Part.findAll({ where: inWorkshop(scope, { id: wanted }), transaction: t })) map.set(p.id, p);
  const fields: Record<string, string> = {};
  ids.forEach((id, i) => {
    if (id && !map.has(id)) fields[field(i)] = 'That part is not in the catalogue.';
  });
  if (Object.keys(fields).length) throw new AppError('validation_failed', 400, 'Some fields need attention.', fields);
  return map;
}

function partDto(p: Part & { supplier?: Supplier | null }, sellPrice: string): PartDto {
  return {
    id: p.id,
    partNumber: p.partNumber,
    description: p.description,
    unitCost: p.unitCost,
    unitPrice: p.unitPrice,
    markupPercent: p.markupPercent,
    sellPrice,
    vatRate: p.vatRate,
    supplierId: p.supplierId,
    supplierName: p.supplier?.name ?? null,
    leadTimeDays: p.leadTimeDays,
    active: p.active,
    version: p.version,
  };
}

async function partDtos(scope: Scope, rows: Part[], t?: Transaction): Promise<PartDto[]> {
  const pricing = pricingOf(await loadWorkshop(scope, t));
  return rows.map((p) => partDto(p, partSellPrice(p, pricing)));
}

const partInclude = [{ model: Supplier, as: 'supplier', required: false, attributes: ['id', 'name'] }];

export async function listParts(scope: Scope, q: PartListQuery): Promise<Page<PartDto>> {
  requireStaff(scope);
  const where: Record<string | symbol, unknown> = {};
  if (q.ids) where.id = { [Op.in]: q.ids };
  if (q.supplierId) where.supplierId = q.supplierId;
  if (q.active !== undefined) where.active = q.active;
  if (q.q) where[Op.or] = [{ partNumber: { [Op.iLike]: likePattern(q.q) } }, { description: { [Op.iLike]: likePattern(q.q) } }];
  const order = orderFrom(
    q,
    { partNumber: '"Part"."part_number"', description: 'lower("Part"."description")', unitCost: '"Part"."unit_cost"', leadTimeDays: '"Part"."lead_time_days"' },
    'partNumber',
  );
  const { rows, count } = await Part.findAndCountAll({
    where: inWorkshop(scope, where as WhereOptions<Part>),
    include: partInclude,
    order: boundSequelize().literal(`${order}, "Part"."id" ASC`),
    ...pageWindow(q),
  });
  return { items: await partDtos(scope, rows), total: count, page: q.page, pageSize: q.pageSize };
}

async function getPart(scope: Scope, id: string, t?: Transaction): Promise<PartDto> {
  const p = await Part.findOne({ where: inWorkshop(scope, { id }), include: partInclude, transaction: t });
  if (!p) throw notFound('That part');
  return (await partDtos(scope, [p], t))[0]!;
}

const DUPLICATE_PART = { partNumber: 'A part with this number is already in the catalogue.' };

async function assertNumberFree(scope: Scope, partNumber: string, exceptId: string | null, t: Transaction): Promise<void> {
  const clash = await Part.findOne({ where: inWorkshop(scope, { partNumber, ...(exceptId ? { id: { [Op.ne]: exceptId } } : {}) }), transaction: t });
  if (clash) throw new AppError('conflict', 409, DUPLICATE_PART.partNumber, DUPLICATE_PART);
}

export async function createPart(scope: Scope, input: z.output<typeof partCreateSchema>): Promise<PartDto> {
  requireStaff(scope);
  const id = await inTransaction(async (t) => {
    await assertSuppliers(scope, [input.supplierId], () => 'supplierId', t);
    await assertNumberFree(scope, input.partNumber, null, t);
    const p = await Part.create({ ...input, workshopId: scope.workshopId }, { transaction: t });
    await recordAudit(scope, t, { action: 'part.created', summary: `Added part ${p.partNumber} ${p.description}`, detail: { partId: p.id } });
    return p.id;
  });
  return getPart(scope, id);
}

export async function updatePart(scope: Scope, id: string, input: z.output<typeof partUpdateSchema>): Promise<PartDto> {
  requireStaff(scope);
  await inTransaction(async (t) => {
    const p = await Part.findOne({ where: inWorkshop(scope, { id }), transaction: t, lock: t.LOCK.UPDATE });
    if (!p) throw notFound('That part');
    if (p.version !== input.version) throw staleVersion();
    const { version: _v, ...changes } = input;
    if (changes.supplierId) await assertSuppliers(scope, [changes.supplierId], () => 'supplierId', t);
    if (changes.partNumber && changes.partNumber !== p.partNumber) await assertNumberFree(scope, changes.partNumber, p.id, t);
    // Setting one way of pricing clears the other, so the part never carries both.
    if (changes.unitPrice) changes.markupPercent = null;
    else if (changes.markupPercent) changes.unitPrice = null;
    await p.update(changes, { transaction: t });
    await recordAudit(scope, t, { action: 'part.updated', summary: `Changed part ${p.partNumber}`, detail: { partId: p.id, fields: Object.keys(changes) } });
  });
  return getPart(scope, id);
}
