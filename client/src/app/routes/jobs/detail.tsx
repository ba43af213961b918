import { JOB_TYPE_LABELS, workshopPricingFrom, type EstimateDto, type FindingDto, type JobDto, type PartDto, type Role, type WorkshopDto } from '@wingstage/shared';
import { useQuery, useSuspenseQuery } from '@tanstack/react-query';
import { useMemo, useRef, useState } from 'react';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { DOCUMENTS_TITLE, DocumentsSection, jobDocumentsQueryOptions } from '@/components/documents-section';
import { Caution, Loading, Notice } from '@/components/ui/notice';
import { Card, Facts, PageHeader } from '@/components/ui/page';
import { StateBadge } from '@/components/ui/state-badge';
import { partsQueryOptions } from '@/lib/catalogue-parts';
import { ALL_SUPPLIERS, suppliersQueryOptions } from '@/lib/catalogue-suppliers';
import { approvalRequestsQueryOptions } from '@/features/approvals/api/approval-requests';
import { preAuthorisationQueryOptions } from '@/features/approvals/api/pre-authorisation';
import { ApprovalRequestsList } from '@/features/approvals/components/approval-requests-list';
import { PreAuthorisation } from '@/features/approvals/components/pre-authorisation-form';
import { SendForApproval, SendTick, quoteSendable, sendable } from '@/features/approvals/components/send-for-approval';
import { estimateQueryOptions } from '@/features/estimates/api/get-estimate';
import { EstimateBuilder } from '@/features/estimates/components/estimate-builder';
import { QuotePanel } from '@/features/estimates/components/quote-panel';
import { linesFromFinding } from '@/features/estimates/components/lines-from-finding';
import { ReleaseGuard } from '@/features/estimates/components/release-guard';
import { useEstimateDraft } from '@/features/estimates/components/use-estimate-draft';
import { findingsQueryOptions } from '@/features/findings/api/get-job-work';
import { FindingActions } from '@/features/findings/components/finding-actions';
import { FindingsList } from '@/features/findings/components/findings-list';
import { workshopQueryOptions } from '@/features/workshop/api/get-workshop';
import { jobQueryOptions } from '@/features/jobs/api/get-job';
import { jobHistoryQueryOptions } from '@/features/jobs/api/get-job-history';
import { JobActions } from '@/features/jobs/components/job-actions';
import { InvoiceSection } from '@/features/invoices/components/invoice-section';
import { DecisionsToSeePanel } from '@/features/jobs/components/decisions-to-see';
import { JobEditForm } from '@/features/jobs/components/job-edit-form';
import { JobHistory } from '@/features/jobs/components/job-history';
import { JobDeposits } from '@/features/payments/components/job-deposits';
import { formatDate, formatMoney } from '@/lib/format';
import { can } from '@/lib/permissions';
import { queryClient } from '@/lib/query-client';
import { requireSession, STAFF } from '../../guards';
import { useCurrentSession } from '../../use-current-session';
import { GO_AHEAD } from '@/features/approvals/words';

export async function loader({ request, params }: LoaderFunctionArgs) {
  await requireSession(request, STAFF);
  await queryClient.ensureQueryData(jobQueryOptions(params.id!));
  return null;
}

