import Decimal from 'decimal.js';
import { z } from 'zod';
import { decimalString, idSchema, safeString, shortText } from './common.js';
import { confirmLargeMessage, largeFigures, type LargeFigure } from '../bounds.js';
import {
  ESTIMATE_STAGES,
  LINE_KINDS,
  VAT_RATE_CODES,
  type EstimateInput,
  type EstimateLineInput,
  type EstimateStage,
  type LineKind,
  type PricedEstimate,
  type PricedLine,
  type VatRateCode,
} from '../pricing/types.js';
import type { AgreedHow, QuoteState } from '../states.js';

/**
 * One stored estimate line. The client makes ids (UUIDs) for new lines and access tasks so that a
 * line can name an access task in the same save. Which fields matter depends on the kind:
 * labour: quantity = hours, ratePerHour (defaults from labourRateCode);
 * part: quantity, unitCost and either unitPrice (fixed) or markupPercent (else the workshop's);
 * subcontract: amount = the supplier's cost, markupPercent (else the workshop's), supplierId;
 * fee: amount.
 */
export const estimateLineSchema = z
  .object({
    id: idSchema,
    stage: z.enum(['inspection', 'discovered']),
    kind: z.enum(LINE_KINDS),
    description: safeString('Description').trim().min(1, { message: 'Describe the line.' }).max(300),
    quantity: decimalString(2, 'Quantity').default('1'),
    labourRateCode: shortText(20, 'Labour rate').nullable().default(null),
    ratePerHour: decimalString(2, 'Rate').nullable().default(null),
    partId: idSchema.nullable().default(null),
    supplierId: idSchema.nullable().default(null),
    unitCost: decimalString(4, 'Unit cost').nullable().default(null),
    unitPrice: decimalString(2, 'Sell price').nullable().default(null),
    markupPercent: decimalString(2, 'Mark-up').nullable().default(null),
    amount: decimalString(2, 'Amount').nullable().default(null),
    vatRate: z.enum(VAT_RATE_CODES).default('standard'),
    findingId: idSchema.nullable().default(null),
    accessTaskId: idSchema.nullable().default(null),
    // Read as a number only after the format check passed (decimalString aborts on a bad format).
    discountPercent: decimalString(2, 'Discount')
      .refine((v) => new Decimal(v).lte(100), { message: 'A discount cannot be more than 100%.' })
      .nullable()
      .default(null),
  })
  .superRefine((l, ctx) => {
    const need = (field: keyof typeof l, message: string) => {
      if (l[field] === null) ctx.addIssue({ code: 'custom', path: [field], message });
    };
    if (l.kind === 'labour') need('ratePerHour', 'Choose a labour rate.');
    if (l.kind === 'part' && l.unitPrice === null) need('unitCost', 'Give the unit cost or a fixed sell price.');
    if (l.kind === 'subcontract') need('amount', "Give the supplier's cost.");
    if (l.kind === 'fee') need('amount', 'Give the fee.');
  });
export type EstimateLineInputForm = z.input<typeof estimateLineSchema>;
export type EstimateLineSave = z.output<typeof estimateLineSchema>;

export const accessTaskSchema = z.object({
  id: idSchema,
  name: safeString('Access task').trim().min(1, { message: 'Name the access task.' }).max(120),
  hours: decimalString(2, 'Hours'),
  labourRateCode: shortText(20, 'Labour rate').nullable().default(null),
  ratePerHour: decimalString(2, 'Rate'),
  vatRate: z.enum(VAT_RATE_CODES).default('standard'),
});
export type AccessTaskSave = z.output<typeof accessTaskSchema>;

/**
 * Saving the estimate replaces its inspection-scope and discovered lines and its access tasks.
 * Approved and declined lines are the owner's decisions and are never changed by this save.
 * `version` is the version the editor loaded: a stale one is refused (409 stale_version).
 */
export const estimateSaveSchema = z
  .object({
    version: z.number().int().min(0),
    lines: z.array(estimateLineSchema).max(2000),
    accessTasks: z.array(accessTaskSchema).max(100).default([]),
    /** Sent after the person confirmed figures larger than a light-aircraft job usually needs (bounds.ts). */
    confirmLarge: z.boolean().optional().default(false),
  })
  .superRefine((v, ctx) => {
    const tasks = new Set<string>();
    v.accessTasks.forEach((t, i) => {
      if (tasks.has(t.id)) ctx.addIssue({ code: 'custom', path: ['accessTasks', i, 'id'], message: 'Each access task needs its own id; this one is listed twice.' });
      tasks.add(t.id);
    });
    const seen = new Set<string>();
    v.lines.forEach((l, i) => {
      if (seen.has(l.id)) ctx.addIssue({ code: 'custom', path: ['lines', i, 'id'], message: 'Each line needs its own id.' });
      seen.add(l.id);
      if (l.accessTaskId !== null && !tasks.has(l.accessTaskId)) {
        ctx.addIssue({ code: 'custom', path: ['lines', i, 'accessTaskId'], message: 'That access task is not on this estimate.' });
      }
    });
    if (!v.confirmLarge) {
      const large = estimateLargeFigures(v);
      if (large.length > 0) ctx.addIssue({ code: 'custom', path: ['confirmLarge'], message: confirmLargeMessage(large) });
    }
  });

/** Figures on the lines and access tasks of an estimate save that need the person's confirmation. */
export function estimateLargeFigures(v: {
  lines: readonly { kind: string; description: string; quantity?: string | null; ratePerHour?: string | null; unitCost?: string | null; unitPrice?: string | null; amount?: string | null }[];
  accessTasks?: readonly { name: string; hours: string; ratePerHour: string }[];
}): LargeFigure[] {
  const tasks = (v.accessTasks ?? []).map((t) => ({ kind: 'labour', description: t.name, quantity: t.hours, ratePerHour: t.ratePerHour }));
  return [...largeFigures(v.lines), ...largeFigures(tasks)];
}
export type EstimateSaveInput = z.input<typeof estimateSaveSchema>;

