import { formatMoney } from '@wingstage/shared';
import type { MailMessage } from './mail-queue.js';

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

function build(to: string, subject: string, paragraphs: string[], link: { href: string; label: string } | null): MailMessage {
  const body = paragraphs.map((p) => `<p style="margin:0 0 14px">${esc(p)}</p>`).join('');
  const linkHtml = link
    ? `<p style="margin:0 0 14px"><a href="${esc(link.href)}" style="color:#1b4d8f">${esc(link.label)}</a></p><p style="margin:0;color:#4a5565;font-size:14px">If the link does not open, copy this address into your browser:</p><p style="margin:0;color:#4a5565;font-size:14px"><span style="word-break:break-all;overflow-wrap:anywhere">${esc(link.href)}</span></p>`
    : '';
  return {
    to,
    subject,
    text: `${paragraphs.join('\n\n')}${link ? `\n\n${link.label}: ${link.href}` : ''}\n`,
    html: `<!doctype html><html><body style="font-family:sans-serif;font-size:16px;line-height:1.5;color:#1d2430">${body}${linkHtml}</body></html>`,
  };
}

export interface DepositMailFacts {
  to: string;
  ownerName: string;
  workshopName: string;
  registration: string;
  jobNumber: string;
  reason: string;
  amount: string;
  currency: string;
  link: string;
}

/** The owner is asked for a deposit (by the workshop's policy or by hand). */
export function depositRequestedMail(p: DepositMailFacts): MailMessage {
  return build(
    p.to,
    `${p.registration}: a deposit of ${formatMoney(p.amount, p.currency)} before the work goes ahead`,
    [
      `Hello ${p.ownerName},`,
      `${p.workshopName} asks for a deposit of ${formatMoney(p.amount, p.currency, { vat: 'incl' })} for ${p.registration} (job ${p.jobNumber}).`,
      `What it is for: ${p.reason}`,
      'You can pay it by card from your phone. The deposit is taken off the final invoice.',
    ],
    { href: p.link, label: 'Pay deposit' },
  );
}