export function Component() {
  const { id } = useParams() as { id: string };
  const session = useCurrentSession();
  const role = session.user.role;
  const { data: job } = useSuspenseQuery(jobQueryOptions(id));
  const history = useQuery({ ...jobHistoryQueryOptions(id), enabled: can.seeHistory(role) });
  const [editing, setEditing] = useState(false);
  const [notice, setNotice] = useState<string | null>(null);
  const estimate = useQuery(estimateQueryOptions(id));
  const workshop = useQuery(workshopQueryOptions());
  const findings = useQuery(findingsQueryOptions(id));
  const documents = useQuery(jobDocumentsQueryOptions(id));

  return (
    <>
      <PageHeader
        back={{ to: '/jobs', label: 'Jobs' }}
        title={
          <>
            <span className="tabular-nums">{job.number}</span> · {job.title}
          </>
        }
        lead={
          <span className="flex flex-wrap items-center gap-2">
            <StateBadge state={job.state} size="lg" />
            <span>
              {can.seeAircraft(role) ? <Link to={`/aircraft/${job.aircraftId}`}>{job.registration}</Link> : job.registration} · {job.aircraftType}
            </span>
          </span>
        }
      />
      {job.decisionsToSee ? (
        <div className="mb-5">
          <DecisionsToSeePanel jobId={job.id} toSee={job.decisionsToSee} ownerName={job.customerName} />
        </div>
      ) : null}
      <div className="grid items-start gap-5 lg:grid-cols-[2fr_1fr]">
        <div className="flex flex-col gap-5">
          {can.moveJob(role) ? (
            <Card title="Next step">
              <div className="flex flex-col gap-3">
                {findings.data && ['in_work', 'awaiting_owner', 'inspecting'].includes(job.state) ? <ReleaseGuard findings={findings.data} /> : null}
                <JobActions job={job} role={role} />
              </div>
            </Card>
          ) : null}
          <InvoiceSection job={job} role={role} />
          <Card
            title="Details"
            actions={
              can.editRecords(role) && !editing ? (
                <Button variant="secondary" onClick={() => { setNotice(null); setEditing(true); }}>
                  Edit details
                </Button>
              ) : null
            }
          >
            {notice ? (
              <div className="mb-4">
                <Notice tone="problem" title="Not saved">{notice}</Notice>
              </div>
            ) : null}
            {editing ? (
              <JobEditForm
                job={job}
                onDone={(n) => {
                  setEditing(false);
                  setNotice(n ?? null);
                }}
              />
            ) : (
              <Facts
                items={[
                  { label: 'Kind of work', value: JOB_TYPE_LABELS[job.type] },
                  { label: 'Owner', value: can.seeOwners(role) ? <Link to={`/owners/${job.customerId}`}>{job.customerName}</Link> : job.customerName },
                  { label: 'Booked in', value: formatDate(job.bookedInOn) },
                  { label: 'Due back', value: formatDate(job.dueOn) },
                  { label: 'Notes', value: job.notes ? <span className="whitespace-pre-line">{job.notes}</span> : '' },
                ]}
              />
            )}
          </Card>
          <Card title={DOCUMENTS_TITLE}><DocumentsSection jobId={job.id} audience="staff" docs={documents.data} failed={documents.isError} heading={false} /></Card>
        </div>
        <JobDeposits jobId={job.id} role={role} />
        {can.seeHistory(role) ? (
          <Card title="History">{history.data ? <JobHistory events={history.data} /> : history.isError ? <p>History could not be loaded.</p> : <Loading />}</Card>
        ) : null}
      </div>
      <div className="mt-5">
        {estimate.data && workshop.data ? (
          <JobEstimate job={job} role={role} estimate={estimate.data} workshop={workshop.data} findings={findings.data ?? []} />
        ) : estimate.isError || workshop.isError ? (
          <Notice tone="problem">The estimate could not be loaded.</Notice>
        ) : (
          <Loading label="Loading the estimate…" />
        )}
      </div>
      <Caution />
    </>
  );
}

const CLOSED_FOR_EDITS = new Set(['invoiced', 'paid', 'closed', 'cancelled']);

