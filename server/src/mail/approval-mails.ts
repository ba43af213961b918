import { formatMoment, formatMoney, FINDING_CATEGORY_LABELS, QUOTE_ITEM_ID, priceChoice, TOTAL_NAMES, workshopContactWords, type ApprovalSnapshot, type Decision, type PricedChoice } from '@wingstage/shared';
import { framedMail } from './frame.js';
import type { MailMessage } from './mail-queue.js';

const when = (d: Date) => formatMoment(d, 'long');

const build = (to: string, subject: string, paragraphs: string[], link: { href: string; label: string } | null): MailMessage => framedMail(to, subject, paragraphs, { link });

const aircraftLine = (s: ApprovalSnapshot) => `${s.registration} (${s.jobTitle}, job ${s.jobNumber})`;
const contactOf = (s: ApprovalSnapshot) => workshopContactWords(s);

const count = (n: number) => `${n} ${n === 1 ? 'finding' : 'findings'}`;

/** "the quote and 2 findings", "3 findings", "the changed quote". */
function whatIsAsked(s: ApprovalSnapshot): string {
  const quote = s.quote ? (s.quote.changeOf === 'change' ? 'the changed quote' : 'the quote') : null;
  const f = s.findings.length ? count(s.findings.length) : null;
  return [quote, f].filter(Boolean).join(' and ');
}

/** One line per item and one per shared opening-up task, from priceChoice with everything approved: they add up to the total. */
function itemLines(s: ApprovalSnapshot): string[] {
  const all = priceChoice(s.basis, Object.fromEntries(s.basis.items.map((i) => [i.id, 'approve' as const])));
  const gross = new Map(all.items.map((i) => [i.id, i.allApprovedGross]));
  return [
    ...(s.quote ? [`${s.quote.changeOf === 'change' ? 'The changed quote' : 'The quote'} (the scheduled work, ${s.quote.lines.length} ${s.quote.lines.length === 1 ? 'line' : 'lines'}): ${formatMoney(gross.get(QUOTE_ITEM_ID)!, s.currency)} incl. VAT`] : []),
    ...s.findings.map((f) => `${f.number} ${f.title} (${FINDING_CATEGORY_LABELS[f.category]}): ${formatMoney(gross.get(f.findingId)!, s.currency)} incl. VAT`),
    ...all.openingUp.map((o) => `Opening-up work shared by these, charged once: ${o.name}, ${formatMoney(o.allApprovedGross, s.currency)} incl. VAT`),
  ];
}

export function approvalRequestMail(p: { to: string; ownerName: string; snapshot: ApprovalSnapshot; link: string; replacement: boolean; expiresAt?: Date }): MailMessage {
  const s = p.snapshot;
  const expires = p.expiresAt ?? new Date(s.expiresAt);
  const asked = whatIsAsked(s);
  const lines = [
    `Hello ${p.ownerName},`,
    p.replacement
      ? `${s.workshopName} changed a price on work they asked you about for ${aircraftLine(s)}. This new request replaces the earlier one; the earlier link no longer works.`
      : s.findings.length
        ? `${s.workshopName} would like your decision on ${asked} for ${aircraftLine(s)}${s.quote ? '' : ': work that was not in the original quote'}.`
        : `${s.workshopName} would like you to agree ${asked} for ${aircraftLine(s)} before the work starts.`,
    ...itemLines(s),
    `${formatMoney(s.totals.approvingNow.gross, s.currency)} incl. VAT if you approve all of it. You can approve or decline each item on its own.`,
    ...(s.message ? [`Message from the workshop: ${s.message}`] : []),
    `The link works until ${when(expires)}. It is for you alone: please do not forward this e-mail.`,
  ];
  return build(p.to, `${s.registration}: ${asked} for your decision`, lines, { href: p.link, label: 'See the details and decide' });
}

export function approvalReminderMail(p: { to: string; ownerName: string; snapshot: ApprovalSnapshot; link: string; expiresAt: Date }): MailMessage {
  const s = p.snapshot;
  const one = (s.quote ? 1 : 0) + s.findings.length === 1;
  const lines = [
    `Hello ${p.ownerName},`,
    `A reminder from ${s.workshopName}: ${whatIsAsked(s)} on ${aircraftLine(s)} ${one ? 'is' : 'are'} still waiting for your decision: ${formatMoney(s.totals.approvingNow.gross, s.currency)} incl. VAT in all. The work cannot start until you decide.`,
    `The link works until ${when(p.expiresAt)}.`,
  ];
  return build(p.to, `Reminder: your decision is needed on ${s.registration}`, lines, { href: p.link, label: 'See the details and decide' });
}

export interface DecidedItem {
  itemId: string;
  name: string;
  decision: Decision;
  note: string;
  /** Its share of what the decision approves (priceChoice); 0.00 when declined. */
  gross: string;
}

