import type { ReactNode } from 'react';
import { JOB_TYPE_LABELS, QUOTE_STATE_OWNER_WORDS, compareAmounts, isTerminalJobState, photoUrl, type AircraftDto, type ApprovalRequestDto, type EstimateDto, type FindingDto, type JobDocumentsDto, type JobDto } from '@wingstage/shared';
import { ApprovalRequestBadge } from '@/components/ui/approval-badges';
import { CategoryBadge, FindingStateBadge } from '@/components/ui/finding-badges';
import { PhotoStrip } from '@/components/ui/photo-strip';
import { DocumentsSection } from '@/components/documents-section';
import { EnvelopeIcon } from '@/components/ui/icons';
import { StateBadge } from '@/components/ui/state-badge';
import { formatDate, formatDateTime, formatHours, formatMoney } from '@/lib/format';
import { IN_THE_HANGAR, OWNER_JOB_MEANING, OWNER_WORDS as W } from '../words';
import { MyInvoice } from './my-invoice';
import type { InvoiceDto } from '@wingstage/shared';

/** What the letter knows about the money on one job; either part may still be loading. */
export interface JobMoney {
  estimate?: EstimateDto;
  requests?: ApprovalRequestDto[];
  /** What was found on the job, as the server lets the owner see it. */
  findings?: FindingDto[];
  /** The job's documents to download. */
  documents?: JobDocumentsDto;
  /** The job's invoice once issued (invoiced, paid and closed jobs). */
  invoice?: InvoiceDto | null;
}

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
          {W.decisionNeeded} <ApprovalRequestBadge state={request.state} words={W.requestState} />
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
    <dl className="mt-3 grid grid-cols-[1fr_auto] gap-x-4 gap-y-1 text-sm tabular-nums" aria-label={W.moneyLabel}>
      <dt>{W.quoteState}</dt>
      <dd className="text-right" data-owner-quote={estimate.quote.state}>
        {QUOTE_STATE_OWNER_WORDS[estimate.quote.state]}
      </dd>
      <dt>{W.quoted}</dt>
      <dd className="text-right" data-owner-total="quoted">
        {m(p.quoted.gross)}
      </dd>
      {quoteWaiting ? (
        <>
          <dt>{W.quoteAwaiting}</dt>
          <dd className="text-right" data-owner-total="quote-awaiting">
            {m(estimate.quote.awaitingGross)}
          </dd>
        </>
      ) : null}
      <dt className="font-semibold">{W.agreed}</dt>
      <dd className="text-right font-semibold" data-owner-total="committed">
        {m(p.committed.gross)}
      </dd>
      {undecided ? (
        <>
          <dt>{W.undecided}</dt>
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
    <section className="mt-3 flex flex-col gap-2" aria-label={W.whatWeFound}>
      <h4 className="font-semibold">{W.whatWeFound}</h4>
      <ul className="flex flex-col gap-3">
        {shown.map((f) => (
          <li key={f.id} data-owner-finding={f.number} className="flex flex-col gap-2 border-t border-seam pt-2">
            <p>
              <span className="font-semibold tabular-nums">{f.number}</span> · {f.title}
            </p>
            <div className="flex flex-wrap items-center gap-2">
              <CategoryBadge category={f.category} />
              <FindingStateBadge state={f.state} words={W.findingState} />
            </div>
            <PhotoStrip photos={f.photos} label={`${f.number}: ${f.title}`} thumbSrc={thumb} fullSrc={full} />
          </li>
        ))}
      </ul>
    </section>
  );
}

