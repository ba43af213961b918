import { zodResolver } from '@hookform/resolvers/zod';
import {
  INVOICE_STATE_LABELS,
  OFFLINE_PAYMENT_METHODS,
  PAYMENT_METHOD_LABELS,
  PAYMENT_STATE_LABELS,
  creditNoteSchema,
  offlinePaymentSchema,
  refundSchema,
  type InvoiceDto,
  type JobDto,
  type Role,
} from '@wingstage/shared';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { InvoiceCreditNotesAndDocument, InvoiceDocumentView } from '@/components/invoice-document';
import { Button } from '@/components/ui/button';
import { refundCreditNotes } from '@/lib/paid-and-refunded';
import { SelectField, TextField } from '@/components/ui/field';
import { FormErrorSummary, Loading, Notice } from '@/components/ui/notice';
import { Card } from '@/components/ui/page';
import { isApiError } from '@/lib/api-client';
import { formatDate, formatMoney, todayIso } from '@/lib/format';
import { withServerErrors } from '@/lib/form-errors';
import { invoicePreviewQueryOptions, jobInvoiceQueryOptions, useCreditNote, useIssueInvoice, useRecordPayment, useRefund, useResendDocument } from '../api/invoices';

const mayIssue = (r: Role) => r === 'admin' || r === 'manager';
const handlesMoney = (r: Role) => r === 'admin' || r === 'accounts';

/** The job's VAT invoice on the staff job page: issue it (with a preview), then payments, refunds and credit notes. */
export function InvoiceSection({ job, role }: { job: JobDto; role: Role }) {
  const invoice = useQuery(jobInvoiceQueryOptions(job.id));
  if (invoice.isPending) return <Card title="Invoice"><Loading label="Loading the invoice…" /></Card>;
  if (invoice.isError) return <Card title="Invoice"><Notice tone="problem">The invoice could not be loaded.</Notice></Card>;
  if (!invoice.data) {
    if (job.state !== 'ready_for_release' || !mayIssue(role)) return null;
    return (
      <Card title="Invoice">
        <IssueInvoice jobId={job.id} />
      </Card>
    );
  }
  return <IssuedInvoice jobId={job.id} invoice={invoice.data} role={role} />;
}

function IssueInvoice({ jobId }: { jobId: string }) {
  const [previewing, setPreviewing] = useState(false);
  const preview = useQuery({ ...invoicePreviewQueryOptions(jobId), enabled: previewing });
  const issue = useIssueInvoice(jobId);
  const [problem, setProblem] = useState<string | null>(null);
  if (!previewing) {
    return (
      <div className="flex flex-col gap-3">
        <p>The work is finished. The invoice shows the agreed quote and the approved work only, less any deposits received.</p>
        <div>
          <Button onClick={() => setPreviewing(true)}>Issue invoice</Button>
        </div>
      </div>
    );
  }
  if (preview.isPending) return <Loading label="Working out the invoice…" />;
  if (preview.isError) return <Notice tone="problem">The invoice could not be worked out. Try again.</Notice>;
  const p = preview.data;
  return (
    <div className="flex flex-col gap-4">
      <Notice title="Check before issuing">
        An issued invoice cannot be changed: corrections are made with a credit note. The number is given when you issue it.
      </Notice>
      <InvoiceDocumentView doc={p.document} audience="staff" />
      {p.blocker ? <Notice tone="problem" title="Cannot be issued yet">{p.blocker}</Notice> : null}
      {problem ? <Notice tone="problem" title="Not issued">{problem}</Notice> : null}
      <div className="flex flex-wrap gap-2">
        <Button
          disabled={!!p.blocker}
          busy={issue.isPending}
          onClick={async () => {
            setProblem(null);
            try {
              await issue.mutateAsync({ expectedGross: p.document.totals.gross });
            } catch (e) {
              setProblem(isApiError(e) ? e.message : 'The invoice was not issued. Please try again.');
              void preview.refetch();
            }
          }}
        >
          Issue invoice for {formatMoney(p.document.totals.gross, p.document.currency)}
        </Button>
        <Button variant="quiet" onClick={() => setPreviewing(false)}>
          Not now
        </Button>
      </div>
    </div>
  );
}

