import { JOB_TYPE_LABELS, QUOTE_STATE_OWNER_WORDS, compareAmounts, isTerminalJobState, photoUrl, type AircraftDto, type ApprovalRequestDto, type EstimateDto, type FindingDto, type JobDto, type JobState } from '@wingstage/shared';
import { ApprovalRequestBadge } from '@/components/ui/approval-badges';
import { CategoryBadge, FindingStateBadge } from '@/components/ui/finding-badges';
import { PhotoStrip } from '@/components/ui/photo-strip';
import { EnvelopeIcon } from '@/components/ui/icons';
import { StateBadge } from '@/components/ui/state-badge';
import { formatDate, formatDateTime, formatHours, formatMoney } from '@/lib/format';

/** What the letter knows about the money on one job; either part may still be loading. */
export interface JobMoney {
  estimate?: EstimateDto;
  requests?: ApprovalRequestDto[];
  /** What was found on the job, as the server lets the owner see it. */
  findings?: FindingDto[];
}

/** What each state means for the owner, in the workshop's words rather than the system's. */
const MEANING: Record<JobState, string> = {
  booked_in: 'We have it booked in and will start soon.',
  inspecting: 'Our engineers are inspecting it now. If we find anything, we will price it and ask you before doing the work.',
  awaiting_owner: 'We are waiting for your decision on some work. Nothing extra is done without your say-so.',
  in_work: 'The agreed work is under way.',
  ready_for_release: 'The work is finished and it is ready for the paperwork and release.',
  invoiced: 'The invoice is ready for you.',
  paid: 'Paid in full. Thank you.',
  closed: 'All done and closed.',
  cancelled: 'This job was cancelled.',
};

const WORDS = ['No', 'One', 'Two', 'Three', 'Four', 'Five', 'Six', 'Seven', 'Eight', 'Nine', 'Ten'];
/** A letter spells out small numbers. */
function count(n: number, one: string, many: string): string {
  return `${WORDS[n] ?? String(n)} ${n === 1 ? one : many}`;
}

/** "our quote", "two findings", "our quote and one finding": what a request put to the owner. */
function requestWords(request: ApprovalRequestDto): string {
  const n = request.findingIds.length;
  const found = n > 0 ? count(n, 'finding', 'findings').toLowerCase() : '';
  if (request.includesQuote) return found ? `our quote and ${found}` : 'our quote';
  return found;
}

function DecisionWaiting({ request, currency }: { request: ApprovalRequestDto; currency: string }) {
  const several = request.findingIds.length + (request.includesQuote ? 1 : 0) > 1;
  return (
    <div data-testid="decision-waiting" className="mt-3 flex gap-3 rounded-card border-2 border-dusk bg-dusk-tint p-3 text-slate">
      <span className="text-dusk">
        <EnvelopeIcon size={22} />
      </span>
      <div className="flex flex-col gap-1">
        <p className="flex flex-wrap items-center gap-2 font-semibold">
          Your decision is needed <ApprovalRequestBadge state={request.state} />
        </p>
        <p>
          On {formatDateTime(request.sentAt)} we e-mailed you {requestWords(request)} to approve or decline,{' '}
          <span className="tabular-nums">{formatMoney(request.gross, currency, { vat: 'incl' })}</span> if you approve {several ? 'them all' : 'it'}. Open the link in that e-mail
          to decide; it works until {formatDateTime(request.expiresAt)}.
        </p>
      </div>
    </div>
  );
}

function MoneySoFar({ estimate }: { estimate: EstimateDto }) {
  const p = estimate.priced;
  const m = (a: string) => formatMoney(a, estimate.currency, { vat: 'incl' });
  const undecided = compareAmounts(p.undecided.gross, '0') > 0;
  const quoteWaiting = compareAmounts(estimate.quote.awaitingGross, '0') > 0;
  return (
    <dl className="mt-3 grid grid-cols-[1fr_auto] gap-x-4 gap-y-1 text-sm tabular-nums" aria-label="The money so far">
      <dt>Our quote</dt>
      <dd className="text-right" data-owner-quote={estimate.quote.state}>
        {QUOTE_STATE_OWNER_WORDS[estimate.quote.state]}
      </dd>
      <dt>Quoted</dt>
      <dd className="text-right" data-owner-total="quoted">
        {m(p.quoted.gross)}
      </dd>
      {quoteWaiting ? (
        <>
          <dt>Of the quote, not yet agreed</dt>
          <dd className="text-right" data-owner-total="quote-awaiting">
            {m(estimate.quote.awaitingGross)}
          </dd>
        </>
      ) : null}
      <dt className="font-semibold">Agreed so far</dt>
      <dd className="text-right font-semibold" data-owner-total="committed">
        {m(p.committed.gross)}
      </dd>
      {undecided ? (
        <>
          <dt>Waiting for your decision, in all</dt>
          <dd className="text-right" data-owner-total="undecided">
            {m(p.undecided.gross)}
          </dd>
        </>
      ) : null}
    </dl>
  );
}

