import Decimal from 'decimal.js';
import { z } from 'zod';
import { TEXT_MAX, decimalString, idSchema, isoDate, optionalText, safeString, shortText } from './common.js';
import { HOURS_IN_A_DAY } from '../bounds.js';
import type { ChecklistLimit } from './templates.js';
import type { FindingPhotoDto } from './photos.js';

/**
 * The trade's three categories, framed as the trade frames them: an airworthiness item or not,
 * plus information (vocabulary.md). Never an urgency scale and never a prediction.
 */
export const FINDING_CATEGORIES = ['airworthiness', 'recommended', 'advisory'] as const;
export type FindingCategory = (typeof FINDING_CATEGORIES)[number];
export const FINDING_CATEGORY_LABELS: Record<FindingCategory, string> = {
  airworthiness: 'Airworthiness',
  recommended: 'Recommended',
  advisory: 'Advisory',
};
export const FINDING_CATEGORY_MEANINGS: Record<FindingCategory, string> = {
  airworthiness: 'Judged to affect airworthiness. The inspector decides when the aircraft may fly.',
  recommended: 'Not an airworthiness item. Advised while the aircraft is open.',
  advisory: 'Nothing needed now. Looked at again at the next inspection.',
};

/** A measured value may be negative (a temperature) and carries up to 4 decimals. */
export const measuredValueSchema = z
  .string()
  .trim()
  .regex(/^-?\d{1,8}(\.\d{1,4})?$/, { message: 'Enter the measured value as a number, e.g. 0.95.' });

export const remedyPartSchema = z.object({
  partId: idSchema,
  quantity: decimalString(2, 'Quantity'),
});

/** What the engineer proposes; the manager turns it into priced estimate lines. */
export const remedySchema = z.object({
  description: optionalText(TEXT_MAX.remedy, 'Remedy'),
  hours: decimalString(2, 'Hours').nullable().default(null),
  labourRateCode: shortText(20, 'Labour rate').nullable().default(null),
  parts: z.array(remedyPartSchema).max(30).default([]),
  /** The opening-up work this remedy needs, by name (e.g. "Gearbox off"); shared with other remedies. */
  accessTask: shortText(120, 'Access task').nullable().default(null),
});
export type RemedyInput = z.input<typeof remedySchema>;

export const findingCreateSchema = z.object({
  title: safeString('Title').trim().min(1, { message: 'Give the finding a short title.' }).max(160),
  location: safeString('Where on the aircraft').trim().min(1, { message: 'Say where on the aircraft.' }).max(160),
  category: z.enum(FINDING_CATEGORIES, { message: 'Choose airworthiness, recommended or advisory.' }),
  seen: safeString('What was seen').trim().min(1, { message: 'Say what was seen.' }).max(TEXT_MAX.seen, { message: `Keep what was seen to ${TEXT_MAX.seen} characters or fewer.` }),
  checklistItemId: idSchema.nullable().optional().default(null),
  measuredValue: measuredValueSchema.nullable().optional().default(null),
  remedy: remedySchema.default({ description: '', hours: null, labourRateCode: null, parts: [], accessTask: null }),
});
export type FindingCreateInput = z.input<typeof findingCreateSchema>;

export const findingUpdateSchema = z.object({
  version: z.number().int().min(0),
  title: safeString('Title').trim().min(1).max(160).optional(),
  location: safeString('Where on the aircraft').trim().min(1).max(160).optional(),
  category: z.enum(FINDING_CATEGORIES).optional(),
  seen: safeString('What was seen').trim().min(1).max(4000).optional(),
  remedy: remedySchema.optional(),
});
export type FindingUpdateInput = z.input<typeof findingUpdateSchema>;

export const findingActionSchema = z.object({
  version: z.number().int().min(0),
  reason: shortText(500, 'Reason').optional().default(''),
});
export type FindingActionInput = z.input<typeof findingActionSchema>;

