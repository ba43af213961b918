import { workshopSettingsSchema, type WorkshopDto, type WorkshopUpdateInput } from '@wingstage/shared';
import { notFound, staleVersion } from '../errors/app-error.js';
import { Workshop } from '../models/index.js';
import { inTransaction } from '../db/transaction.js';
import { recordAudit } from './audit.js';
import type { Scope } from './scope.js';

export function toWorkshopDto(w: Workshop): WorkshopDto {
  return {
    id: w.id,
    name: w.name,
    addressLines: w.addressLines,
    postcode: w.postcode,
    vatNumber: w.vatNumber,
    currency: w.currency,
    vatRates: w.vatRates,
    labourRates: w.labourRates,
    settings: workshopSettingsSchema.parse(w.settings ?? {}),
    version: w.version,
  };
}

export async function getWorkshop(scope: Scope): Promise<WorkshopDto> {
  const w = await Workshop.findByPk(scope.workshopId);
  if (!w) throw notFound('The workshop');
  return toWorkshopDto(w);
}

export async function updateWorkshop(scope: Scope, input: WorkshopUpdateInput): Promise<WorkshopDto> {
  return inTransaction(async (t) => {
    const w = await Workshop.findByPk(scope.workshopId, { transaction: t, lock: t.LOCK.UPDATE });
    if (!w) throw notFound('The workshop');
    if (w.version !== input.version) throw staleVersion();
    const { version: _v, settings, ...rest } = input;
    const changes: Partial<Workshop> = { ...rest } as Partial<Workshop>;
    if (settings) changes.settings = workshopSettingsSchema.parse({ ...(w.settings ?? {}), ...settings });
    await w.update(changes, { transaction: t });
    await recordAudit(scope, t, { action: 'workshop.updated', summary: 'Changed the workshop settings', detail: { fields: Object.keys(input).filter((k) => k !== 'version') } });
    return toWorkshopDto(w);
  });
}