export interface EstimateLineDto {
  id: string;
  stage: EstimateStage;
  kind: LineKind;
  description: string;
  quantity: string;
  labourRateCode: string | null;
  ratePerHour: string | null;
  partId: string | null;
  supplierId: string | null;
  unitCost: string | null;
  unitPrice: string | null;
  markupPercent: string | null;
  amount: string | null;
  vatRate: VatRateCode;
  findingId: string | null;
  accessTaskId: string | null;
  discountPercent: string | null;
  /** Inspection lines: when the owner agreed this line of the quote; null while unagreed (always null for other stages). */
  agreedAt: string | null;
  agreedHow: AgreedHow | null;
}

export interface AccessTaskDto {
  id: string;
  name: string;
  hours: string;
  labourRateCode: string | null;
  ratePerHour: string;
  vatRate: VatRateCode;
}

/**
 * A line's figures from the pricing engine, in the order of `EstimateDto.lines` and keyed by the
 * line's id. What the line is (its stage, kind, finding, access task and VAT rate) is said once,
 * in `lines`, not repeated here: a 200-line estimate travels about a fifth lighter for it.
 */
export type EstimateLineFigures = Pick<PricedLine, 'id' | 'agreed' | 'vatPercent' | 'cost' | 'listNet' | 'discount' | 'net' | 'vat'>;

/** The engine's figures as the estimate's answer carries them: every total, and each line's figures. */
export type EstimatePricedDto = Omit<PricedEstimate, 'lines'> & { lines: EstimateLineFigures[] };

/** The line figures of a priced estimate, without what `lines` already says. */
export function lineFiguresOf(priced: PricedEstimate): EstimatePricedDto {
  return {
    ...priced,
    lines: priced.lines.map((l) => ({ id: l.id, agreed: l.agreed, vatPercent: l.vatPercent, cost: l.cost, listNet: l.listNet, discount: l.discount, net: l.net, vat: l.vat })),
  };
}

/** The engine's whole answer again, each line's figures joined with what its line says. */
export function pricedEstimateOf(dto: Pick<EstimateDto, 'lines' | 'priced'>): PricedEstimate {
  const byId = new Map(dto.lines.map((l) => [l.id, l]));
  return {
    ...dto.priced,
    lines: dto.priced.lines.map((f) => {
      const l = byId.get(f.id);
      if (!l) throw new Error(`The estimate's figures name a line it does not hold (${f.id}).`);
      return { id: f.id, stage: l.stage, agreed: f.agreed, kind: l.kind, findingId: l.findingId, accessTaskId: l.accessTaskId, vatRate: l.vatRate, vatPercent: f.vatPercent, cost: f.cost, listNet: f.listNet, discount: f.discount, net: f.net, vat: f.vat };
    }),
  };
}

export interface EstimateDto {
  jobId: string;
  version: number;
  currency: string;
  lines: EstimateLineDto[];
  accessTasks: AccessTaskDto[];
  /** Every figure, from the pricing engine on the server. The client's live preview uses the same engine. */
  priced: EstimatePricedDto;
  quote: EstimateQuoteDto;
}

/** The quote (the inspection scope as the owner sees it): its state derived from agreement and open requests. */
export interface EstimateQuoteDto {
  state: QuoteState;
  /** The unagreed inspection lines incl. VAT (the engine's quoteAwaiting gross). */
  awaitingGross: string;
  /** Who agreed it last (the owner's typed name, or who was on the phone); null while never agreed. */
  agreedBy: string | null;
  agreedAt: string | null;
  agreedHow: AgreedHow | null;
  /** The request holding the quote that waits for the owner, if any. */
  openRequestId: string | null;
}

/** Maps stored lines to the pricing engine's input: the one place this mapping is written. */
export function estimateEngineInput(lines: EstimateLineDto[], accessTasks: AccessTaskDto[]): EstimateInput {
  return {
    // Each kind's object written out in full (no `{ ...common, … }`: a spread followed by more keys
    // builds every object the slow way, and this runs once per line of every estimate read).
    lines: lines.map((l): EstimateLineInput => {
      const { id, stage, vatRate, findingId, accessTaskId } = l;
      const discount = l.discountPercent !== null ? { percent: l.discountPercent } : null;
      // Only inspection lines await agreement; the engine ignores the flag elsewhere.
      const agreed = stage === 'inspection' ? l.agreedAt !== null : undefined;
      switch (l.kind) {
        case 'labour':
          return { id, stage, vatRate, findingId, accessTaskId, discount, agreed, kind: 'labour', hours: l.quantity, ratePerHour: l.ratePerHour ?? '0' };
        case 'part':
          return { id, stage, vatRate, findingId, accessTaskId, discount, agreed, kind: 'part', quantity: l.quantity, unitCost: l.unitCost, unitPrice: l.unitPrice, markupPercent: l.markupPercent };
        case 'subcontract':
          return { id, stage, vatRate, findingId, accessTaskId, discount, agreed, kind: 'subcontract', cost: l.amount ?? '0', markupPercent: l.markupPercent };
        case 'fee':
          return { id, stage, vatRate, findingId, accessTaskId, discount, agreed, kind: 'fee', amount: l.amount ?? '0' };
      }
    }),
    accessTasks: accessTasks.map((t) => ({ id: t.id, hours: t.hours, ratePerHour: t.ratePerHour, vatRate: t.vatRate })),
  };
}

export { ESTIMATE_STAGES };
