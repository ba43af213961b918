import type { AccessTaskDto, EstimateLineDto, FindingDto, PartDto, WorkshopDto } from '@wingstage/shared';
import { newId } from './use-estimate-draft';

/**
 * "Price finding": discovered-work lines for one finding, pre-filled from the engineer's proposed
 * remedy (labour hours and rate, catalogue parts, the access task by name). The manager then
 * adjusts them in the builder; nothing is priced here — the engine prices whatever the lines say.
 */
export function linesFromFinding(
  finding: FindingDto,
  ctx: { parts: PartDto[]; workshop: Pick<WorkshopDto, 'labourRates'>; accessTasks: AccessTaskDto[] },
): { lines: EstimateLineDto[]; tasks: AccessTaskDto[]; missingParts: string[] } {
  const r = finding.remedy;
  const rate = ctx.workshop.labourRates.find((x) => x.code === r.labourRateCode) ?? ctx.workshop.labourRates[0];
  const tasks: AccessTaskDto[] = [];
  let accessTaskId: string | null = null;
  if (r.accessTask) {
    const existing = ctx.accessTasks.find((t) => t.name.trim().toLowerCase() === r.accessTask!.trim().toLowerCase());
    if (existing) accessTaskId = existing.id;
    else {
      // The engineer names the opening-up work but not its hours: the manager fills them in.
      const t: AccessTaskDto = { id: newId(), name: r.accessTask, hours: '0', labourRateCode: rate?.code ?? null, ratePerHour: rate?.ratePerHour ?? '0', vatRate: 'standard' };
      tasks.push(t);
      accessTaskId = t.id;
    }
  }
  const base = {
    stage: 'discovered' as const,
    findingId: finding.id,
    accessTaskId,
    partId: null,
    supplierId: null,
    unitCost: null,
    unitPrice: null,
    markupPercent: null,
    amount: null,
    labourRateCode: null,
    ratePerHour: null,
    discountPercent: null,
    vatRate: 'standard' as const,
    agreedAt: null,
    agreedHow: null,
  };
  const lines: EstimateLineDto[] = [
    {
      ...base,
      id: newId(),
      kind: 'labour',
      description: `${finding.number} ${finding.title}: ${r.description || 'rectification labour'}`.slice(0, 300),
      quantity: r.hours ?? '0',
      labourRateCode: rate?.code ?? null,
      ratePerHour: rate?.ratePerHour ?? null,
    },
  ];
  const missingParts: string[] = [];
  for (const rp of r.parts) {
    const part = ctx.parts.find((p) => p.id === rp.partId);
    if (!part) {
      missingParts.push(rp.partId);
      continue;
    }
    lines.push({
      ...base,
      id: newId(),
      kind: 'part',
      description: `${part.partNumber} ${part.description}`.slice(0, 300),
      quantity: rp.quantity,
      partId: part.id,
      supplierId: part.supplierId,
      unitCost: part.unitCost,
      unitPrice: part.unitPrice,
      markupPercent: part.markupPercent,
      vatRate: part.vatRate,
    });
  }
  return { lines, tasks, missingParts };
}
