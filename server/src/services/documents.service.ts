import { Op } from 'sequelize';
import {
  APPROVAL_REQUEST_STATE_LABELS,
  JOB_STATE_LABELS,
  OWNER_APPROVAL_REQUEST_STATE_LABELS,
  OWNER_JOB_STATE_LABELS,
  DOCUMENT_PATHS,
  QUOTE_ITEM_ID,
  TOTAL_NAMES,
  priceChoice,
  vatRoundingWords,
  type ApprovalRequestState,
  type ApprovalSnapshot,
  type JobDocumentsDto,
  type JobState,
  type EstimateStage,
  type LineKind,
} from '@wingstage/shared';
import { AppError, notFound } from '../errors/app-error.js';
import { renderCreditNotePdf, renderDecisionRecordPdf, renderEstimatePdf, renderInvoicePdf, type DecisionRecordDocument, type EstimateDocument } from '../documents/index.js';
import type { Letterhead } from '../documents/pdf/kit.js';
import { ApprovalRequest, CreditNote, Customer, Finding, Invoice, JobChecklistItem, Workshop } from '../models/index.js';
import { decisionsOf } from './approvals/repository.js';
import { itemIdsOf, itemName, workshopContact } from './approvals/snapshot.js';
import { getEstimate } from './estimates.service.js';
import { viewJob, type JobView } from './job-access.js';
import { inWorkshop, type Scope } from './scope.js';

/*
 * The PDF downloads: who may fetch which document, the data each is rendered from, and its file
 * name. Owners reach only their own jobs' documents and staff their workshop's; anything else is a
 * 404, as for every other record. Issued invoices and credit notes are immutable and a decided
 * request never changes, so their PDFs are kept in a small cache instead of being laid out again.
 */

export interface PdfFile {
  bytes: Buffer;
  filename: string;
}

const CACHE_SIZE = 24;
const cache = new Map<string, Promise<Buffer>>();

/** One render per key at a time, and the last few kept (least recently used goes first). */
function cached(key: string | null, render: () => Promise<Buffer>): Promise<Buffer> {
  if (key === null) return render();
  const hit = cache.get(key);
  if (hit) {
    cache.delete(key);
    cache.set(key, hit);
    return hit;
  }
  const made = render();
  cache.set(key, made);
  made.catch(() => cache.delete(key));
  while (cache.size > CACHE_SIZE) cache.delete(cache.keys().next().value!);
  return made;
}

/** A file name of plain characters: "invoice-INV-000107-Q-BRKA.pdf". */
export function pdfName(...parts: string[]): string {
  const base = parts
    .map((p) => p.normalize('NFKD').replace(/[^A-Za-z0-9.-]+/g, '-').replace(/^-+|-+$/g, ''))
    .filter(Boolean)
    .join('-');
  return `${base.slice(0, 120) || 'document'}.pdf`;
}

/** The job behind a document, through the one access rule (owner: their own; staff: the workshop's); else the document is "not found". */
async function jobFor(scope: Scope, jobId: string, what: string): Promise<JobView> {
  try {
    return await viewJob(scope, jobId);
  } catch (err) {
    if (err instanceof AppError && err.status === 404) throw notFound(what);
    throw err;
  }
}

const lines = (text: string | null | undefined) => (text ?? '').split(/\r?\n/).map((l) => l.trim()).filter(Boolean);

async function letterheadOf(workshopId: string): Promise<Letterhead> {
  const w = (await Workshop.findByPk(workshopId))!;
  const contact = workshopContact(w);
  return { name: w.name, addressLines: lines(w.addressLines), postcode: w.postcode ?? '', vatNumber: w.vatNumber || null, phone: contact.workshopPhone ?? null, email: contact.workshopEmail ?? null };
}

export async function invoicePdf(scope: Scope, id: string): Promise<PdfFile> {
  const inv = await Invoice.findOne({ where: inWorkshop(scope, { id }), attributes: ['id', 'jobId', 'number', 'document'] });
  if (!inv) throw notFound('That invoice');
  await jobFor(scope, inv.jobId, 'That invoice');
  const doc = inv.document;
  const bytes = await cached(`invoice:${inv.id}:${inv.number}`, () => renderInvoicePdf(doc));
  return { bytes, filename: pdfName('invoice', doc.number, doc.job.registration) };
}

