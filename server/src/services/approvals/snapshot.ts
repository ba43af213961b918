import {
  QUOTE_ITEM_ID,
  choiceBasisFrom,
  priceChoice,
  type AccessTaskDto,
  type ApprovalSnapshot,
  type EstimateLineDto,
  type PricedEstimate,
  type SnapshotLine,
} from '@wingstage/shared';
import type { Finding, Workshop } from '../../models/index.js';
import type { JobRow } from '../job-access.js';
import { pricingOf } from '../pricing.js';

/** The workshop's phone and e-mail from its settings, only those it has filled in. */
export function workshopContact(w: Workshop): { workshopPhone?: string; workshopEmail?: string } {
  const settings = (w.settings ?? {}) as { contactPhone?: unknown; contactEmail?: unknown };
  const text = (v: unknown) => (typeof v === 'string' ? v.trim() : '');
  const phone = text(settings.contactPhone);
  const email = text(settings.contactEmail);
  return { ...(phone ? { workshopPhone: phone } : {}), ...(email ? { workshopEmail: email } : {}) };
}

export const findingNumber = (seq: number) => `F-${seq}`;

/**
 * Built only from the engine's result at sending: the basis carries the engine's own nets, and
 * every figure stored is `priceChoice` with everything approved, so the owner sees exactly what
 * the estimate will show once they decide.
 */
export function buildSnapshot(p: {
  requestId: string;
  job: JobRow;
  w: Workshop;
  owner: { name: string };
  message: string;
  sentAt: Date;
  expiresAt: Date;
  /** The quote goes in as item "quote" (its unagreed inspection lines). */
  includeQuote: boolean;
  /** The quote was agreed before (some inspection line still agreed): this is a change to it. */
  quoteChange: boolean;
  findings: Finding[];
  lines: EstimateLineDto[];
  tasks: AccessTaskDto[];
  priced: PricedEstimate;
  /** Each finding's current photos (photos.service snapshotPhotosOf); a finding missing here has none. */
  photos?: Map<string, ApprovalSnapshot['findings'][number]['photos']>;
}): ApprovalSnapshot {
  const { w, lines, tasks, priced } = p;
  const taskName = (id: string) => tasks.find((x) => x.id === id)?.name ?? 'Opening-up work';
  const basis = choiceBasisFrom(priced, { quote: p.includeQuote, findingIds: p.findings.map((f) => f.id) }, pricingOf(w).vatRates, taskName);
  const all = priceChoice(basis, Object.fromEntries(basis.items.map((i) => [i.id, 'approve' as const])));
  const fixed = new Map(all.items.map((i) => [i.id, i.allApprovedGross]));
  const net = new Map(priced.lines.map((l) => [l.id, l.net]));
  const snapLine = (l: EstimateLineDto): SnapshotLine => ({
    description: l.description,
    kind: l.kind,
    quantity: l.quantity,
    net: net.get(l.id) ?? '0.00',
    vatRate: l.vatRate,
    accessTaskId: l.accessTaskId,
  });
  return {
    version: 3,
    requestId: p.requestId,
    jobId: p.job.id,
    jobNumber: p.job.number,
    jobTitle: p.job.title,
    registration: p.job.aircraft.registration,
    aircraftType: p.job.aircraft.type,
    ownerName: p.owner.name,
    workshopName: w.name,
    ...workshopContact(w),
    currency: priced.currency,
    rounding: priced.rounding,
    message: p.message,
    sentAt: p.sentAt.toISOString(),
    expiresAt: p.expiresAt.toISOString(),
    basis,
    quote: p.includeQuote
      ? {
          lines: lines.filter((l) => l.stage === 'inspection' && l.agreedAt === null).map(snapLine),
          gross: fixed.get(QUOTE_ITEM_ID)!,
          changeOf: p.quoteChange ? 'change' : 'first',
        }
      : null,
    findings: p.findings.map((f) => ({
      findingId: f.id,
      number: findingNumber(f.seq),
      title: f.title,
      category: f.category,
      location: f.location,
      seen: f.seen,
      measuredValue: f.measuredValue,
      limit: f.limit,
      photos: p.photos?.get(f.id) ?? [],
      lines: lines.filter((l) => l.findingId === f.id && l.stage === 'discovered').map(snapLine),
      gross: fixed.get(f.id)!,
    })),
    totals: {
      quoted: priced.quoted,
      agreedSoFar: all.agreedSoFar,
      ifAllApproved: all.ifAllApproved,
      approvingNow: all.approvingNow,
      openingUp: all.openingUp.map((o) => ({ id: o.id, name: o.name, gross: o.allApprovedGross, neededBy: o.neededBy })),
    },
  };
}

/** The items of a request in the order the owner meets them: the quote first, then findings as sent. */
export function itemIdsOf(s: ApprovalSnapshot): string[] {
  return [...(s.quote ? [QUOTE_ITEM_ID] : []), ...s.findings.map((f) => f.findingId)];
}

/** An item's name for e-mails and history: "the quote" or "F-3 Perished fuel hose". */
export function itemName(s: ApprovalSnapshot, itemId: string): string {
  if (itemId === QUOTE_ITEM_ID) return s.quote?.changeOf === 'change' ? 'the changed quote' : 'the quote';
  const f = s.findings.find((x) => x.findingId === itemId);
  return f ? `${f.number} ${f.title}` : itemId;
}
