import { formatMoney, type ApprovalSnapshot, type Decision } from '@wingstage/shared';
import type { MailMessage } from './mail-queue.js';

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
const when = (d: Date) => d.toLocaleString('en-GB', { day: 'numeric', month: 'long', year: 'numeric', hour: '2-digit', minute: '2-digit', timeZone: 'Europe/London' });

function build(to: string, subject: string, paragraphs: string[], link: { href: string; label: string } | null): MailMessage {
  const body = paragraphs.map((p) => `<p style="margin:0 0 14px">${esc(p)}</p>`).join('');
  const linkHtml = link
    ? `<p style="margin:0 0 14px"><a href="${esc(link.href)}" style="color:#1b4d8f">${esc(link.label)}</a></p><p style="margin:0;color:#4a5565;font-size:14px">If the link does not open, copy this address into your browser:<br>${esc(link.href)}</p>`
    : '';
  return {
    to,
    subject,
    text: `${paragraphs.join('\n\n')}${link ? `\n\n${link.label}: ${link.href}` : ''}\n`,
    html: `<!doctype html><html><body style="font-family:sans-serif;font-size:16px;line-height:1.5;color:#1d2430">${body}${linkHtml}</body></html>`,
  };
}

const aircraftLine = (s: ApprovalSnapshot) => `${s.registration} (${s.jobTitle}, job ${s.jobNumber})`;
const count = (n: number) => `${n} ${n === 1 ? 'finding' : 'findings'}`;

export function approvalRequestMail(p: { to: string; ownerName: string; snapshot: ApprovalSnapshot; link: string; replacement: boolean; expiresAt?: Date }): MailMessage {
  const s = p.snapshot;
  const expires = p.expiresAt ?? new Date(s.expiresAt);
  const lines = [
    `Hello ${p.ownerName},`,
    p.replacement
      ? `${s.workshopName} changed a price on work they asked you about for ${aircraftLine(s)}. This new request replaces the earlier one; the earlier link no longer works.`
      : `${s.workshopName} found work on ${aircraftLine(s)} that was not in the original quote and would like your decision.`,
    `${count(s.findings.length)}, ${formatMoney(s.totals.thisRequest.gross, s.currency)} incl. VAT if you approve all of it. You can approve or decline each one on its own.`,
    ...(s.message ? [`Message from the workshop: ${s.message}`] : []),
    `The link works until ${when(expires)}. It is for you alone: please do not forward this e-mail.`,
  ];
  return build(p.to, `${s.registration}: ${count(s.findings.length)} for your decision`, lines, { href: p.link, label: 'See the findings and decide' });
}

export function approvalReminderMail(p: { to: string; ownerName: string; snapshot: ApprovalSnapshot; link: string; expiresAt: Date }): MailMessage {
  const s = p.snapshot;
  const lines = [
    `Hello ${p.ownerName},`,
    `A reminder from ${s.workshopName}: ${count(s.findings.length)} on ${aircraftLine(s)} (${formatMoney(s.totals.thisRequest.gross, s.currency)} incl. VAT in all) still wait for your decision. The work on them cannot start until you decide.`,
    `The link works until ${when(p.expiresAt)}.`,
  ];
  return build(p.to, `Reminder: ${s.registration} findings wait for your decision`, lines, { href: p.link, label: 'See the findings and decide' });
}

export function approvalReceiptMail(p: {
  to: string;
  typedName: string;
  snapshot: ApprovalSnapshot;
  decidedAt: Date;
  decisions: { finding: ApprovalSnapshot['findings'][number]; decision: Decision; note: string }[];
  declinedAirworthiness: string[];
  link: string;
}): MailMessage {
  const s = p.snapshot;
  const lines = [
    `Hello ${p.typedName},`,
    `This is your record of the decisions you confirmed for ${aircraftLine(s)} at ${s.workshopName} on ${when(p.decidedAt)}.`,
    ...p.decisions.map(
      (d) => `${d.finding.number} ${d.finding.title}: ${d.decision === 'approve' ? 'approved' : 'declined'}, ${formatMoney(d.finding.price.gross, s.currency)} incl. VAT${d.note ? ` (your note: ${d.note})` : ''}`,
    ),
    ...(p.declinedAirworthiness.length
      ? [
          `You declined ${p.declinedAirworthiness.join(', ')}, which affects airworthiness. The aircraft cannot be released while it stays open; the inspector decides when it is fit to fly. The workshop will talk to you about what happens next.`,
        ]
      : []),
    'To change a decision, contact the workshop.',
  ];
  return build(p.to, `${s.registration}: your decisions are recorded`, lines, { href: p.link, label: 'See your decisions' });
}

export function withinLimitReportMail(p: {
  to: string;
  ownerName: string;
  workshopName: string;
  registration: string;
  jobTitle: string;
  findings: { number: string; title: string; category: string; gross: string }[];
  currency: string;
  headroom: string | null;
  link: string;
}): MailMessage {
  const lines = [
    `Hello ${p.ownerName},`,
    `${p.workshopName} approved the following work on ${p.registration} (${p.jobTitle}) on your behalf, because it falls inside the limit you agreed with them in advance:`,
    ...p.findings.map((f) => `${f.number} ${f.title} (${f.category}): ${formatMoney(f.gross, p.currency)} incl. VAT`),
    ...(p.headroom !== null ? [`What is left of your limit for this job: ${formatMoney(p.headroom, p.currency)} incl. VAT.`] : []),
    'If anything here surprises you, contact the workshop before the work starts.',
  ];
  return build(p.to, `${p.registration}: work approved within your limit`, lines, { href: p.link, label: 'See the job' });
}