export interface FindingDto {
  id: string;
  jobId: string;
  /** F-1, F-2 … within the job. */
  number: string;
  title: string;
  location: string;
  category: FindingCategory;
  seen: string;
  checklistItemId: string | null;
  measuredValue: string | null;
  limit: ChecklistLimit | null;
  state: import('../states.js').FindingState;
  remedy: z.output<typeof remedySchema>;
  raisedByName: string;
  raisedAt: string;
  rectifiedAt: string | null;
  rectifiedByName: string | null;
  /** Photos not removed, oldest first. */
  photos: FindingPhotoDto[];
  version: number;
}

/** Checklist results (vocabulary.md: pass, fail, n/a, or a measured value). */
export const CHECKLIST_RESULTS = ['pass', 'fail', 'na', 'measured'] as const;
export type ChecklistResult = (typeof CHECKLIST_RESULTS)[number];
export const CHECKLIST_RESULT_LABELS: Record<ChecklistResult, string> = {
  pass: 'Pass',
  fail: 'Fail',
  na: 'N/A',
  measured: 'Measured',
};

export const checklistRecordSchema = z
  .object({
    version: z.number().int().min(0),
    result: z.enum(CHECKLIST_RESULTS),
    measuredValue: measuredValueSchema.nullable().optional().default(null),
    note: optionalText(1000, 'Note'),
  })
  .refine((v) => (v.result === 'measured') === (v.measuredValue !== null), {
    path: ['measuredValue'],
    message: 'Record the measured value (and only for a measured result).',
  });
export type ChecklistRecordInput = z.input<typeof checklistRecordSchema>;

export interface JobChecklistItemDto {
  id: string;
  section: string;
  text: string;
  limit: ChecklistLimit | null;
  /** A hazard note shown beside the item (propeller live, fuel, engine runs); empty when none. */
  caution: string;
  result: ChecklistResult | null;
  measuredValue: string | null;
  /** 'within' | 'below' | 'above' for a measured value against its limit; null when not measured or no limit. */
  limitCheck: import('../checklist.js').LimitCheck | null;
  note: string;
  recordedByName: string | null;
  recordedAt: string | null;
  /** The finding raised from this item, if any. */
  findingId: string | null;
  version: number;
}

/**
 * Hours worked on one day: more than zero and, since a day has 24 hours (bounds.ts), never more
 * than 24. The server also refuses a person's entries for one day adding up past 24.
 */
export const timeLogHoursSchema = decimalString(2, 'Hours')
  .refine((h) => !/^\d+(\.\d+)?$/.test(h) || new Decimal(h).gt(0), { message: 'Log more than zero hours.' })
  .refine((h) => !/^\d+(\.\d+)?$/.test(h) || new Decimal(h).lte(HOURS_IN_A_DAY), { message: `A day has ${HOURS_IN_A_DAY} hours: log at most ${HOURS_IN_A_DAY} hours for one day.` });

export const timeLogCreateSchema = z.object({
  hours: timeLogHoursSchema,
  workedOn: isoDate,
  note: optionalText(500, 'Note'),
  findingId: idSchema.nullable().optional().default(null),
});
export type TimeLogCreateInput = z.input<typeof timeLogCreateSchema>;

/** Correcting a time entry: any of its fields, with the version it was read at. */
export const timeLogUpdateSchema = z.object({
  version: z.number().int().min(0),
  hours: timeLogHoursSchema.optional(),
  workedOn: isoDate.optional(),
  note: safeString('Note').trim().max(500, { message: 'Keep the note to 500 characters or fewer.' }).optional(),
  findingId: idSchema.nullable().optional(),
});
export type TimeLogUpdateInput = z.input<typeof timeLogUpdateSchema>;

/** Removing a time entry: the version it was read at and, optionally, why (kept in history). */
export const timeLogRemoveSchema = z.object({
  version: z.number().int().min(0),
  reason: safeString('Reason').trim().max(500, { message: 'Keep the reason to 500 characters or fewer.' }).optional().default(''),
});
export type TimeLogRemoveInput = z.input<typeof timeLogRemoveSchema>;

export interface TimeLogDto {
  id: string;
  userName: string;
  hours: string;
  workedOn: string;
  note: string;
  findingId: string | null;
  createdAt: string;
  /** Who logged it, so the hangar offers changes only on one's own entries (managers and admins: any). */
  userId: string | null;
  version: number;
}
