import type { z } from 'zod';
import type { TemplateDto, TemplateSummaryDto, templateSaveSchema, templateUpdateSchema } from '@wingstage/shared';
import type { Transaction } from 'sequelize';
import { AppError, notFound, staleVersion } from '../errors/app-error.js';
import { JobTemplate, boundSequelize } from '../models/index.js';
import { inTransaction } from '../db/transaction.js';
import { recordAudit } from './audit.js';
import { assertSuppliers, loadParts } from './catalogue.service.js';
import { loadWorkshop } from './pricing.js';
import { inWorkshop, requireStaff, type Scope } from './scope.js';

type TemplateSave = z.output<typeof templateSaveSchema>;
type TemplateUpdate = z.output<typeof templateUpdateSchema>;

/** Templates saved before cautions existed have none: read as an empty caution. */
function toDto(t: JobTemplate): TemplateDto {
  return {
    id: t.id,
    name: t.name,
    jobType: t.jobType,
    description: t.description,
    lines: t.lines.map((l) => ({ ...l, caution: l.caution ?? '' })),
    checklist: t.checklist.map((c) => ({ ...c, caution: c.caution ?? '' })),
    active: t.active,
    version: t.version,
  };
}

export async function listTemplates(scope: Scope): Promise<TemplateSummaryDto[]> {
  requireStaff(scope);
  const rows = await JobTemplate.findAll({ where: inWorkshop(scope), order: [[boundSequelize().fn('lower', boundSequelize().col('name')), 'ASC'], ['id', 'ASC']] });
  return rows.map((t) => ({ id: t.id, name: t.name, jobType: t.jobType, lineCount: t.lines.length, checklistCount: t.checklist.length, active: t.active }));
}

export async function findTemplate(scope: Scope, id: string, t?: Transaction): Promise<JobTemplate> {
  const row = await JobTemplate.findOne({ where: inWorkshop(scope, { id }), transaction: t });
  if (!row) throw notFound('That template');
  return row;
}

export async function getTemplate(scope: Scope, id: string): Promise<TemplateDto> {
  requireStaff(scope);
  return toDto(await findTemplate(scope, id));
}

/** Lines may name only this workshop's parts, suppliers and labour rates; each kind needs its own figures. */
async function checkLines(scope: Scope, input: Pick<TemplateSave, 'lines'>, t: Transaction): Promise<void> {
  await loadParts(scope, input.lines.map((l) => l.partId), (i) => `lines.${i}.partId`, t);
  await assertSuppliers(scope, input.lines.map((l) => l.supplierId), (i) => `lines.${i}.supplierId`, t);
  const w = await loadWorkshop(scope, t);
  const codes = new Set((w.labourRates ?? []).map((r) => r.code));
  const fields: Record<string, string> = {};
  input.lines.forEach((l, i) => {
    if (l.kind === 'labour' && (!l.labourRateCode || !codes.has(l.labourRateCode))) fields[`lines.${i}.labourRateCode`] = 'Choose one of the workshop’s labour rates.';
    if (l.kind === 'part' && !l.partId && l.amount === null) fields[`lines.${i}.partId`] = 'Choose a catalogue part or give the unit cost.';
    if ((l.kind === 'fee' || l.kind === 'subcontract') && l.amount === null) fields[`lines.${i}.amount`] = l.kind === 'fee' ? 'Give the fee.' : "Give the supplier's cost.";
  });
  if (Object.keys(fields).length) throw new AppError('validation_failed', 400, 'Some fields need attention.', fields);
}

export async function createTemplate(scope: Scope, input: TemplateSave): Promise<TemplateDto> {
  requireStaff(scope);
  return inTransaction(async (t) => {
    await checkLines(scope, input, t);
    const { confirmLarge: _confirmed, ...fields } = input;
    const row = await JobTemplate.create({ ...fields, workshopId: scope.workshopId }, { transaction: t });
    await recordAudit(scope, t, { action: 'template.created', summary: `Added template ${row.name}`, detail: { templateId: row.id } });
    return toDto(row);
  });
}

export async function updateTemplate(scope: Scope, id: string, input: TemplateUpdate): Promise<TemplateDto> {
  requireStaff(scope);
  return inTransaction(async (t) => {
    const row = await JobTemplate.findOne({ where: inWorkshop(scope, { id }), transaction: t, lock: t.LOCK.UPDATE });
    if (!row) throw notFound('That template');
    if (row.version !== input.version) throw staleVersion();
    const { version: _v, confirmLarge: _confirmed, ...whole } = input;
    await checkLines(scope, whole, t);
    await row.update(whole, { transaction: t });
    await recordAudit(scope, t, { action: 'template.updated', summary: `Changed template ${row.name}`, detail: { templateId: row.id, lines: whole.lines.length, checklist: whole.checklist.length } });
    return toDto(row);
  });
}
