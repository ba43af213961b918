import { randomUUID } from 'node:crypto';
import type { Transaction } from 'sequelize';
import { FINDING_CATEGORY_LABELS, type ChecklistResult, type EstimateStage, type FindingCategory, type FindingState, type LineKind } from '../../shared/src/index.js';
import { AccessTask, AuditEvent, EstimateLine, Finding, JobChecklistItem, JobTemplate, Part, Supplier, type Job, type User, type Workshop } from '../../server/src/models/index.js';
import { applyTemplate, ensureEstimate } from '../../server/src/services/estimates.service.js';
import type { Scope } from '../../server/src/services/scope.js';
import { DEMO_PARTS, DEMO_SUPPLIERS, DEMO_TEMPLATES } from './demo-catalogue.js';

export interface Catalogue {
  suppliers: Map<string, Supplier>;
  parts: Map<string, Part>;
  templates: Map<string, JobTemplate>;
}

/** Suppliers, parts and the five templates; skipped when the workshop already has templates. */
export async function seedCatalogue(w: Workshop, t: Transaction): Promise<Catalogue | null> {
  if (await JobTemplate.count({ where: { workshopId: w.id }, transaction: t })) return null;
  const suppliers = new Map<string, Supplier>();
  for (const s of DEMO_SUPPLIERS) {
    const { key, ...row } = s;
    suppliers.set(key, await Supplier.create({ ...row, workshopId: w.id }, { transaction: t }));
  }
  const parts = new Map<string, Part>();
  for (const p of DEMO_PARTS) {
    const { key, supplier, ...row } = p;
    parts.set(key, await Part.create({ ...row, workshopId: w.id, supplierId: suppliers.get(supplier)!.id }, { transaction: t }));
  }
  const templates = new Map<string, JobTemplate>();
  for (const tp of DEMO_TEMPLATES) {
    const row = await JobTemplate.create(
      {
        workshopId: w.id,
        name: tp.name,
        jobType: tp.jobType,
        description: tp.description,
        lines: tp.lines.map((l) => ({
          kind: l.kind,
          description: l.description,
          quantity: l.quantity,
          labourRateCode: l.labourRateCode ?? null,
          partId: l.part ? parts.get(l.part)!.id : null,
          supplierId: l.supplier ? suppliers.get(l.supplier)!.id : null,
          amount: l.amount ?? null,
          vatRate: 'standard' as const,
          caution: l.caution ?? '',
        })),
        checklist: tp.checklist.map((c) => ({ section: c.section, text: c.text, limit: c.limit ?? null, caution: c.caution ?? '' })),
      },
      { transaction: t },
    );
    templates.set(tp.key, row);
  }
  return { suppliers, parts, templates };
}

interface DemoLine {
  stage: EstimateStage;
  kind: LineKind;
  description: string;
  quantity: string;
  /** labour: workshop rate code */
  rate?: 'standard' | 'sailcloth';
  part?: string;
  unitCost?: string;
  amount?: string;
  access?: string;
}

interface DemoFinding {
  title: string;
  location: string;
  category: FindingCategory;
  seen: string;
  state: FindingState;
  /** The checklist item (by its text) it was raised from, with the value measured. */
  fromCheck?: { text: string; value: string };
  remedy: string;
  accessTask?: string;
  rectified?: boolean;
  by: string;
  lines: DemoLine[];
}

interface DemoWork {
  template?: string;
  lines?: DemoLine[];
  accessTasks?: { key: string; name: string; hours: string }[];
  checks?: { text: string; result: ChecklistResult; value?: string; by: string }[];
  findings?: DemoFinding[];
}

