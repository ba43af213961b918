import type { InvoiceDocument, InvoiceDto } from '@wingstage/shared';
import { formatDate, formatMoney } from '@/lib/format';

const RATE_WORDS: Record<string, string> = { standard: 'Standard', reduced: 'Reduced', zero: 'Zero-rated', exempt: 'Exempt', outside: 'Outside the scope' };
const rateWords = (code: string, pct: string) => (code === 'exempt' || code === 'outside' ? RATE_WORDS[code] : `${pct}%`);
const METHOD_WORDS: Record<string, string> = { card: 'card', bank_transfer: 'bank transfer', cash: 'cash', cheque: 'cheque' };

/**
 * A VAT invoice on screen, from its frozen document: the same particulars the PDF prints. Used for
 * the manager's preview before issuing, the issued invoice on the job page, and the owner's page.
 * `audience` only changes the words around the figures.
 */
export function InvoiceDocumentView({ doc, audience }: { doc: InvoiceDocument; audience: 'staff' | 'owner' }) {
  const c = doc.currency;
  return (
    <div className="flex flex-col gap-4" data-testid="invoice-document">
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
        <dt className="font-semibold">Invoice number</dt>
        <dd className="tabular-nums">{doc.number}</dd>
        <dt className="font-semibold">Date</dt>
        <dd>{formatDate(doc.issuedOn)}</dd>
        <dt className="font-semibold">Tax point</dt>
        <dd>{formatDate(doc.taxPoint)}</dd>
        <dt className="font-semibold">{audience === 'owner' ? 'Please pay by' : 'Due'}</dt>
        <dd>{formatDate(doc.dueOn)}</dd>
        <dt className="font-semibold">To</dt>
        <dd>{[doc.customer.name, ...doc.customer.addressLines, doc.customer.postcode].filter(Boolean).join(', ')}</dd>
        <dt className="font-semibold">From</dt>
        <dd>
          {[doc.supplier.name, ...doc.supplier.addressLines, doc.supplier.postcode].filter(Boolean).join(', ')}
          {doc.supplier.vatNumber ? ` · VAT no. ${doc.supplier.vatNumber}` : ''}
        </dd>
      </dl>
      <div>
        <table className="w-full text-sm">
          <caption className="sr-only">Invoice lines</caption>
          <thead>
            <tr className="border-b border-seam-strong text-left">
              <th scope="col" className="py-1 pr-2">What was done</th>
              <th scope="col" className="py-1 pr-2 text-right">Qty</th>
              <th scope="col" className="hidden py-1 pr-2 text-right sm:table-cell">Unit price excl. VAT</th>
              <th scope="col" className="hidden py-1 pr-2 text-right sm:table-cell">VAT rate</th>
              <th scope="col" className="py-1 text-right">Amount excl. VAT</th>
            </tr>
          </thead>
          <tbody>
            {doc.lines.map((l, i) => (
              <tr key={i} className="border-b border-seam align-top">
                <td className="py-1 pr-2">
                  {l.description}
                  {l.finding ? <span className="block text-slate-soft">{l.finding}</span> : null}
                  {/* On a phone the unit price and rate sit under the description instead of in columns. */}
                  <span className="block text-slate-soft sm:hidden">
                    {formatMoney(l.unitNet, c, { exact: true })} {l.unit === 'h' ? 'an hour' : 'each'} excl. VAT · VAT {rateWords(l.vatRate, l.vatPercent)}
                  </span>
                </td>
                <td className="py-1 pr-2 text-right tabular-nums">
                  {l.quantity}
                  {l.unit ? ` ${l.unit}` : ''}
                </td>
                <td className="hidden py-1 pr-2 text-right tabular-nums sm:table-cell">{formatMoney(l.unitNet, c, { exact: true })}</td>
                <td className="hidden py-1 pr-2 text-right tabular-nums sm:table-cell">{rateWords(l.vatRate, l.vatPercent)}</td>
                <td className="py-1 text-right tabular-nums">{formatMoney(l.net, c)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <dl className="ml-auto grid w-full max-w-sm grid-cols-[1fr_auto] gap-x-4 gap-y-1 text-sm">
        {doc.byRate.map((r) => (
          <div key={`${r.vatRate}-${r.vatPercent}`} className="contents">
            <dt>VAT at {rateWords(r.vatRate, r.vatPercent)} on {formatMoney(r.net, c)}</dt>
            <dd className="text-right tabular-nums">{formatMoney(r.vat, c)}</dd>
          </div>
        ))}
        <dt>Total excl. VAT</dt>
        <dd className="text-right tabular-nums">{formatMoney(doc.totals.net, c)}</dd>
        <dt>Total VAT</dt>
        <dd className="text-right tabular-nums">{formatMoney(doc.totals.vat, c)}</dd>
        <dt className="font-semibold">Total incl. VAT</dt>
        <dd className="text-right font-semibold tabular-nums">{formatMoney(doc.totals.gross, c)}</dd>
        {doc.deposits.map((d) => (
          <div key={d.paymentId} className="contents">
            <dt>
              {audience === 'owner' ? 'Deposit you paid' : 'Deposit received'} {formatDate(d.receivedOn)} ({METHOD_WORDS[d.method] ?? d.method}, VAT {formatMoney(d.vat, c)})
            </dt>
            <dd className="text-right tabular-nums">−{formatMoney(d.amount, c)}</dd>
          </div>
        ))}
        <dt className="font-semibold">{audience === 'owner' ? 'Left to pay when issued' : 'Balance due at issue'}</dt>
        <dd className="text-right font-semibold tabular-nums">{formatMoney(doc.balanceDue, c)}</dd>
      </dl>
      <ul className="flex flex-col gap-1 text-sm text-slate-soft">
        {doc.notes.map((n) => (
          <li key={n}>{n}</li>
        ))}
        <li>{doc.roundingLabel}.</li>
      </ul>
    </div>
  );
}

type InvoiceCreditNote = InvoiceDto['creditNotes'][number];

/** One credit note in a line, with its PDF: the owner reads what it took off and why; staff the figures. */
function CreditNoteLine({ cn, currency: c, audience }: { cn: InvoiceCreditNote; currency: string; audience: 'staff' | 'owner' }) {
  if (audience === 'owner') {
    return (
      <li data-owner-credit-note={cn.number}>
        <span className="tabular-nums">{cn.number}</span> of {formatDate(cn.issuedOn)}: {formatMoney(cn.gross, c)} off the invoice
        {cn.refunded ? `, ${formatMoney(cn.refunded, c)} refunded to your card` : ''}. {cn.reason}.{' '}
        <a href={`/api/credit-notes/${cn.id}/pdf`} download>
          Download (PDF)
        </a>
      </li>
    );
  }
  return (
    <li>
      <span className="tabular-nums">{cn.number}</span> · {formatDate(cn.issuedOn)} · {formatMoney(cn.gross, c)} incl. VAT {formatMoney(cn.vat, c)} ·{' '}
      {cn.refunded ? `refunded ${formatMoney(cn.refunded, c)} to the card` : 'no refund'} · {cn.reason} · <a href={`/api/credit-notes/${cn.id}/pdf`}>PDF</a>
    </li>
  );
}

/**
 * The credit notes against an issued invoice (nothing when there are none), and below them the
 * invoice itself as issued, folded away: the foot of the invoice on the job page and the owner's.
 */
export function InvoiceCreditNotesAndDocument({ invoice, audience, headingLevel }: { invoice: InvoiceDto; audience: 'staff' | 'owner'; headingLevel: 'h3' | 'h5' }) {
  const Heading = headingLevel;
  return (
    <>
      {invoice.creditNotes.length ? (
        <section aria-label="Credit notes" className="flex flex-col gap-1">
          <Heading className="font-semibold">Credit notes</Heading>
          <ul className={`flex flex-col gap-1${audience === 'staff' ? ' text-sm' : ''}`}>
            {invoice.creditNotes.map((cn) => (
              <CreditNoteLine key={cn.id} cn={cn} currency={invoice.currency} audience={audience} />
            ))}
          </ul>
        </section>
      ) : null}
      <details>
        <summary className={`cursor-pointer${audience === 'staff' ? ' font-semibold' : ''}`}>{audience === 'staff' ? 'The invoice as issued' : 'See the invoice here'}</summary>
        <div className="mt-3">
          <InvoiceDocumentView doc={invoice.document} audience={audience} />
        </div>
      </details>
    </>
  );
}