function IssuedInvoice({ jobId, invoice, role }: { jobId: string; invoice: InvoiceDto; role: Role }) {
  const c = invoice.currency;
  const [open, setOpen] = useState<'payment' | 'refund' | 'credit' | null>(null);
  const refundable = invoice.payments.filter((p) => p.refundable !== '0.00');
  const refundNotes = refundCreditNotes(invoice);
  return (
    <Card title={`Invoice ${invoice.number}`}>
      <div className="flex flex-col gap-4">
        <dl className="grid grid-cols-2 gap-2 sm:grid-cols-5" aria-label="Where the invoice stands">
          <Figure label="State" value={INVOICE_STATE_LABELS[invoice.state]} />
          <Figure label="Invoice after credit notes" value={formatMoney(invoice.invoiced, c)} />
          <Figure label="Paid" value={formatMoney(invoice.paid, c)} />
          {invoice.refunded !== '0.00' ? (
            <Figure label={refundNotes.length ? `Refunded (${refundNotes.join(', ')})` : 'Refunded'} value={formatMoney(invoice.refunded, c)} />
          ) : null}
          <Figure label="Still owed" value={formatMoney(invoice.due, c)} />
        </dl>
        <p className="flex flex-wrap gap-3 text-sm">
          <a href={`/api/invoices/${invoice.id}/pdf`}>Download the VAT invoice (PDF)</a>
          {invoice.email === 'waiting' ? <span>Not e-mailed to the owner yet: it is being tried.</span> : null}
        </p>
        <NotEmailed jobId={jobId} invoice={invoice} />
        {handlesMoney(role) ? (
          <div className="flex flex-wrap gap-2">
            {invoice.due !== '0.00' ? (
              <Button variant={open === 'payment' ? 'secondary' : 'primary'} onClick={() => setOpen(open === 'payment' ? null : 'payment')}>
                Record a payment
              </Button>
            ) : null}
            {refundable.length ? (
              <Button variant="secondary" onClick={() => setOpen(open === 'refund' ? null : 'refund')}>
                Refund
              </Button>
            ) : null}
            {invoice.creditable !== '0.00' ? (
              <Button variant="secondary" onClick={() => setOpen(open === 'credit' ? null : 'credit')}>
                Issue credit note
              </Button>
            ) : null}
          </div>
        ) : null}
        {open === 'payment' ? <RecordPaymentForm jobId={jobId} invoice={invoice} onDone={() => setOpen(null)} /> : null}
        {open === 'refund' ? <RefundForm jobId={jobId} invoice={invoice} onDone={() => setOpen(null)} /> : null}
        {open === 'credit' ? <CreditNoteForm jobId={jobId} invoice={invoice} onDone={() => setOpen(null)} /> : null}
        {invoice.payments.length ? (
          <section aria-label="Payments on this job" className="flex flex-col gap-1">
            <h3 className="font-semibold">Payments</h3>
            <ul className="flex flex-col gap-1 text-sm">
              {invoice.payments.map((p) => (
                <li key={p.id}>
                  {p.receivedOn ? formatDate(p.receivedOn) : 'Date not known'} · {p.kind === 'deposit' ? 'Deposit' : 'Balance'} · {PAYMENT_METHOD_LABELS[p.method]} ·{' '}
                  <span className="tabular-nums">{formatMoney(p.amount, c)}</span> · {PAYMENT_STATE_LABELS[p.state]}
                  {p.refunded !== '0.00' ? ` (${formatMoney(p.refunded, c)} refunded)` : ''}
                  {p.reference ? ` · ref. ${p.reference}` : ''}
                </li>
              ))}
            </ul>
          </section>
        ) : null}
        <InvoiceCreditNotesAndDocument invoice={invoice} audience="staff" headingLevel="h3" />
      </div>
    </Card>
  );
}