/** What each demo job holds, by "registration|title". */
const DEMO_WORK: Record<string, DemoWork> = {
  'Q-MRLW|Gearbox inspection': {
    template: 'gearbox',
    checks: [
      { text: 'Magnetic drain plug: no metal', result: 'pass', by: 'sam' },
      { text: 'Drive-gear nut torque', result: 'measured', value: '165', by: 'sam' },
      { text: 'Backlash at the propeller flange', result: 'pass', by: 'sam' },
    ],
    findings: [
      {
        title: 'Drive-gear nut below torque', location: 'Reduction gearbox, propeller side', category: 'airworthiness', by: 'sam',
        seen: 'The nut turned at 165 N·m; witness marks had moved. This explains the rattle at idle.', state: 'approved', rectified: true,
        fromCheck: { text: 'Drive-gear nut torque', value: '165' }, remedy: 'Fit a new nut and split pin, torque and lock.',
        lines: [
          { stage: 'approved', kind: 'labour', description: 'Fit new drive-gear nut, torque and lock', quantity: '1', rate: 'standard' },
          { stage: 'approved', kind: 'part', description: 'Drive-gear castellated nut with split pin', quantity: '1', part: 'gearNut' },
        ],
      },
    ],
  },
  'Q-BRKE|200-hour engine service': { template: '200h' },
  'Q-MRLW|Exhaust spring replacement': {
    lines: [
      { stage: 'inspection', kind: 'labour', description: 'Replace exhaust springs and check the flanges', quantity: '1', rate: 'standard' },
      { stage: 'inspection', kind: 'part', description: 'Exhaust springs (not stocked)', quantity: '2', unitCost: '4.50' },
    ],
  },
  'Q-BRKE|Fuel hose and clip renewal': {
    lines: [
      { stage: 'inspection', kind: 'labour', description: 'Renew fuel hoses and clips', quantity: '2', rate: 'standard' },
      { stage: 'inspection', kind: 'part', description: 'Fuel hose, 6 mm', quantity: '3', part: 'fuelHose' },
      { stage: 'inspection', kind: 'part', description: 'Hose clamps', quantity: '8', part: 'clamp' },
    ],
  },
  'Q-SALT|Wing strip inspection and re-cover': {
    template: 'wing',
    checks: [
      { text: 'Spars and ribs: dents, cracks and corrosion', result: 'pass', by: 'priya' },
      { text: 'Strut fittings and attachment points', result: 'fail', by: 'priya' },
      { text: 'Batten pockets and stitching', result: 'fail', by: 'priya' },
    ],
    findings: [
      {
        title: 'Batten pocket stitching worn', location: 'Left wing, trailing edge, pockets 3 to 6', category: 'recommended', by: 'priya',
        seen: 'Stitching thread has worn through on four pockets; battens still held.', state: 'approved',
        remedy: 'Re-stitch the pockets while the covering is off.',
        lines: [{ stage: 'approved', kind: 'labour', description: 'Re-stitch batten pockets', quantity: '2', rate: 'sailcloth' }],
      },
      {
        title: 'Corrosion at lower strut fitting', location: 'Right wing, lower strut attachment', category: 'airworthiness', by: 'priya',
        seen: 'Pitting under the paint around the bolt hole; the fitting needs replacing before flight.', state: 'declined',
        remedy: 'Replace the strut fitting and bolt.',
        lines: [
          { stage: 'declined', kind: 'labour', description: 'Replace lower strut fitting', quantity: '3', rate: 'standard' },
          { stage: 'declined', kind: 'fee', description: 'Strut fitting, made to drawing', quantity: '1', amount: '95.00' },
        ],
      },
    ],
  },
  'Q-MRLW|Yearly look-over': {
    lines: [{ stage: 'inspection', kind: 'labour', description: 'Yearly look-over', quantity: '1.5', rate: 'standard' }],
  },
  'Q-BRKE|100-hour engine service': {
    template: '100h',
    accessTasks: [{ key: 'exhaust', name: 'Exhaust system off and on', hours: '1.5' }],
    checks: [
      { text: 'Oil filter element cut open: no metal', result: 'pass', by: 'priya' },
      { text: 'Spark plug electrode gap, each plug', result: 'measured', value: '0.95', by: 'priya' },
      { text: 'Coolant hoses and clamps', result: 'fail', by: 'priya' },
      { text: 'Exhaust flanges, springs and mounts', result: 'fail', by: 'priya' },
    ],
    findings: [
      {
        title: 'Spark plug electrodes worn past the limit', location: 'Engine, all four plugs', category: 'recommended', by: 'priya',
        seen: 'Widest gap measured 0.95 mm; electrodes rounded.', state: 'priced',
        fromCheck: { text: 'Spark plug electrode gap, each plug', value: '0.95' }, remedy: 'Fit four new plugs.',
        lines: [
          { stage: 'discovered', kind: 'part', description: 'Spark plugs', quantity: '4', part: 'plug' },
          { stage: 'discovered', kind: 'labour', description: 'Fit new spark plugs', quantity: '0.5', rate: 'standard' },
        ],
      },
      {
        title: 'Exhaust flange gasket blowing', location: 'Engine, cylinder 2 exhaust port', category: 'recommended', by: 'priya',
        seen: 'Soot trail from the flange; gasket flattened.', state: 'priced', accessTask: 'exhaust',
        remedy: 'Renew the gasket with the exhaust off.',
        lines: [
          { stage: 'discovered', kind: 'part', description: 'Exhaust flange gasket', quantity: '1', part: 'gasket', access: 'exhaust' },
          { stage: 'discovered', kind: 'labour', description: 'Renew flange gasket', quantity: '0.5', rate: 'standard', access: 'exhaust' },
        ],
      },
      {
        title: 'Coolant hose cracked at cylinder head', location: 'Engine, cylinder 2, behind the exhaust', category: 'airworthiness', by: 'priya',
        seen: 'Surface cracks round the hose where it bends; weeping coolant.', state: 'priced', accessTask: 'exhaust',
        remedy: 'Renew the hose and both clamps; shares the exhaust removal with the gasket.',
        lines: [
          { stage: 'discovered', kind: 'part', description: 'Coolant hose', quantity: '1', part: 'hose', access: 'exhaust' },
          { stage: 'discovered', kind: 'part', description: 'Hose clamps', quantity: '2', part: 'clamp', access: 'exhaust' },
          { stage: 'discovered', kind: 'labour', description: 'Renew coolant hose', quantity: '0.5', rate: 'standard', access: 'exhaust' },
        ],
      },
    ],
  },
  'Q-BRKA|Annual permit inspection': { template: 'annual' },
  'Q-BRKA|Hang-point bolt replacement': {
    lines: [
      { stage: 'inspection', kind: 'labour', description: 'Replace hang-point bolt and bushes', quantity: '1.5', rate: 'standard' },
      { stage: 'inspection', kind: 'part', description: 'Hang-point bolt kit (ordered in)', quantity: '1', unitCost: '38.00' },
    ],
  },
};

