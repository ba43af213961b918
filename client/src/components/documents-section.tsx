import { DOCUMENT_PATHS, type JobDocumentsDto } from '@wingstage/shared';
import { queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { formatDate } from '@/lib/format';
import { jobKeysBase } from '@/lib/job-keys';

/** The job's documents as PDF downloads; one list for the owner's page and the staff job page. */
/** The staff page's card title. */
export const DOCUMENTS_TITLE = 'Documents';

export const jobDocumentsQueryOptions = (jobId: string) =>
  queryOptions({
    queryKey: [...jobKeysBase.detail(jobId), 'documents'] as const,
    queryFn: ({ signal }) => api.get<JobDocumentsDto>(`/jobs/${jobId}/documents`, undefined, signal),
  });

const WORDS = {
  owner: { heading: 'Documents to keep', estimate: 'Estimate as it stands today' },
  staff: { heading: 'Documents', estimate: 'Estimate as it stands' },
  decisionRecord: (on: string, by: string) => `Decision record: decided ${on}${by ? ` by ${by}` : ''}`,
  invoice: (number: string, on: string) => `VAT invoice ${number}, issued ${on}`,
  creditNote: (number: string, on: string) => `Credit note ${number}, issued ${on}`,
  pdf: 'PDF',
  failed: 'The other documents could not be listed just now; reload the page to try again.',
} as const;

function DocumentLink({ href, label }: { href: string; label: string }) {
  return (
    <li>
      <a href={href} download className="inline-flex min-h-6 items-baseline gap-2 py-1 underline underline-offset-2">
        <span>{label}</span>
        <span className="text-xs font-semibold uppercase tracking-wide text-slate-soft no-underline">{WORDS.pdf}</span>
      </a>
    </li>
  );
}

/**
 * Download links for the estimate, each decision record, the VAT invoice and its credit notes, from
 * GET /api/jobs/:id/documents (the page loads it with jobDocumentsQueryOptions and passes it in).
 * The estimate's link shows at once; the invoice and credit notes appear once they exist.
 */
export function DocumentsSection({
  jobId,
  audience,
  docs,
  failed = false,
  heading = true,
}: {
  jobId: string;
  audience: 'owner' | 'staff';
  docs?: JobDocumentsDto;
  failed?: boolean;
  /** False inside a card that already carries the title. */
  heading?: boolean;
}) {
  const w = WORDS[audience];
  return (
    <section aria-label={w.heading} data-testid="documents-section" className={heading ? 'mt-3' : ''}>
      {heading ? <h4 className="text-sm font-semibold">{w.heading}</h4> : null}
      <ul className="flex flex-col">
        <DocumentLink href={docs?.estimate.path ?? DOCUMENT_PATHS.estimate(jobId)} label={w.estimate} />
        {docs?.decisionRecords.map((r) => (
          <DocumentLink key={r.requestId} href={r.path} label={WORDS.decisionRecord(formatDate(r.decidedAt), r.decidedByName)} />
        ))}
        {docs?.invoice ? <DocumentLink href={docs.invoice.path} label={WORDS.invoice(docs.invoice.number, formatDate(docs.invoice.issuedAt))} /> : null}
        {docs?.creditNotes.map((c) => (
          <DocumentLink key={c.id} href={c.path} label={WORDS.creditNote(c.number, formatDate(c.issuedAt))} />
        ))}
      </ul>
      {failed ? <p className="text-sm text-slate-soft">{WORDS.failed}</p> : null}
    </section>
  );
}
