import { Dec, formatMoney, type InvoiceDto } from '@wingstage/shared';

/** "A", "A and B", "A, B and C". */
function listed(items: string[]): string {
  return items.length < 2 ? (items[0] ?? '') : `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

/** The credit notes that carried a refund, by number, in the order issued. */
export function refundCreditNotes(inv: Pick<InvoiceDto, 'creditNotes'>): string[] {
  return inv.creditNotes.filter((cn) => cn.refunded !== null && !new Dec(cn.refunded).isZero()).map((cn) => cn.number);
}

/**
 * The owner's words for where their invoice stands after payments and refunds: first whether anything is
 * left to pay, then what they paid and what of it came back, with the credit note that says so. A refund
 * never reads as money still owed: £87.36 paid and £5.00 refunded is "nothing is left to pay", not
 * "£82.36 paid so far". Decimal strings throughout (no float).
 */
export function ownerInvoiceWords(inv: Pick<InvoiceDto, 'currency' | 'due' | 'dueOn' | 'state' | 'paid' | 'refunded' | 'creditNotes'>, formatDay: (iso: string) => string): { standing: string; paidLine: string | null } {
  const c = inv.currency;
  const owed = !new Dec(inv.due).isZero();
  const paid = new Dec(inv.paid);
  const refunded = new Dec(inv.refunded);
  const standing = owed
    ? `Left to pay: ${formatMoney(inv.due, c)}, by ${formatDay(inv.dueOn)}.`
    : inv.state === 'credited'
      ? 'This invoice has been cancelled in full by a credit note. You owe nothing on it.'
      : refunded.isZero()
        ? 'Paid in full. Thank you.'
        : 'Nothing is left to pay.';
  if (paid.isZero()) return { standing, paidLine: null };
  if (refunded.isZero()) return { standing, paidLine: `You paid ${formatMoney(inv.paid, c)}.` };
  const notes = refundCreditNotes(inv);
  const how = notes.length ? ` with credit note${notes.length > 1 ? 's' : ''} ${listed(notes)}` : '';
  const kept = formatMoney(paid.minus(refunded).toFixed(), c);
  return { standing, paidLine: `You paid ${formatMoney(inv.paid, c)}. We refunded ${formatMoney(inv.refunded, c)} of it to you${how}, so you have paid ${kept} in all.` };
}
