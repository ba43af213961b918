import { JOB_TYPE_LABELS, type JobDto } from '@wingstage/shared';
import { useSuspenseQuery } from '@tanstack/react-query';
import { Link, type LoaderFunctionArgs } from 'react-router-dom';
import { Caution } from '@/components/ui/notice';
import { PageHeader } from '@/components/ui/page';
import { StateBadge } from '@/components/ui/state-badge';
import { jobsQueryOptions } from '@/features/jobs/api/get-jobs';
import { SAFETY_CAUTION } from '@/lib/cautions';
import { queryClient } from '@/lib/query-client';
import { requireSession } from '../../guards';

const HANDS_ON = ['admin', 'manager', 'engineer'] as const;
const INSPECTING = { state: 'inspecting' as const, pageSize: 100, sort: 'bookedInOn', dir: 'asc' as const };
const IN_WORK = { state: 'in_work' as const, pageSize: 100, sort: 'bookedInOn', dir: 'asc' as const };

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, HANDS_ON);
  await Promise.all([queryClient.ensureQueryData(jobsQueryOptions(INSPECTING)), queryClient.ensureQueryData(jobsQueryOptions(IN_WORK))]);
  return null;
}

function JobCards({ jobs, empty }: { jobs: JobDto[]; empty: string }) {
  if (jobs.length === 0) return <p className="text-slate-soft">{empty}</p>;
  return (
    <ul className="grid gap-3 md:grid-cols-2">
      {jobs.map((j) => (
        <li key={j.id}>
          <Link to={`/hangar/${j.id}`} className="flex min-h-tap flex-col gap-1 rounded-card border border-seam bg-cloth-raised p-4 text-slate no-underline hover:border-harbour">
            <span className="text-xl font-bold tracking-wide">{j.registration}</span>
            <span className="font-semibold text-harbour-deep underline underline-offset-2">{j.title}</span>
            <span className="text-sm text-slate-soft">
              {j.aircraftType} · {JOB_TYPE_LABELS[j.type]} · <span className="tabular-nums">{j.number}</span>
            </span>
            <span className="mt-1">
              <StateBadge state={j.state} />
            </span>
          </Link>
        </li>
      ))}
    </ul>
  );
}

export function Component() {
  const { data: inspecting } = useSuspenseQuery(jobsQueryOptions(INSPECTING));
  const { data: inWork } = useSuspenseQuery(jobsQueryOptions(IN_WORK));
  return (
    <>
      <PageHeader title="Hangar" lead="Aircraft on the floor: record the checklist, raise findings, log your time." />
      <section aria-labelledby="h-inspecting" className="mb-6">
        <h2 id="h-inspecting" className="mb-3 text-lg font-semibold">
          Being inspected
        </h2>
        <JobCards jobs={inspecting.items} empty="No aircraft being inspected." />
      </section>
      <section aria-labelledby="h-in-work">
        <h2 id="h-in-work" className="mb-3 text-lg font-semibold">
          In work
        </h2>
        <JobCards jobs={inWork.items} empty="No aircraft in work." />
      </section>
      <Caution>{SAFETY_CAUTION}</Caution>
    </>
  );
}
