import { z } from 'zod';
import { decimalString, patchOf } from './common.js';
import { Dec } from '../money.js';
import type { WorkshopDepositPolicy } from '../pricing/deposit-policy.js';

export const VAT_ROUNDING_METHODS = ['invoice-down', 'invoice-nearest', 'line-nearest', 'line-down-tenth'] as const;

/** UK VAT registration: GB + 9 digits (or 12 for branch traders). */
export const vatNumberSchema = z
  .string()
  .trim()
  .toUpperCase()
  .regex(/^(GB)?\d{9}(\d{3})?$/, { message: 'Use a VAT number like GB123456789.' });

export const labourRateSchema = z.object({
  code: z.string().trim().min(1).max(20).regex(/^[a-z0-9-]+$/, { message: 'Use lower-case letters, digits and -.' }),
  name: z.string().trim().min(1).max(60),
  ratePerHour: decimalString(2, 'Rate'),
});

export const DEPOSIT_POLICY_KINDS = ['none', 'quote_percent', 'approved_work_percent'] as const;

// zod runs the refinement even after the pattern failed, so it checks the pattern itself first.
const depositPercent = decimalString(2, 'Percentage').refine((v) => !/^\d{1,12}(\.\d{1,2})?$/.test(v) || (new Dec(v).greaterThan(0) && new Dec(v).lessThanOrEqualTo(100)), {
  message: 'The percentage must be more than 0 and at most 100.',
});

/** See WorkshopDepositPolicy (shared/src/pricing/deposit-policy.ts). */
export const depositPolicySchema = z.discriminatedUnion(
  'kind',
  [
    z.object({ kind: z.literal('none') }),
    z.object({ kind: z.literal('quote_percent'), percent: depositPercent }),
    z.object({ kind: z.literal('approved_work_percent'), percent: depositPercent, threshold: decimalString(2, 'Threshold') }),
  ],
  { error: 'Choose no deposit, a percentage of the quote, or a percentage of approved work.' },
) satisfies z.ZodType<WorkshopDepositPolicy>;

export const workshopSettingsSchema = z.object({
  vatRounding: z.enum(VAT_ROUNDING_METHODS).default('invoice-nearest'),
  partsMarkupPercent: decimalString(2, 'Mark-up').default('20'),
  subcontractMarkupPercent: decimalString(2, 'Mark-up').default('10'),
  approvalLinkDays: z.number().int().min(1).max(60).default(14),
  chaseAfterHours: z.number().int().min(1).max(720).default(48),
  depositPolicy: depositPolicySchema.default({ kind: 'none' }),
});

export const workshopUpdateSchema = z.object({
  version: z.number().int().min(0),
  name: z.string().trim().min(1).max(160).optional(),
  addressLines: z.string().trim().max(300).optional(),
  postcode: z.string().trim().max(16).optional(),
  vatNumber: vatNumberSchema.optional(),
  labourRates: z.array(labourRateSchema).min(1).max(20).optional(),
  settings: patchOf(workshopSettingsSchema).optional(),
});
export type WorkshopUpdateInput = z.input<typeof workshopUpdateSchema>;

export interface WorkshopDto {
  id: string;
  name: string;
  addressLines: string;
  postcode: string;
  vatNumber: string;
  currency: string;
  vatRates: { standard: string; reduced: string; zero: string };
  labourRates: { code: string; name: string; ratePerHour: string }[];
  settings: z.output<typeof workshopSettingsSchema>;
  version: number;
}