function JobEntry({ job, money, extra }: { job: JobDto; money?: JobMoney; extra?: ReactNode }) {
  const waiting = money?.requests?.find((r) => r.state === 'sent');
  const currency = money?.estimate?.currency ?? 'GBP';
  return (
    <li className="rounded-card border border-seam bg-cloth-raised p-4">
      <div className="flex flex-wrap items-start justify-between gap-2">
        <h3 className="text-lg font-semibold">{job.title}</h3>
        <StateBadge state={job.state} size="lg" words={W.jobState} />
      </div>
      <p className="mt-2">{OWNER_JOB_MEANING[job.state]}</p>
      <p className="mt-2 text-sm text-slate-soft">
        {W.jobLine} <span className="tabular-nums">{job.number}</span> · {JOB_TYPE_LABELS[job.type]} · {W.bookedIn} {formatDate(job.bookedInOn)}
        {job.dueOn ? ` · ${W.dueBack} ${formatDate(job.dueOn)}` : ''}
      </p>
      {waiting ? <DecisionWaiting request={waiting} currency={currency} /> : null}
      {money?.estimate && !isTerminalJobState(job.state) ? <MoneySoFar estimate={money.estimate} /> : null}
      {extra}
      {money?.findings ? <WhatWeFound findings={money.findings} /> : null}
      <DocumentsSection jobId={job.id} audience="owner" docs={money?.documents} />
      {money?.invoice ? <MyInvoice jobId={job.id} invoice={money.invoice} /> : null}
    </li>
  );
}

/** How the owner reaches the workshop: shown wherever the letter says to get in touch. */
export interface WorkshopContact {
  phone: string;
  email: string;
}

function ContactLines({ contact }: { contact: WorkshopContact }) {
  if (!contact.phone && !contact.email) return null;
  return (
    <div data-testid="workshop-contact" className="flex flex-col gap-1">
      <p>{W.contactLead}</p>
      <ul className="flex flex-col gap-1">
        {contact.phone ? (
          <li>
            {W.call}: <a href={`tel:${contact.phone.replace(/[^0-9+]/g, '')}`} className="tabular-nums">{contact.phone}</a>
          </li>
        ) : null}
        {contact.email ? (
          <li className="break-all">
            {W.write}: <a href={`mailto:${contact.email}`}>{contact.email}</a>
          </li>
        ) : null}
      </ul>
    </div>
  );
}

export function MyAircraftLetter({
  firstName,
  workshopName,
  contact = { phone: '', email: '' },
  aircraft,
  jobs,
  money = {},
  jobExtra,
}: {
  firstName: string;
  workshopName: string;
  contact?: WorkshopContact;
  aircraft: AircraftDto[];
  jobs: JobDto[];
  money?: Record<string, JobMoney>;
  /** More about one job (its deposits), rendered by the page inside the job's entry. */
  jobExtra?: (jobId: string) => ReactNode;
}) {
  const inHangar = jobs.filter((j) => IN_THE_HANGAR.includes(j.state));
  const others = jobs.length - inHangar.length;
  return (
    <article className="mx-auto flex max-w-2xl flex-col gap-6">
      <header className="flex flex-col gap-2">
        <h1 tabIndex={-1} className="text-2xl font-bold focus:outline-none">{W.title}</h1>
        <p className="text-lg">{W.dear(firstName)}</p>
        <p>
          {aircraft.length === 0
            ? W.noAircraft(workshopName)
            : inHangar.length === 0
              ? `${W.standing(workshopName)} ${W.nothingIn}`
              : `${W.standing(workshopName)} ${W.inHangar(count(inHangar.length, 'job is', 'jobs are'))}${others > 0 ? ` ${W.othersBelow}` : ''}`}
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
              <p className="text-slate-soft">{W.noJobs(a.registration)}</p>
            ) : (
              <ul className="flex flex-col gap-3" aria-label={W.jobsFor(a.registration)}>
                {own.map((j) => (
                  <JobEntry key={j.id} job={j} money={money[j.id]} extra={jobExtra?.(j.id)} />
                ))}
              </ul>
            )}
          </section>
        );
      })}
      <ContactLines contact={contact} />
      <p>
        {W.thanks}
        <br />
        <span className="font-semibold">{workshopName}</span>
      </p>
    </article>
  );
}