/** The builder and the findings that feed it share one draft, so "Price finding" adds lines to it. */
function JobEstimate({ job, role, estimate, workshop, findings }: { job: JobDto; role: Role; estimate: EstimateDto; workshop: WorkshopDto; findings: FindingDto[] }) {
  const pricing = useMemo(() => workshopPricingFrom(workshop), [workshop]);
  const draft = useEstimateDraft(job.id, estimate, pricing);
  const editable = can.editEstimate(role) && !CLOSED_FOR_EDITS.has(job.state);
  const suppliers = useQuery({ ...suppliersQueryOptions(ALL_SUPPLIERS), enabled: editable });
  const [priceNote, setPriceNote] = useState<string | null>(null);
  const [toSend, setToSend] = useState<Set<string>>(new Set());
  const [quoteTicked, setQuoteTicked] = useState(false);
  const requests = useQuery(approvalRequestsQueryOptions(job.id));
  const limit = useQuery(preAuthorisationQueryOptions(job.id));
  const canSend = can.editEstimate(role) && !CLOSED_FOR_EDITS.has(job.state);
  const builderRef = useRef<HTMLDivElement>(null);
  const hasLines = new Set(draft.draft.lines.map((l) => l.findingId).filter(Boolean));
  // Each finding's own price, as the owner would be asked to approve it, from the live engine result.
  const pricedFindings = new Map(draft.live.priced?.findings.map((p) => [p.findingId, p]) ?? []);

  const [pricingFinding, setPricingFinding] = useState<string | null>(null);
  const price = async (f: FindingDto) => {
    // Only the parts this remedy names, fetched by id: a catalogue of any size prices correctly.
    const ids = [...new Set(f.remedy.parts.map((p) => p.partId))];
    let named: PartDto[] = [];
    if (ids.length) {
      setPricingFinding(f.id);
      try {
        named = (await queryClient.fetchQuery(partsQueryOptions({ ids: ids.join(','), pageSize: 100 }))).items;
      } catch {
        setPriceNote(`${f.number} could not be priced: its proposed parts could not be loaded. Try again.`);
        return;
      } finally {
        setPricingFinding(null);
      }
    }
    const { lines, tasks, missingParts } = linesFromFinding(f, { parts: named.filter((p) => p.active), workshop, accessTasks: draft.draft.accessTasks });
    draft.addLines(lines, tasks);
    setPriceNote(
      `${f.number} added to discovered work from the engineer's proposal${tasks.length ? '; set the hours of the new access task' : ''}${
        missingParts.length ? `; ${missingParts.length} proposed part${missingParts.length > 1 ? 's are' : ' is'} no longer in the catalogue` : ''
      }. Check the lines, then save the estimate.`,
    );
    builderRef.current?.scrollIntoView({ block: 'start' });
  };

  const sendQuote = () => {
    setQuoteTicked(true);
    document.getElementById(`send-for-approval-${job.id}`)?.scrollIntoView({ block: 'start' });
  };

  return (
    <div className="flex flex-col gap-5">
      <Card title="Quote">
        <QuotePanel jobId={job.id} estimate={estimate} canAct={canSend && !draft.draft.dirty} onSendQuote={sendQuote} />
        {canSend && draft.draft.dirty && quoteSendable(estimate) ? <p className="mt-2 text-sm">Save the estimate first: the owner is sent the quote as saved.</p> : null}
      </Card>
      <Card title="Findings">
        <FindingsList
          findings={findings}
          empty="No findings yet. Engineers raise them from the Hangar."
          photos={{ jobId: job.id, canEdit: can.raiseFinding(role) && job.state !== 'closed' && job.state !== 'cancelled' }}
          action={(f) => {
            const p = pricedFindings.get(f.id);
            return (
              <>
                {p && hasLines.has(f.id) ? (
                  <span className="text-sm tabular-nums" data-testid="finding-price">
                    Its price: <strong>{formatMoney(p.price.gross, workshop.currency, { vat: 'incl' })}</strong> ({formatMoney(p.price.net, workshop.currency, { vat: 'excl' })})
                    {p.accessCovered.length > 0 ? ' · opening-up already paid for elsewhere' : ''}
                  </span>
                ) : null}
                {editable && f.state === 'draft' && !hasLines.has(f.id) ? (
                  <Button onClick={() => void price(f)} busy={pricingFinding === f.id}>
                    Price finding
                  </Button>
                ) : editable && hasLines.has(f.id) && (f.state === 'draft' || f.state === 'priced') ? (
                  <span className="text-sm">Lines in discovered work below{f.state === 'draft' ? ' (not saved yet)' : ''}.</span>
                ) : null}
                {canSend && sendable(f) ? (
                  <SendTick
                    finding={f}
                    checked={toSend.has(f.id)}
                    onChange={(on) =>
                      setToSend((cur) => {
                        const next = new Set(cur);
                        if (on) next.add(f.id);
                        else next.delete(f.id);
                        return next;
                      })
                    }
                  />
                ) : null}
                <FindingActions jobId={job.id} finding={f} role={role} />
              </>
            );
          }}
        />
        {canSend ? (
          <div className="mt-4">
            <SendForApproval
              jobId={job.id}
              ownerName={job.customerName}
              findings={findings}
              selected={new Set([...toSend].filter((id) => findings.some((f) => f.id === id && sendable(f))))}
              estimate={estimate}
              vatRates={workshop.vatRates}
              quoteTicked={quoteTicked}
              onQuoteTicked={setQuoteTicked}
              unsaved={draft.draft.dirty}
              onSent={() => {
                setToSend(new Set());
                setQuoteTicked(false);
              }}
            />
          </div>
        ) : null}
      </Card>
      <div className="grid items-start gap-5 lg:grid-cols-2">
        <Card title="Approval requests">
          {requests.data ? (
            <ApprovalRequestsList jobId={job.id} requests={requests.data} findings={findings} currency={workshop.currency} canAct={canSend} />
          ) : requests.isError ? (
            <p>The approval requests could not be loaded.</p>
          ) : (
            <Loading />
          )}
        </Card>
        <Card title={GO_AHEAD.title}>
          {limit.data ? (
            <PreAuthorisation jobId={job.id} jobVersion={job.version} limit={limit.data} currency={workshop.currency} canEdit={canSend} />
          ) : limit.isError ? (
            <p>{GO_AHEAD.loadFailed}</p>
          ) : (
            <Loading />
          )}
        </Card>
      </div>
      <div ref={builderRef} className="scroll-mt-4">
        {priceNote ? (
          <div className="mb-3">
            <Notice title="Lines added">{priceNote}</Notice>
          </div>
        ) : null}
        <EstimateBuilder
          draft={draft}
          workshop={workshop}
          suppliers={(suppliers.data?.items ?? []).filter((s) => s.active)}
          findings={findings}
          editable={editable}
        />
      </div>
    </div>
  );
}
