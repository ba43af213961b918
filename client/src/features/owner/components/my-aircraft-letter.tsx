import { JOB_TYPE_LABELS, isTerminalJobState, type AircraftDto, type JobDto, type JobState } from '@wingstage/shared';
import { StateBadge } from '@/components/ui/state-badge';
import { formatDate, formatHours } from '@/lib/format';

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

function JobEntry({ job }: { job: JobDto }) {
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
    </li>
  );
}

export function MyAircraftLetter({ firstName, workshopName, aircraft, jobs }: { firstName: string; workshopName: string; aircraft: AircraftDto[]; jobs: JobDto[] }) {
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
                  <JobEntry key={j.id} job={j} />
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