export async function creditNotePdf(scope: Scope, id: string): Promise<PdfFile> {
  const cn = await CreditNote.findOne({ where: inWorkshop(scope, { id }), attributes: ['id', 'jobId', 'number', 'document'] });
  if (!cn) throw notFound('That credit note');
  await jobFor(scope, cn.jobId, 'That credit note');
  const doc = cn.document;
  const bytes = await cached(`credit_note:${cn.id}:${cn.number}`, () => renderCreditNotePdf(doc));
  return { bytes, filename: pdfName('credit-note', doc.number, doc.job.registration) };
}

const UNITS: Record<LineKind, string> = { labour: 'h', part: 'each', subcontract: '', fee: '' };
const STAGES: EstimateStage[] = ['inspection', 'discovered', 'approved', 'declined'];

/** The estimate as it stands, from the pricing engine's figures (the same the estimate page shows). */
export async function estimateDocument(scope: Scope, jobId: string, now = new Date()): Promise<EstimateDocument> {
  const job = await viewJob(scope, jobId);
  const owner = scope.role === 'owner';
  const [est, findings, checklist, customer, supplier] = await Promise.all([
    getEstimate(scope, job.id),
    Finding.findAll({ where: { jobId: job.id }, attributes: ['id', 'seq', 'title', 'state'], order: [['seq', 'ASC']] }),
    JobChecklistItem.findAll({ where: { jobId: job.id, caution: { [Op.ne]: '' } }, attributes: ['text', 'section', 'caution', 'sortOrder'], order: [['sortOrder', 'ASC']] }),
    Customer.findOne({ where: { id: job.aircraft.customerId, workshopId: scope.workshopId } }),
    letterheadOf(scope.workshopId),
  ]);
  const findingOf = new Map(findings.map((f) => [f.id, f]));
  const seqOf = (id: string | null) => (id ? (findingOf.get(id)?.seq ?? 0) : 0);
  const priced = new Map(est.priced.lines.map((l) => [l.id, l]));
  // The owner sees what their pages show: no work on a finding still being written up.
  const shown = est.lines.filter((l) => !(owner && l.findingId && findingOf.get(l.findingId)?.state === 'draft'));
  const stages = STAGES.map((stage) => {
    const ls = shown
      .map((l, i) => ({ l, i }))
      .filter(({ l }) => l.stage === stage)
      // Work on one finding stays together, findings in their order; lines keep the estimate's order within each.
      .sort((a, b) => seqOf(a.l.findingId) - seqOf(b.l.findingId) || a.i - b.i)
      .map(({ l }) => {
        const p = priced.get(l.id);
        const f = l.findingId ? findingOf.get(l.findingId) : undefined;
        return {
          description: l.description,
          finding: f ? `F-${f.seq} ${f.title}` : null,
          quantity: l.quantity,
          unit: UNITS[l.kind],
          vatPercent: p?.vatPercent ?? '0',
          discount: p?.discount ?? '0.00',
          net: p?.net ?? '0.00',
          agreed: stage === 'inspection' ? l.agreedAt !== null : null,
        };
      });
    const t = est.priced.stages[stage];
    return { stage, lines: ls, totals: { net: t.net, vat: t.vat, gross: t.gross } };
  }).filter((st) => st.stage === 'inspection' || st.lines.length > 0);
  const pricedTasks = new Map(est.priced.accessTasks.map((t) => [t.id, t]));
  const p = est.priced;
  const total = (label: string, t: { net: string; vat: string; gross: string }, strong = false) => ({ label, net: t.net, vat: t.vat, gross: t.gross, strong });
  return {
    kind: 'estimate',
    audience: owner ? 'owner' : 'staff',
    printedAt: now.toISOString(),
    supplier,
    customer: { name: customer?.name ?? job.aircraft.customer.name, addressLines: lines(customer?.addressLines), postcode: customer?.postcode ?? '', email: customer?.email ?? null },
    job: { number: job.number, title: job.title, registration: job.aircraft.registration, aircraft: job.aircraft.type, state: (owner ? OWNER_JOB_STATE_LABELS : JOB_STATE_LABELS)[job.state as JobState] },
    currency: est.currency,
    roundingLabel: vatRoundingWords(p.rounding),
    stages,
    accessTasks: est.accessTasks.map((t) => {
      const pt = pricedTasks.get(t.id);
      return { name: t.name, hours: t.hours, vatPercent: pt?.vatPercent ?? '0', net: pt?.net ?? '0.00', chargedIn: pt?.chargedIn ?? null };
    }),
    totals: [
      total(TOTAL_NAMES.quoted, p.quoted),
      total(TOTAL_NAMES.agreed, p.committed, true),
      total(owner ? TOTAL_NAMES.undecidedOwner : TOTAL_NAMES.undecided, p.undecided),
      total(TOTAL_NAMES.ifAllApproved, p.ifAllApproved),
    ],
    cautions: [
      ...(job.scopeCautions ?? []).map((c) => ({ where: `Inspection scope: ${c.line}`, caution: c.caution })),
      ...checklist.map((c) => ({ where: `Checklist: ${c.section ? `${c.section}, ` : ''}${c.text}`, caution: c.caution })),
    ],
  };
}

