import type { DocumentJob, DocumentParty, EstimateStage, FindingCategory } from '@wingstage/shared';
import type { Letterhead } from './pdf/kit.js';

/*
 * The data the estimate and the decision record are rendered from, gathered by documents.service
 * from the live rows (an estimate changes until invoicing; a decision record is fixed once decided).
 * Amounts are decimal strings from the pricing engine or the request's snapshot; nothing is priced here.
 */

export interface EstimateDocumentLine {
  description: string;
  /** "F-3 Perished fuel hose" for a finding's work, else null. */
  finding: string | null;
  quantity: string;
  unit: string;
  vatPercent: string;
  discount: string;
  net: string;
  /** Inspection lines: agreed by the owner or not; null for the other stages. */
  agreed: boolean | null;
}

export interface EstimateDocument {
  kind: 'estimate';
  /** Who it is printed for: the owner's copy uses the owner's words. */
  audience: 'owner' | 'staff';
  printedAt: string;
  supplier: Letterhead;
  customer: DocumentParty & { email: string | null };
  job: DocumentJob & { state: string };
  currency: string;
  roundingLabel: string;
  stages: { stage: EstimateStage; lines: EstimateDocumentLine[]; totals: { net: string; vat: string; gross: string } }[];
  accessTasks: { name: string; hours: string; vatPercent: string; net: string; chargedIn: EstimateStage | null }[];
  totals: { label: string; net: string; vat: string; gross: string; strong?: boolean }[];
  /** Cautions from the inspection scope and the checklist: where, and what. */
  cautions: { where: string; caution: string }[];
}

export interface DecisionRecordItem {
  name: string;
  category: FindingCategory | null;
  /** Where it was found and what was seen, for a finding; null for the quote. */
  found: string | null;
  lines: { description: string; quantity: string; vatPercent: string; net: string }[];
  /** The item's price incl. VAT as the owner saw it (everything approved, before opening-up work). */
  gross: string;
  decision: 'approve' | 'decline' | null;
  note: string;
}

export interface DecisionRecordDocument {
  kind: 'decision_record';
  requestId: string;
  state: string;
  stateWords: string;
  supplier: Letterhead;
  ownerName: string;
  job: DocumentJob;
  currency: string;
  roundingLabel: string;
  sentAt: string;
  expiresAt: string;
  message: string;
  items: DecisionRecordItem[];
  openingUp: { name: string; gross: string; neededBy: string[]; charged: boolean | null }[];
  /** Figures from the snapshot's basis: as sent, and (once decided) for the owner's choice. */
  figures: { label: string; gross: string; strong?: boolean }[];
  decided: null | { byName: string; at: string; ip: string | null; device: string | null };
  snapshotHash: string;
}
