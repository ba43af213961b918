import { useState } from 'react';
import { InvoiceCreditNotesAndDocument } from '@/components/invoice-document';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-client';
import { formatDate } from '@/lib/format';
import type { InvoiceDto } from '@wingstage/shared';
import { ownerInvoiceWords } from '@/lib/paid-and-refunded';
import { openBalanceCheckout } from '../api/get-my-invoice';

/** The owner's invoice for one job: what is left to pay, "Pay balance", the documents to keep, and any credit notes. */
export function MyInvoice({ jobId, invoice: inv }: { jobId: string; invoice: InvoiceDto }) {
  const [opening, setOpening] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const owed = inv.due !== '0.00';
  const words = ownerInvoiceWords(inv, formatDate);
  return (
    <section aria-label="Your invoice" data-testid="my-invoice" className="mt-3 flex flex-col gap-3 border-t border-seam pt-3">
      <h4 className="font-semibold">Your invoice {inv.number}</h4>
      <p data-testid="my-invoice-standing">
        <strong>{words.standing}</strong>
        {words.paidLine ? ` ${words.paidLine}` : ''}
      </p>
      {problem ? <Notice tone="problem" title="The payment page did not open">{problem}</Notice> : null}
      <div className="flex flex-wrap items-center gap-3">
        {owed ? (
          <Button
            size="lg"
            busy={opening}
            onClick={async () => {
              setProblem(null);
              setOpening(true);
              try {
                const { url } = await openBalanceCheckout(jobId);
                window.location.assign(url);
              } catch (e) {
                setProblem(isApiError(e) ? e.message : 'Please try again in a moment.');
                setOpening(false);
              }
            }}
          >
            Pay balance
          </Button>
        ) : null}
        <a href={`/api/invoices/${inv.id}/pdf`} download>
          Download the VAT invoice (PDF)
        </a>
      </div>
      <InvoiceCreditNotesAndDocument invoice={inv} audience="owner" headingLevel="h5" />
    </section>
  );
}