export async function estimatePdf(scope: Scope, jobId: string): Promise<PdfFile> {
  const doc = await estimateDocument(scope, jobId);
  return { bytes: await renderEstimatePdf(doc), filename: pdfName('estimate', doc.job.number, doc.job.registration) };
}

const capitalised = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

/** What was asked (from the frozen snapshot), each decision, who, when, from where, and the snapshot's hash. */
export async function decisionRecordDocument(scope: Scope, requestId: string): Promise<DecisionRecordDocument> {
  const r = await ApprovalRequest.findOne({ where: inWorkshop(scope, { id: requestId }) });
  if (!r) throw notFound('That approval request');
  await jobFor(scope, r.jobId, 'That approval request');
  const snap: ApprovalSnapshot = r.snapshot;
  const decisions = r.state === 'decided' ? await decisionsOf(r.id) : [];
  const given = new Map(decisions.map((d) => [d.itemId, d]));
  const ids = itemIdsOf(snap);
  const rate = (code: string) => (snap.basis.vatRates as Record<string, string>)[code] ?? '0';
  const line = (l: ApprovalSnapshot['findings'][number]['lines'][number]) => ({ description: l.description, quantity: l.quantity, vatPercent: rate(l.vatRate), net: l.net });
  const items = ids.map((id) => {
    const d = given.get(id);
    const decision = d?.decision ?? null;
    const note = d?.note ?? '';
    if (id === QUOTE_ITEM_ID) {
      return { name: capitalised(itemName(snap, id)), category: null, found: null, lines: (snap.quote?.lines ?? []).map(line), gross: snap.quote?.gross ?? '0.00', decision, note };
    }
    const f = snap.findings.find((x) => x.findingId === id)!;
    const measured = f.measuredValue ? ` Measured: ${f.measuredValue}.` : '';
    return {
      name: `${f.number} ${f.title}`,
      category: f.category,
      found: `${f.location ? `${f.location}: ` : ''}${f.seen}${measured}`.trim() || null,
      lines: f.lines.map(line),
      gross: f.gross,
      decision,
      note,
    };
  });
  // Every item decided: the figures of the owner's choice, worked from the snapshot's own basis.
  const choice = decisions.length === ids.length && ids.length > 0 ? Object.fromEntries(ids.map((id) => [id, given.get(id)!.decision])) : null;
  const figures = choice ? priceChoice(snap.basis, choice) : null;
  const nameOf = (id: string) => (id === QUOTE_ITEM_ID ? capitalised(itemName(snap, id)) : (snap.findings.find((f) => f.findingId === id)?.number ?? id));
  const owner = scope.role === 'owner';
  return {
    kind: 'decision_record',
    requestId: r.id,
    state: r.state,
    stateWords: (owner ? OWNER_APPROVAL_REQUEST_STATE_LABELS : APPROVAL_REQUEST_STATE_LABELS)[r.state as ApprovalRequestState],
    supplier: { ...(await letterheadOf(r.workshopId)), name: snap.workshopName },
    ownerName: snap.ownerName,
    job: { number: snap.jobNumber, title: snap.jobTitle, registration: snap.registration, aircraft: snap.aircraftType },
    currency: snap.currency,
    roundingLabel: vatRoundingWords(snap.rounding),
    sentAt: snap.sentAt,
    expiresAt: r.expiresAt.toISOString(),
    message: snap.message,
    items,
    openingUp: snap.totals.openingUp.map((o) => {
      const decided = figures?.openingUp.find((x) => x.id === o.id);
      return { name: o.name, gross: o.gross, neededBy: o.neededBy.map(nameOf), charged: decided ? decided.charged : null };
    }),
    figures: figures
      ? [
          { label: 'Agreed before this request', gross: figures.agreedSoFar.gross },
          { label: 'Approved in these decisions', gross: figures.approvingNow.gross },
          { label: 'Agreed total after these decisions', gross: figures.newTotal.gross, strong: true },
        ]
      : [
          { label: 'Agreed before this request', gross: snap.totals.agreedSoFar.gross },
          { label: TOTAL_NAMES.ifAllApproved, gross: snap.totals.ifAllApproved.gross, strong: true },
        ],
    decided: r.decidedAt ? { byName: r.decidedByName ?? '', at: r.decidedAt.toISOString(), ip: r.decidedIp, device: r.decidedUserAgent } : null,
    snapshotHash: r.snapshotHash,
  };
}

