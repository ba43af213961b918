import { z } from 'zod';
import { decimalString, idSchema, optionalText, safeString } from './common.js';
import type { FindingCategory } from './findings.js';
import type { ChecklistLimit } from './templates.js';
import type { SnapshotPhoto } from './photos.js';
import type { LineKind, Totals, VatRateCode } from '../pricing/types.js';
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

/** Send for approval: the manager picks priced findings of one job. */
export const approvalRequestCreateSchema = z.object({
  findingIds: z.array(idSchema).min(1, { message: 'Choose at least one priced finding.' }).max(50),
  /** A short note from the workshop shown above the findings. */
  message: optionalText(1000, 'Message'),
  /** The estimate version the manager was looking at: a stale one is refused (409 stale_version). */
  estimateVersion: z.number().int().min(0),
});
export type ApprovalRequestCreateInput = z.input<typeof approvalRequestCreateSchema>;

/** One discovered line of a finding, as frozen in a snapshot. */
export interface SnapshotLine {
  description: string;
  kind: LineKind;
  quantity: string;
  /** After any line discount, in the currency's minor units. */
  net: string;
  vatRate?: VatRateCode;
  /** The opening-up task this line needs (an id in `pricingBasis.accessTasks`), or null. */
  accessTaskId?: string | null;
}

/** The rest of the engine's input for a request: VAT rates and the opening-up tasks its findings need. */
export interface SnapshotPricingBasis {
  /** The workshop's VAT percentages at sending. */
  vatRates: { standard: string; reduced: string; zero: string };
  /** Every access task a line of this request names, with its own labour priced (hours × rate, rounded). */
  accessTasks: { id: string; name: string; net: string; vatRate: VatRateCode }[];
  /** Of those, the ids the inspection scope or already-approved work pays for: never charged in this request. */
  accessPaid: string[];
  /**
   * The work already committed at sending (inspection scope and approved work) as engine inputs, so
   * the page can price the whole estimate as it would stand after the owner's choice and show the
   * new total with VAT worked on the whole invoice, as the estimate will. Absent from snapshots sent
   * before it existed: the page then adds "approved so far" and "approving now".
   */
  committed?: SnapshotCommittedWork;
}

/** One committed line as the engine needs it: no description, only what prices it. */
export interface SnapshotCommittedLine {
  stage: 'inspection' | 'approved';
  kind: LineKind;
  /** After any line discount, in the currency's minor units. */
  net: string;
  vatRate: VatRateCode;
  accessTaskId: string | null;
}

export interface SnapshotCommittedWork {
  lines: SnapshotCommittedLine[];
  /** Opening-up tasks committed work pays for (their own labour priced), including any the request's lines also name. */
  accessTasks: { id: string; net: string; vatRate: VatRateCode }[];
}

/** What the owner saw, frozen at sending. Its SHA-256 (hex, of the canonical JSON) is the snapshot hash. */
export interface ApprovalSnapshot {
  requestId: string;
  jobId: string;
  jobNumber: string;
  jobTitle: string;
  registration: string;
  aircraftType: string;
  ownerName: string;
  workshopName: string;
  currency: string;
  /** The VAT rounding method the figures were worked with. */
  rounding: string;
  message: string;
  sentAt: string;
  expiresAt: string;
  findings: {
    findingId: string;
    number: string;
    title: string;
    category: FindingCategory;
    location: string;
    seen: string;
    measuredValue: string | null;
    limit: ChecklistLimit | null;
    /** The finding's photos at sending, oldest first (a snapshot stored before photos existed may lack it: read as []). */
    photos: SnapshotPhoto[];
    /**
     * Its discovered lines. `net` is after any discount; `vatRate` and `accessTaskId` make each line
     * an engine input (absent from snapshots sent before `pricingBasis` existed).
     */
    lines: SnapshotLine[];
    /** Its price on its own incl. any access work nothing committed already pays for. */
    price: Totals;
    /** Access work already paid for elsewhere (names), so not charged again here. */
    accessCovered: string[];
    /** The saving incl. VAT from sharing access work with committed work. */
    accessSavingGross: string;
  }[];
  /**
   * What the pricing engine needs, with the findings' lines, to price ANY choice of this request's
   * findings exactly, shared opening-up included. Absent from snapshots sent before it existed: the
   * page then falls back to adding the findings' own prices.
   */
  pricingBasis?: SnapshotPricingBasis;
  totals: {
    /** The inspection scope as first quoted. */
    quoted: Totals;
    /** Inspection scope plus work approved before this request. */
    approvedSoFar: Totals;
    /** Everything in this request, if all of it were approved. */
    thisRequest: Totals;
    /** Other discovered work still awaiting a decision, outside this request. */
    undecidedElsewhere: Totals;
  };
}

export interface ApprovalRequestDto {
  id: string;
  jobId: string;
  state: ApprovalRequestState;
  findingIds: string[];
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

/** The owner's decisions on every finding of one request, confirmed by typing their name. */
export const decisionSubmitSchema = z.object({
  snapshotHash: z.string().regex(/^[0-9a-f]{64}$/, { message: 'This page is out of date: reload it.' }),
  decisions: z
    .array(
      z.object({
        findingId: idSchema,
        decision: z.enum(DECISIONS, { message: 'Approve or decline this finding.' }),
        note: optionalText(1000, 'Note'),
      }),
    )
    .min(1)
    .max(50),
  typedName: safeString('Your name').trim().min(2, { message: 'Type your name to confirm.' }).max(120),
});
export type DecisionSubmitInput = z.input<typeof decisionSubmitSchema>;

/** GET /api/decide/:token — everything the owner's decision page needs, without a sign-in. */
export interface DecisionPageDto {
  state: ApprovalRequestState;
  /** Plain words for a request that can no longer be decided (expired, revoked, replaced, decided). */
  closedReason: string | null;
  snapshot: ApprovalSnapshot;
  snapshotHash: string;
  /** Present once decided (never through a link that a newer one has superseded). */
  decisions: { findingId: string; decision: Decision; note: string }[] | null;
  decidedByName: string | null;
  decidedAt: string | null;
  /**
   * Set when this page was opened with a link the workshop has since superseded by re-sending the
   * request: when the newest link was sent. Such a link shows the request closed and decides nothing.
   */
  newerLinkSentAt: string | null;
}