function decisionLines(s: ApprovalSnapshot, decisions: DecidedItem[], figures: PricedChoice, whose: 'your' | 'their'): string[] {
  return [
    ...decisions.map((d) => `${d.name}: ${d.decision === 'approve' ? `approved, ${formatMoney(d.gross, s.currency)} incl. VAT` : 'declined'}${d.note ? ` (${whose} note: ${d.note})` : ''}`),
    ...figures.openingUp.filter((o) => o.charged).map((o) => `Opening-up work, charged once: ${o.name}, ${formatMoney(o.gross, s.currency)} incl. VAT`),
    `Approved now: ${formatMoney(figures.approvingNow.gross, s.currency)} incl. VAT. ${TOTAL_NAMES.agreed} on this job: ${formatMoney(figures.newTotal.gross, s.currency)} incl. VAT.`,
  ];
}

/** What both decision e-mails are written from: the owner's confirmed decisions on one request. */
interface DecisionMailFacts {
  to: string;
  typedName: string;
  snapshot: ApprovalSnapshot;
  decidedAt: Date;
  decisions: DecidedItem[];
  figures: PricedChoice;
  declinedAirworthiness: string[];
  link: string;
}

export function approvalReceiptMail(p: DecisionMailFacts): MailMessage {
  const s = p.snapshot;
  const lines = [
    `Hello ${p.typedName},`,
    `This is your record of the decisions you confirmed for ${aircraftLine(s)} at ${s.workshopName} on ${when(p.decidedAt)}.`,
    ...decisionLines(s, p.decisions, p.figures, 'your'),
    ...(p.declinedAirworthiness.length
      ? [
          `You declined ${p.declinedAirworthiness.join(', ')}, an airworthiness item. While it is open, the workshop will not mark the aircraft ready for release. Whether it may fly is the inspector's decision under the authority's rules. The workshop will talk to you about what happens next.`,
        ]
      : []),
    `To change a decision, contact ${contactOf(s)}.`,
  ];
  return build(p.to, `${s.registration}: your decisions are recorded`, lines, { href: p.link, label: 'See your decisions' });
}

/** To the job's managers: what the owner decided, with a strong first line when it needs a call. */
export function decisionToStaffMail(p: DecisionMailFacts & { staffName: string }): MailMessage {
  const s = p.snapshot;
  const notes = p.decisions.filter((d) => d.note);
  const strong = [
    ...(p.declinedAirworthiness.length
      ? [`ACTION NEEDED: the owner declined ${p.declinedAirworthiness.join(', ')}, an airworthiness item. While it is open the job cannot be marked ready for release; whether the aircraft may fly is the inspector's decision.`]
      : []),
    ...(notes.length ? [`The owner left ${notes.length === 1 ? 'a note' : 'notes'}: ${notes.map((d) => `${d.name}: “${d.note}”`).join('; ')}`] : []),
  ];
  const lines = [
    ...strong,
    `Hello ${p.staffName},`,
    `${p.typedName} decided the request on ${aircraftLine(s)} on ${when(p.decidedAt)}.`,
    ...decisionLines(s, p.decisions, p.figures, 'their'),
  ];
  const subject = `${strong.length ? 'Action needed: ' : ''}${s.registration}: the owner decided (${p.decisions.map((d) => `${d.name.split(' ')[0] === 'the' ? d.name : d.name.split(' ')[0]} ${d.decision === 'approve' ? 'approved' : 'declined'}`).join(', ')})`;
  return build(p.to, subject, lines, { href: p.link, label: 'Open the job' });
}

export function withinLimitReportMail(p: {
  to: string;
  ownerName: string;
  workshopName: string;
  workshopPhone?: string;
  workshopEmail?: string;
  registration: string;
  jobTitle: string;
  findings: { number: string; title: string; category: string; gross: string }[];
  currency: string;
  headroom: string | null;
  link: string;
}): MailMessage {
  const lines = [
    `Hello ${p.ownerName},`,
    `${p.workshopName} approved the following work on ${p.registration} (${p.jobTitle}) on your behalf, under the standing go-ahead you gave them:`,
    ...p.findings.map((f) => `${f.number} ${f.title} (${f.category}): ${formatMoney(f.gross, p.currency)} incl. VAT`),
    ...(p.headroom !== null ? [`Left of your standing go-ahead on this job: ${formatMoney(p.headroom, p.currency)} incl. VAT.`] : []),
    `If anything here surprises you, contact the workshop before the work starts: ${workshopContactWords(p)}.`,
  ];
  return build(p.to, `${p.registration}: work approved under your standing go-ahead`, lines, { href: p.link, label: 'See your aircraft' });
}
