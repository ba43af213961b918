import { formatMoney } from '@wingstage/shared';
import { framedMail } from './frame.js';
import type { MailMessage } from './mail-queue.js';

const build = (to: string, subject: string, paragraphs: string[], link: { href: string; label: string } | null): MailMessage => framedMail(to, subject, paragraphs, { link });

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