export interface SeededJob {
  job: Job;
  registration: string;
  at: Date;
}

/** Gives each demo job its estimate, checklist results and findings, as a workshop would have left them. */
export async function seedJobWork(w: Workshop, cat: Catalogue, jobs: SeededJob[], staff: Map<string, User>, t: Transaction): Promise<void> {
  const manager = staff.get('declan')!;
  const scope: Scope = { workshopId: w.id, userId: manager.id, role: 'manager', customerId: null };
  const rate = (code: string) => w.labourRates.find((r) => r.code === code)!.ratePerHour;
  for (const { job, registration, at } of jobs) {
    await ensureEstimate(scope, job.id, t);
    const work = DEMO_WORK[`${registration}|${job.title}`];
    if (!work) continue;
    if (work.template) await applyTemplate(scope, job.id, cat.templates.get(work.template)!.id, t);
    const items = await JobChecklistItem.findAll({ where: { jobId: job.id }, transaction: t });
    const itemByText = new Map(items.map((i) => [i.text, i]));
    for (const c of work.checks ?? []) {
      await itemByText.get(c.text)!.update(
        { result: c.result, measuredValue: c.value ?? null, recordedBy: staff.get(c.by)!.id, recordedAt: at },
        { transaction: t },
      );
    }
    const taskIds = new Map<string, string>();
    for (const [i, a] of (work.accessTasks ?? []).entries()) {
      const id = randomUUID();
      taskIds.set(a.key, id);
      await AccessTask.create({ jobId: job.id, id, workshopId: w.id, name: a.name, hours: a.hours, labourRateCode: 'standard', ratePerHour: rate('standard'), vatRate: 'standard', sortOrder: i }, { transaction: t });
    }
    let sort = await EstimateLine.count({ where: { jobId: job.id }, transaction: t });
    const addLine = async (l: DemoLine, findingId: string | null) => {
      const part = l.part ? cat.parts.get(l.part)! : null;
      await EstimateLine.create(
        {
          jobId: job.id, id: randomUUID(), workshopId: w.id, stage: l.stage, kind: l.kind, description: l.description, quantity: l.quantity,
          labourRateCode: l.rate ?? null, ratePerHour: l.rate ? rate(l.rate) : null, partId: part?.id ?? null, supplierId: part?.supplierId ?? null,
          unitCost: part?.unitCost ?? l.unitCost ?? null, unitPrice: part?.unitPrice ?? null, markupPercent: part?.markupPercent ?? null,
          amount: l.amount ?? null, vatRate: 'standard', findingId, accessTaskId: l.access ? taskIds.get(l.access)! : null, discountPercent: null, sortOrder: sort++,
        },
        { transaction: t },
      );
    };
    for (const l of work.lines ?? []) await addLine(l, null);
    let seq = 0;
    for (const f of work.findings ?? []) {
      seq += 1;
      const item = f.fromCheck ? itemByText.get(f.fromCheck.text)! : null;
      const raiser = staff.get(f.by)!;
      const finding = await Finding.create(
        {
          workshopId: w.id, jobId: job.id, seq, title: f.title, location: f.location, category: f.category, seen: f.seen,
          checklistItemId: item?.id ?? null, measuredValue: f.fromCheck?.value ?? null, limit: item?.limit ?? null, state: f.state,
          remedy: { description: f.remedy, hours: null, labourRateCode: null, parts: [], accessTask: f.accessTask ? work.accessTasks!.find((a) => a.key === f.accessTask)!.name : null },
          raisedBy: raiser.id, raisedAt: at, rectifiedAt: f.rectified ? at : null, rectifiedBy: f.rectified ? raiser.id : null,
        },
        { transaction: t },
      );
      for (const l of f.lines) await addLine(l, finding.id);
      await AuditEvent.create(
        { workshopId: w.id, jobId: job.id, actorUserId: raiser.id, action: 'finding.raised', summary: `Raised F-${seq} (${FINDING_CATEGORY_LABELS[f.category]}): ${f.title}, ${f.location}`, detail: { findingId: finding.id }, at },
        { transaction: t },
      );
    }
    if (seq) await ensureEstimate(scope, job.id, t).then((e) => e.update({ lastFindingNumber: seq }, { transaction: t }));
  }
}