const thumb = (id: string) => photoUrl(id, 'thumb');
const full = (id: string) => photoUrl(id, 'full');

/** The findings we have told the owner about, each with its photos. */
function WhatWeFound({ findings }: { findings: FindingDto[] }) {
  const shown = findings.filter((f) => f.state !== 'withdrawn' && f.state !== 'draft');
  if (shown.length === 0) return null;
  return (
    <section className="mt-3 flex flex-col gap-2" aria-label="What we found">
      <h4 className="font-semibold">What we found</h4>
      <ul className="flex flex-col gap-3">
        {shown.map((f) => (
          <li key={f.id} data-owner-finding={f.number} className="flex flex-col gap-2 border-t border-seam pt-2">
            <p>
              <span className="font-semibold tabular-nums">{f.number}</span> · {f.title}
            </p>
            <div className="flex flex-wrap items-center gap-2">
              <CategoryBadge category={f.category} />
              <FindingStateBadge state={f.state} />
            </div>
            <PhotoStrip photos={f.photos} label={`${f.number}: ${f.title}`} thumbSrc={thumb} fullSrc={full} />
          </li>
        ))}
      </ul>
    </section>
  );
}

function JobEntry({ job, money }: { job: JobDto; money?: JobMoney }) {
  const waiting = money?.requests?.find((r) => r.state === 'sent');
  const currency = money?.estimate?.currency ?? 'GBP';
  return (
    <li className="rounded-card border border-seam bg-cloth-raised p-4">
      <div className="flex flex-wrap items-start justify-between gap-2">
        <h3 className="text-lg font-semibold">{job.title}</h3>
        <StateBadge state={job.state} size="lg" />
      </div>
      <p className="mt-2">{MEANING[job.state]}</p>
      <p className="mt-2 text-sm text-slate-soft">
        Job <span className="tabular-nums">{job.number}</span> · {JOB_TYPE_LABELS[job.type]} · booked in {formatDate(job.bookedInOn)}
        {job.dueOn ? ` · due back ${formatDate(job.dueOn)}` : ''}
      </p>
      {waiting ? <DecisionWaiting request={waiting} currency={currency} /> : null}
      {money?.estimate && !isTerminalJobState(job.state) ? <MoneySoFar estimate={money.estimate} /> : null}
      {money?.findings ? <WhatWeFound findings={money.findings} /> : null}
    </li>
  );
}

export function MyAircraftLetter({
  firstName,
  workshopName,
  aircraft,
  jobs,
  money = {},
}: {
  firstName: string;
  workshopName: string;
  aircraft: AircraftDto[];
  jobs: JobDto[];
  money?: Record<string, JobMoney>;
}) {
  const openJobs = jobs.filter((j) => !isTerminalJobState(j.state));
  return (
    <article className="mx-auto flex max-w-2xl flex-col gap-6">
      <header className="flex flex-col gap-2">
        <h1 tabIndex={-1} className="text-2xl font-bold focus:outline-none">My aircraft</h1>
        <p className="text-lg">Dear {firstName},</p>
        <p>
          {aircraft.length === 0
            ? `${workshopName} has no aircraft on record for you yet. If you expected to see one here, please give us a call.`
            : openJobs.length === 0
              ? `Here is where things stand with your aircraft at ${workshopName}. Nothing is in the hangar for you at the moment.`
              : `Here is where things stand with your aircraft at ${workshopName}. ${count(openJobs.length, 'job is', 'jobs are')} open.`}
        </p>
      </header>
      {aircraft.map((a) => {
        const own = jobs.filter((j) => j.aircraftId === a.id);
        return (
          <section key={a.id} aria-labelledby={`ac-${a.id}`} className="flex flex-col gap-3">
            <div className="border-b-2 border-seam-strong pb-2">
              <h2 id={`ac-${a.id}`} className="text-xl font-bold tracking-wide">
                {a.registration}
              </h2>
              <p className="text-slate-soft">
                {a.type}
                {a.engine ? ` · ${a.engine}` : ''} · airframe <span className="tabular-nums">{formatHours(a.airframeHours)}</span>
              </p>
            </div>
            {own.length === 0 ? (
              <p className="text-slate-soft">No jobs on record for {a.registration}.</p>
            ) : (
              <ul className="flex flex-col gap-3" aria-label={`Jobs for ${a.registration}`}>
                {own.map((j) => (
                  <JobEntry key={j.id} job={j} money={money[j.id]} />
                ))}
              </ul>
            )}
          </section>
        );
      })}
      <p>
        With thanks,
        <br />
        <span className="font-semibold">{workshopName}</span>
      </p>
    </article>
  );
}