export async function decisionRecordPdf(scope: Scope, requestId: string): Promise<PdfFile> {
  const doc = await decisionRecordDocument(scope, requestId);
  // A request still open may yet be decided; once closed it never changes. The audience changes the words.
  const key = doc.state === 'sent' ? null : `decision_record:${doc.requestId}:${doc.state}:${scope.role === 'owner' ? 'owner' : 'staff'}`;
  const bytes = await cached(key, () => renderDecisionRecordPdf(doc));
  const on = (doc.decided?.at ?? doc.sentAt).slice(0, 10);
  return { bytes, filename: pdfName('decision-record', doc.job.number, doc.job.registration, on) };
}

/** The job's downloadable documents, for its documents section (owner: their own job; staff: the workshop's). */
export async function jobDocuments(scope: Scope, jobId: string): Promise<JobDocumentsDto> {
  const job = await viewJob(scope, jobId);
  const [requests, invoice, creditNotes] = await Promise.all([
    ApprovalRequest.findAll({
      where: { jobId: job.id, workshopId: scope.workshopId, state: 'decided' },
      attributes: ['id', 'decidedAt', 'decidedByName'],
      order: [['decidedAt', 'ASC']],
    }),
    Invoice.findOne({ where: { jobId: job.id, workshopId: scope.workshopId }, attributes: ['id', 'number', 'issuedAt'] }),
    CreditNote.findAll({ where: { jobId: job.id, workshopId: scope.workshopId }, attributes: ['id', 'number', 'issuedAt'], order: [['seq', 'ASC']] }),
  ]);
  return {
    jobId: job.id,
    estimate: { path: DOCUMENT_PATHS.estimate(job.id) },
    decisionRecords: requests.map((r) => ({ requestId: r.id, decidedAt: r.decidedAt!.toISOString(), decidedByName: r.decidedByName ?? '', path: DOCUMENT_PATHS.decisionRecord(r.id) })),
    invoice: invoice ? { id: invoice.id, number: invoice.number, issuedAt: invoice.issuedAt.toISOString(), path: DOCUMENT_PATHS.invoice(invoice.id) } : null,
    creditNotes: creditNotes.map((c) => ({ id: c.id, number: c.number, issuedAt: c.issuedAt.toISOString(), path: DOCUMENT_PATHS.creditNote(c.id) })),
  };
}
