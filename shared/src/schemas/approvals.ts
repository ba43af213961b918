import { z } from 'zod';
import { decimalString, idSchema, optionalText, safeString } from './common.js';
import type { FindingCategory } from './findings.js';
import type { ChecklistLimit } from './templates.js';
import type { SnapshotPhoto } from './photos.js';
import type { LineKind, Totals, VatRateCode } from '../pricing/types.js';
import { QUOTE_ITEM_ID, type Amounts, type ChoiceBasis } from '../pricing/choice.js';
import type { ApprovalRequestState } from '../states.js';

/**
 * The owner's standing go-ahead for one job, amounts incl. VAT (product brief, "Pre-authorised
 * limit"). Null means no limit of that kind; both null means no pre-authorisation.
 */
export const preAuthorisationSchema = z.object({
  version: z.number().int().min(0),
  perFinding: decimalString(2, 'Per-finding limit').nullable(),
  perJob: decimalString(2, 'Per-job limit').nullable(),
  /** How the owner gave it, e.g. "Phone call with Elspeth, 26 Nov". */
  agreedHow: optionalText(300, 'How it was agreed'),
});
export type PreAuthorisationInput = z.input<typeof preAuthorisationSchema>;

export interface PreAuthorisationDto {
  perFinding: string | null;
  perJob: string | null;
  agreedHow: string;
  /** Gross already approved within the limit on this job. */
  usedSoFar: string;
  /** perJob − usedSoFar, or null without a per-job limit. */
  headroom: string | null;
}

/**
 * Send for approval: the manager picks priced findings of one job, and/or the quote (every
 * inspection line the owner has not agreed yet, as one item "quote").
 */
export const approvalRequestCreateSchema = z
  .object({
    findingIds: z.array(idSchema).max(50).default([]),
    /** Put the unagreed inspection scope to the owner as the item "quote". */
    includeQuote: z.boolean().default(false),
    /** A short note from the workshop shown above the items. */
    message: optionalText(1000, 'Message'),
    /** The estimate version the manager was looking at: a stale one is refused (409 stale_version). */
    estimateVersion: z.number().int().min(0),
  })
  .superRefine((v, ctx) => {
    if (!v.includeQuote && v.findingIds.length === 0) {
      ctx.addIssue({ code: 'custom', path: ['findingIds'], message: 'Choose the quote or at least one priced finding.' });
    }
  });
export type ApprovalRequestCreateInput = z.input<typeof approvalRequestCreateSchema>;

/** The workshop records that the owner agreed the quote by phone: who, when, and the estimate it covers. */
export const quotePhoneAgreementSchema = z.object({
  /** Who agreed on the phone, in the workshop's words, e.g. "Rowan Tillett, the owner". */
  agreedWith: safeString('Who agreed').trim().min(2, { message: 'Say who agreed the quote on the phone.' }).max(200),
  agreedAt: z.iso
    .datetime({ offset: true, message: 'Give the date and time of the call.' })
    .refine((v) => Date.parse(v) <= Date.now() + 60_000, { message: 'The call cannot be in the future.' }),
  note: optionalText(1000, 'Note'),
  /** The estimate version the manager was looking at: a stale one is refused (409 stale_version). */
  estimateVersion: z.number().int().min(0),
});
export type QuotePhoneAgreementInput = z.input<typeof quotePhoneAgreementSchema>;

/** One line of an item (the quote's inspection lines, or a finding's discovered lines), as frozen in a snapshot. */
export interface SnapshotLine {
  description: string;
  kind: LineKind;
  quantity: string;
  /** After any line discount, in the currency's minor units: the engine's own figure. */
  net: string;
  vatRate: VatRateCode;
  /** The opening-up task this line needs (an id in `basis.accessTasks` or `basis.committed.accessTasks`), or null. */
  accessTaskId: string | null;
}

/** The item id of the quote in a request's decisions. */
export type DecisionItemId = typeof QUOTE_ITEM_ID | string;

/**
 * What the owner saw, frozen at sending. Its SHA-256 (hex, of the canonical JSON) is the snapshot
 * hash. Version 3: every figure comes from `priceChoice(basis, …)`; older documents were converted
 * once by migration 0050 (kept beside the hash the owner saw).
 */