/**
 * The documents of this invoice whose e-mail to the owner was given up (its PDF could not be made
 * after several tries), each with "Resend", which clears the mark and tries afresh.
 */
function NotEmailed({ jobId, invoice }: { jobId: string; invoice: InvoiceDto }) {
  const resend = useResendDocument(jobId);
  const [problem, setProblem] = useState<string | null>(null);
  const docs = [
    ...(invoice.email === 'not_sent' ? [{ kind: 'invoice' as const, id: invoice.id, name: `Invoice ${invoice.number}` }] : []),
    ...invoice.creditNotes.filter((cn) => cn.email === 'not_sent').map((cn) => ({ kind: 'credit_note' as const, id: cn.id, name: `Credit note ${cn.number}` })),
  ];
  if (!docs.length) return null;
  return (
    <div className="flex flex-col gap-2" data-testid="not-emailed">
      {docs.map((d) => (
        <Notice key={d.id} tone="problem" title={`${d.name}: not e-mailed`}>
          <p>The owner has not been sent it: its PDF could not be made after several tries, so we stopped trying. The document itself is issued and unchanged.</p>
          <p className="mt-2">
            <Button
              variant="secondary"
              busy={resend.isPending && resend.variables?.id === d.id}
              onClick={() => {
                setProblem(null);
                resend.mutate({ kind: d.kind, id: d.id }, { onError: (e) => setProblem(isApiError(e) ? e.message : 'It was not sent. Please try again.') });
              }}
            >
              Resend
            </Button>
          </p>
        </Notice>
      ))}
      {problem ? <p role="alert" className="text-sm">{problem}</p> : null}
    </div>
  );
}

function Figure({ label, value }: { label: string; value: string }) {
  return (
    <div className="rounded-control border border-seam p-2">
      <dt className="text-xs text-slate-soft">{label}</dt>
      <dd className="font-semibold tabular-nums">{value}</dd>
    </div>
  );
}

type PaymentIn = z.input<typeof offlinePaymentSchema>;
const PAYMENT_LABELS = { amount: 'Amount', method: 'How it was paid', receivedOn: 'Date received', reference: 'Reference' };

function RecordPaymentForm({ jobId, invoice, onDone }: { jobId: string; invoice: InvoiceDto; onDone: () => void }) {
  const record = useRecordPayment(jobId);
  const [summary, setSummary] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm<PaymentIn, unknown, z.output<typeof offlinePaymentSchema>>({
    resolver: zodResolver(offlinePaymentSchema),
    defaultValues: { amount: invoice.due, method: 'bank_transfer', receivedOn: todayIso(), reference: '' },
  });
  const e = formState.errors;
  return (
    <form
      aria-label="Record a payment"
      className="flex flex-col gap-3 rounded-card border border-seam-strong bg-cloth-raised p-4"
      onSubmit={handleSubmit(withServerErrors(setError, setSummary, Object.keys(PAYMENT_LABELS), async (v) => { await record.mutateAsync(v); onDone(); }))}
    >
      <FormErrorSummary message={summary} errors={e} labels={PAYMENT_LABELS} />
      <p className="text-sm">For money taken another way. Card payments are recorded by themselves. Still owed: {formatMoney(invoice.due, invoice.currency)}.</p>
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField label={PAYMENT_LABELS.amount} inputMode="decimal" error={e.amount?.message} {...register('amount')} />
        <SelectField label={PAYMENT_LABELS.method} error={e.method?.message} {...register('method')}>
          {OFFLINE_PAYMENT_METHODS.map((m) => (
            <option key={m} value={m}>{PAYMENT_METHOD_LABELS[m]}</option>
          ))}
        </SelectField>
        <TextField label={PAYMENT_LABELS.receivedOn} type="date" error={e.receivedOn?.message} {...register('receivedOn')} />
        <TextField label={PAYMENT_LABELS.reference} hint="The bank reference or cheque number, if any." error={e.reference?.message} {...register('reference')} />
      </div>
      <div>
        <Button type="submit" busy={record.isPending}>Record the payment</Button>
      </div>
    </form>
  );
}

