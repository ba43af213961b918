import { z } from 'zod';
import { JOB_TYPES, type JobType } from './jobs.js';
import { TEXT_MAX, decimalString, idSchema, optionalText, safeString, shortText } from './common.js';
import { confirmLargeMessage, largeFigures } from '../bounds.js';
import { LINE_KINDS, VAT_RATE_CODES, type LineKind, type VatRateCode } from '../pricing/types.js';

/** Units a checklist limit may be measured in (SI where the trade uses it). */
export const LIMIT_UNITS = ['mm', 'in', 'N·m', 'bar', 'psi', '%', 'h', '°C', 'kg', 'V'] as const;

/**
 * A limit on a measured value. Template limits are examples for the demo: the screen tells the
 * engineer to use the manufacturer's current data.
 */
export const checklistLimitSchema = z
  .object({
    min: decimalString(4, 'Minimum').nullable().default(null),
    max: decimalString(4, 'Maximum').nullable().default(null),
    unit: z.enum(LIMIT_UNITS),
    /** Where the figure comes from, e.g. "Example only — use the manufacturer's current data". */
    source: optionalText(200, 'Source'),
  })
  .refine((l) => l.min !== null || l.max !== null, { path: ['max'], message: 'Give a minimum, a maximum or both.' });
export type ChecklistLimit = z.output<typeof checklistLimitSchema>;

/** Longest caution: a few sentences the engineer can read at a glance. */
export const CAUTION_MAX = 500;

export const templateChecklistItemSchema = z.object({
  section: shortText(80, 'Section').default(''),
  text: safeString('Check').trim().min(1, { message: 'Say what to check.' }).max(300, { message: 'Keep the check to 300 characters or fewer.' }),
  limit: checklistLimitSchema.nullable().default(null),
  /** A hazard note shown to the engineer beside the item (vocabulary.md, "caution"). */
  caution: optionalText(CAUTION_MAX, 'Caution'),
});

/**
 * A scope line of a template. Amounts are decimal strings; the estimate line built from it is
 * priced by the engine with the workshop's rates and mark-ups at booking time.
 */
export const templateLineSchema = z.object({
  kind: z.enum(LINE_KINDS),
  description: safeString('Description').trim().min(1, { message: 'Describe the line.' }).max(300, { message: 'Keep the description to 300 characters or fewer.' }),
  /** labour: hours; part: quantity; fee/subcontract: 1. */
  quantity: decimalString(2, 'Quantity').default('1'),
  labourRateCode: shortText(20, 'Labour rate').nullable().default(null),
  partId: idSchema.nullable().default(null),
  supplierId: idSchema.nullable().default(null),
  /** fee: the amount; subcontract: the supplier's cost; part without partId: unit cost. */
  amount: decimalString(2, 'Amount').nullable().default(null),
  vatRate: z.enum(VAT_RATE_CODES).default('standard'),
  /** A hazard note for the work this line covers; copied to the job and shown to the engineer. */
  caution: optionalText(CAUTION_MAX, 'Caution'),
});

export const templateSaveSchema = z.object({
  name: safeString('Name').trim().min(1, { message: 'Name is required.' }).max(160),
  jobType: z.enum(JOB_TYPES),
  description: optionalText(TEXT_MAX.templateDescription, 'Description'),
  lines: z.array(templateLineSchema).max(200),
  checklist: z.array(templateChecklistItemSchema).max(300),
  active: z.boolean().default(true),
  /** Sent after the person confirmed figures larger than a light-aircraft job usually needs (bounds.ts). */
  confirmLarge: z.boolean().optional().default(false),
});
export type TemplateSaveInput = z.input<typeof templateSaveSchema>;

function askForLarge(v: { lines: z.output<typeof templateLineSchema>[]; confirmLarge: boolean }, ctx: z.RefinementCtx): void {
  if (v.confirmLarge) return;
  const large = largeFigures(v.lines);
  if (large.length > 0) ctx.addIssue({ code: 'custom', path: ['confirmLarge'], message: confirmLargeMessage(large) });
}
/** Creating a template: the same fields, with large figures confirmed. */
export const templateCreateSchema = templateSaveSchema.superRefine(askForLarge);
/** PUT replaces the whole template; `version` guards against a concurrent edit. */
export const templateUpdateSchema = templateSaveSchema.extend({ version: z.number().int().min(0) }).superRefine(askForLarge);
export type TemplateUpdateInput = z.input<typeof templateUpdateSchema>;

export interface TemplateLineDto {
  kind: LineKind;
  description: string;
  quantity: string;
  labourRateCode: string | null;
  partId: string | null;
  supplierId: string | null;
  amount: string | null;
  vatRate: VatRateCode;
  caution: string;
}
export interface TemplateChecklistItemDto {
  section: string;
  text: string;
  limit: ChecklistLimit | null;
  caution: string;
}
export interface TemplateDto {
  id: string;
  name: string;
  jobType: JobType;
  description: string;
  lines: TemplateLineDto[];
  checklist: TemplateChecklistItemDto[];
  active: boolean;
  version: number;
}
export interface TemplateSummaryDto {
  id: string;
  name: string;
  jobType: JobType;
  lineCount: number;
  checklistCount: number;
  active: boolean;
}
