import { z } from 'zod';
import { decimalString, patchOf, safeString, shortText, TEXT_MAX } from './common.js';
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
  code: safeString('Code').trim().min(1).max(20).regex(/^[a-z0-9-]+$/, { message: 'Use lower-case letters, digits and -.' }),
  name: safeString('Name').trim().min(1).max(60),
  ratePerHour: decimalString(2, 'Rate'),
});

export const APPROVAL_LINK_DAYS = { min: 1, max: 60 } as const;
export const CHASE_AFTER_HOURS = { min: 1, max: 720 } as const;
export const PAYMENT_TERMS_DAYS = { min: 0, max: 120 } as const;

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
  /** How long an approval link opens the owner's decision page: 1 to 60 days. */
  approvalLinkDays: z
    .number({ message: 'Enter the number of days, e.g. 14.' })
    .int({ message: 'Give whole days.' })
    .min(APPROVAL_LINK_DAYS.min, { message: `A link has to last at least ${APPROVAL_LINK_DAYS.min} day.` })
    .max(APPROVAL_LINK_DAYS.max, { message: `A link can last at most ${APPROVAL_LINK_DAYS.max} days; send a new one after that.` })
    .default(14),
  /** Hours after sending (or the last reminder) before an undecided request is chased: 1 hour to 30 days. */
  chaseAfterHours: z
    .number({ message: 'Enter the number of hours, e.g. 48.' })
    .int({ message: 'Give whole hours.' })
    .min(CHASE_AFTER_HOURS.min, { message: `Wait at least ${CHASE_AFTER_HOURS.min} hour before a reminder.` })
    .max(CHASE_AFTER_HOURS.max, { message: `Send a reminder within ${CHASE_AFTER_HOURS.max} hours (30 days).` })
    .default(48),
  /** The workshop's phone and e-mail, shown to owners wherever a page says to contact the workshop. */
  contactPhone: z
    .string()
    .trim()
    .max(40, { message: 'Keep the phone number to 40 characters or fewer.' })
    .regex(/^[0-9+()\s-]*$/, { message: 'Use digits, spaces and + ( ) - only, e.g. 01632 960123.' })
    .default(''),
  contactEmail: z.union([z.literal(''), z.string().trim().toLowerCase().pipe(z.email({ message: 'Enter a valid e-mail address.' }))]).default(''),
  depositPolicy: depositPolicySchema.default({ kind: 'none' }),
  /** Days the owner has to pay an invoice, counted from the invoice date: 0 (on receipt) to 120. */
  paymentTermsDays: z
    .number({ message: 'Enter the number of days, e.g. 30.' })
    .int({ message: 'Give whole days.' })
    .min(PAYMENT_TERMS_DAYS.min, { message: 'Payment terms cannot be negative; use 0 for payment on receipt.' })
    .max(PAYMENT_TERMS_DAYS.max, { message: `Payment terms can be at most ${PAYMENT_TERMS_DAYS.max} days.` })
    .default(30),
});


export const workshopUpdateSchema = z.object({
  version: z.number().int().min(0),
  name: safeString('Name').trim().min(1).max(160).optional(),
  addressLines: safeString('Address').trim().max(TEXT_MAX.address, { message: `Keep the address to ${TEXT_MAX.address} characters or fewer.` }).optional(),
  postcode: shortText(16, 'Postcode').optional(),
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
