import { formatCalendarDate, formatMoney, sumAmounts, type CreditNoteDocument, type InvoiceDocument, type ReceiptDocument } from '@wingstage/shared';
import { framedMail } from './frame.js';
import type { MailMessage } from './mail-queue.js';

const build = (to: string, subject: string, paragraphs: string[], pdf: { filename: string; bytes: Buffer }): MailMessage =>
  framedMail(to, subject, paragraphs, { attachments: [{ filename: pdf.filename, contentType: 'application/pdf', contentBase64: pdf.bytes.toString('base64') }] });

const contact = (d: { supplier: { phone: string | null; email: string | null } }) =>
  [d.supplier.phone, d.supplier.email].filter(Boolean).length ? ` You can reach the workshop on ${[d.supplier.phone, d.supplier.email].filter(Boolean).join(' or ')}.` : '';

/** The deposits shown on the invoice, added up by the engine's money helper. */
const depositsTotal = (doc: InvoiceDocument) => sumAmounts(doc.deposits.map((d) => d.amount), doc.currency);

export function invoiceMail(doc: InvoiceDocument, pdf: Buffer): MailMessage | null {
  if (!doc.customer.email) return null;
  const paid = doc.deposits.length ? ` The deposits you already paid (${formatMoney(depositsTotal(doc), doc.currency)}) are taken off.` : '';
  return build(
    doc.customer.email,
    `${doc.job.registration}: your invoice ${doc.number} from ${doc.supplier.name}`,
    [
      `Hello ${doc.customer.name},`,
      `Your invoice ${doc.number} for ${doc.job.title} on ${doc.job.registration} is attached: ${formatMoney(doc.totals.gross, doc.currency)} including VAT.${paid}`,
      `Left to pay: ${formatMoney(doc.balanceDue, doc.currency)}, by ${formatCalendarDate(doc.dueOn)}. You can pay by card from your job page, or by bank transfer quoting ${doc.number}.${contact(doc)}`,
    ],
    { filename: `${doc.number}.pdf`, bytes: pdf },
  );
}

export function creditNoteMail(doc: CreditNoteDocument, pdf: Buffer): MailMessage | null {
  if (!doc.customer.email) return null;
  return build(
    doc.customer.email,
    `${doc.job.registration}: credit note ${doc.number} from ${doc.supplier.name}`,
    [
      `Hello ${doc.customer.name},`,
      `Credit note ${doc.number} is attached. It reduces invoice ${doc.invoice.number} by ${formatMoney(doc.totals.gross, doc.currency)} including VAT. Reason: ${doc.reason}.`,
      ...(doc.refund ? [`${formatMoney(doc.refund.amount, doc.currency)} is being refunded to the card you paid with. Banks usually take a few working days to show it.`] : []),
      `${contact(doc).trim()}`,
    ].filter(Boolean),
    { filename: `${doc.number}.pdf`, bytes: pdf },
  );
}

export function receiptMail(doc: ReceiptDocument, pdf: Buffer): MailMessage | null {
  if (!doc.customer.email) return null;
  return build(
    doc.customer.email,
    `${doc.job.registration}: receipt for your payment of ${formatMoney(doc.amount, doc.currency)}`,
    [
      `Hello ${doc.customer.name},`,
      `Thank you: ${doc.supplier.name} received ${formatMoney(doc.amount, doc.currency)} (${doc.method.toLowerCase()}) on ${formatCalendarDate(doc.receivedOn)} for ${doc.job.registration}${doc.invoiceNumber ? ` towards invoice ${doc.invoiceNumber}` : ''}. Your receipt is attached.`,
      ...(doc.invoiceNumber ? [] : [`What it is for: ${doc.description}.`]),
      ...doc.notes.filter((n) => !n.startsWith('Your reference')),
      `${contact(doc).trim()}`,
    ].filter(Boolean),
    { filename: `receipt-${doc.paymentId.slice(0, 8)}.pdf`, bytes: pdf },
  );
}