export interface ApprovalSnapshot {
  version: 3;
  requestId: string;
  jobId: string;
  jobNumber: string;
  jobTitle: string;
  registration: string;
  aircraftType: string;
  ownerName: string;
  workshopName: string;
  /** The workshop's phone and e-mail at sending (its settings); absent on requests sent before they were carried. */
  workshopPhone?: string;
  workshopEmail?: string;
  currency: string;
  /** The VAT rounding method the figures were worked with. */
  rounding: string;
  message: string;
  sentAt: string;
  expiresAt: string;
  /** What prices any choice on this request (`priceChoice`). */
  basis: ChoiceBasis;
  /** The quote when the request holds it (item id "quote"). */
  quote: null | {
    lines: SnapshotLine[];
    /** Its fixed price if everything were approved (excl. opening-up, shown once on its own line). */
    gross: string;
    /** The first quote, or a change to a quote agreed before. */
    changeOf: 'first' | 'change';
  };
  findings: {
    findingId: string;
    number: string;
    title: string;
    category: FindingCategory;
    location: string;
    seen: string;
    measuredValue: string | null;
    limit: ChecklistLimit | null;
    /** The finding's photos at sending, oldest first. */
    photos: SnapshotPhoto[];
    /** Its discovered lines. */
    lines: SnapshotLine[];
    /** Its fixed price if everything were approved (excl. opening-up, shown once on its own line). */
    gross: string;
  }[];
  /** `priceChoice` with every item approved, and what was agreed before this request. */
  totals: {
    /** The quote as it stood at sending (every inspection line). */
    quoted: Totals;
    agreedSoFar: Totals;
    ifAllApproved: Totals;
    approvingNow: Amounts;
    /** Opening-up work shared by the items, each charged once: its fixed price if everything were approved. */
    openingUp: { id: string; name: string; gross: string; neededBy: string[] }[];
  };
}

export interface ApprovalRequestDto {
  id: string;
  jobId: string;
  state: ApprovalRequestState;
  findingIds: string[];
  /** The request holds the quote (item "quote"). */
  includesQuote: boolean;
  sentAt: string;
  expiresAt: string;
  decidedAt: string | null;
  decidedByName: string | null;
  revokedAt: string | null;
  /** The request that replaced this one, if a price changed after sending. */
  replacedById: string | null;
  lastRemindedAt: string | null;
  snapshotHash: string;
  /** Gross of the whole request as sent. */
  gross: string;
}

/** Result of "Send for approval": some findings may have been approved within the pre-authorised limit. */
export interface SendForApprovalResultDto {
  request: ApprovalRequestDto | null;
  approvedWithinLimit: { findingId: string; number: string; gross: string }[];
}

export const DECISIONS = ['approve', 'decline'] as const;
export type Decision = (typeof DECISIONS)[number];

/** An item of a request: "quote", or a finding's id. */
export const decisionItemIdSchema = z.union([z.literal(QUOTE_ITEM_ID), idSchema], { message: 'Not an item of this request.' });

/** The owner's typed name that confirms their decisions: its bounds and words, shared by the schema and the page. */
export const TYPED_NAME = {
  min: 2,
  max: 120,
  tooShort: 'Type your name to confirm.',
  tooLong: 'Your name is too long: keep it to 120 characters or fewer.',
} as const;

/**
 * What is wrong with a typed name, in the schema's own words, or null. The decision page checks
 * with this before sending (it loads no zod); the server checks the whole body with the schema.
 */
export function typedNameProblem(name: string): string | null {
  const n = name.trim();
  if (n.length < TYPED_NAME.min) return TYPED_NAME.tooShort;
  if (n.length > TYPED_NAME.max) return TYPED_NAME.tooLong;
  return null;
}

/** The owner's decisions on every item of one request (the quote and/or findings), confirmed by typing their name. */
export const decisionSubmitSchema = z.object({
  snapshotHash: z.string().regex(/^[0-9a-f]{64}$/, { message: 'This page is out of date: reload it.' }),
  decisions: z
    .array(
      z.object({
        itemId: decisionItemIdSchema,
        decision: z.enum(DECISIONS, { message: 'Approve or decline this item.' }),
        note: optionalText(1000, 'Note'),
      }),
    )
    .min(1)
    .max(50),
  typedName: safeString('Your name')
    .trim()
    .min(TYPED_NAME.min, { message: TYPED_NAME.tooShort })
    .max(TYPED_NAME.max, { message: TYPED_NAME.tooLong }),
});
export type DecisionSubmitInput = z.input<typeof decisionSubmitSchema>;

/** GET /api/decide/:token — everything the owner's decision page needs, without a sign-in. */
export interface DecisionPageDto {
  state: ApprovalRequestState;
  /** Plain words for a request that can no longer be decided (expired, revoked, replaced, decided). */
  closedReason: string | null;
  snapshot: ApprovalSnapshot;
  snapshotHash: string;
  /** When the link stops working: the request's own time, moved on by a re-send (the snapshot keeps the first send's). */
  expiresAt: string;
  /** Present once decided (never through a link that a newer one has superseded). */
  decisions: { itemId: DecisionItemId; decision: Decision; note: string }[] | null;
  decidedByName: string | null;
  decidedAt: string | null;
  /**
   * Set when this page was opened with a link the workshop has since superseded by re-sending the
   * request: when the newest link was sent. Such a link shows the request closed and decides nothing.
   */
  newerLinkSentAt: string | null;
}