type RefundIn = z.input<typeof refundSchema>;
const REFUND_LABELS = { paymentId: 'Card payment', amount: 'Amount to refund', reason: 'Reason (printed on the credit note)' };

function RefundForm({ jobId, invoice, onDone }: { jobId: string; invoice: InvoiceDto; onDone: () => void }) {
  const refund = useRefund(jobId, invoice.id);
  const cards = invoice.payments.filter((p) => p.refundable !== '0.00');
  const [summary, setSummary] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm<RefundIn, unknown, z.output<typeof refundSchema>>({
    resolver: zodResolver(refundSchema),
    defaultValues: { paymentId: cards[0]?.id ?? '', amount: '', reason: '' },
  });
  const e = formState.errors;
  return (
    <form
      aria-label="Refund"
      className="flex flex-col gap-3 rounded-card border border-seam-strong bg-cloth-raised p-4"
      onSubmit={handleSubmit(withServerErrors(setError, setSummary, Object.keys(REFUND_LABELS), async (v) => { await refund.mutateAsync(v); onDone(); }))}
    >
      <FormErrorSummary message={summary} errors={e} labels={REFUND_LABELS} />
      <p className="text-sm">The money goes back to the card it came from, and a credit note against {invoice.number} is issued and sent to the owner.</p>
      <SelectField label={REFUND_LABELS.paymentId} error={e.paymentId?.message} {...register('paymentId')}>
        {cards.map((p) => (
          <option key={p.id} value={p.id}>
            {p.kind === 'deposit' ? 'Deposit' : 'Balance'} {p.receivedOn ? formatDate(p.receivedOn) : ''}: up to {formatMoney(p.refundable, invoice.currency)}
          </option>
        ))}
      </SelectField>
      <TextField label={REFUND_LABELS.amount} inputMode="decimal" error={e.amount?.message} {...register('amount')} />
      <TextField label={REFUND_LABELS.reason} error={e.reason?.message} {...register('reason')} />
      <div>
        <Button type="submit" busy={refund.isPending}>Refund to the card</Button>
      </div>
    </form>
  );
}

type CreditIn = z.input<typeof creditNoteSchema>;
const CREDIT_LABELS = { amount: 'Amount incl. VAT', reason: 'Reason (printed on the credit note)' };

function CreditNoteForm({ jobId, invoice, onDone }: { jobId: string; invoice: InvoiceDto; onDone: () => void }) {
  const credit = useCreditNote(jobId, invoice.id);
  const [summary, setSummary] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm<CreditIn, unknown, z.output<typeof creditNoteSchema>>({
    resolver: zodResolver(creditNoteSchema),
    defaultValues: { amount: '', reason: '' },
  });
  const e = formState.errors;
  return (
    <form
      aria-label="Issue credit note"
      className="flex flex-col gap-3 rounded-card border border-seam-strong bg-cloth-raised p-4"
      onSubmit={handleSubmit(withServerErrors(setError, setSummary, Object.keys(CREDIT_LABELS), async (v) => { await credit.mutateAsync(v); onDone(); }))}
    >
      <FormErrorSummary message={summary} errors={e} labels={CREDIT_LABELS} />
      <p className="text-sm">
        Lowers what the owner owes without a refund (for example a goodwill reduction). At most {formatMoney(invoice.creditable, invoice.currency)}.
      </p>
      <TextField label={CREDIT_LABELS.amount} inputMode="decimal" error={e.amount?.message} {...register('amount')} />
      <TextField label={CREDIT_LABELS.reason} error={e.reason?.message} {...register('reason')} />
      <div>
        <Button type="submit" busy={credit.isPending}>Issue credit note</Button>
      </div>
    </form>
  );
}
