import { JOB_STATES, JOB_STATE_LABELS, type JobState } from '@wingstage/shared';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { ButtonLink } from '@/components/ui/button-link';
import { SearchBox } from '@/components/ui/data-table';
import { Loading } from '@/components/ui/notice';
import { PageHeader } from '@/components/ui/page';
import { jobsQueryOptions, type JobListParams } from '@/features/jobs/api/get-jobs';
import { JobsTable } from '@/features/jobs/components/jobs-table';
import { readListParams, useListParams, type ListParams } from '@/lib/list-params';
import { can } from '@/lib/permissions';
import { queryClient } from '@/lib/query-client';
import { requireSession, STAFF } from '../../guards';
import { useCurrentSession } from '../../use-current-session';

const DEFAULTS = { sort: 'bookedInOn', dir: 'desc' as const };

function toQuery(p: ListParams): JobListParams {
  const state = JOB_STATES.includes(p.state as JobState) ? (p.state as JobState) : undefined;
  return { q: p.q, sort: p.sort, dir: p.dir, page: p.page, pageSize: p.pageSize, state };
}

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, STAFF);
  const params = readListParams(new URL(request.url).searchParams, DEFAULTS, ['state']);
  await queryClient.ensureQueryData(jobsQueryOptions(toQuery(params)));
  return null;
}

export function Component() {
  const session = useCurrentSession();
  const [params, update] = useListParams(DEFAULTS, ['state']);
  const query = toQuery(params);
  const jobs = useQuery({ ...jobsQueryOptions(query), placeholderData: keepPreviousData });

  return (
    <>
      <PageHeader
        title="Jobs"
        lead="Every visit an aircraft makes to the workshop."
        actions={can.editRecords(session.user.role) ? <ButtonLink to="/jobs/new">Book in</ButtonLink> : null}
      />
      <div className="mb-4 flex flex-col gap-3 sm:flex-row sm:items-center">
        <SearchBox label="Search jobs" value={params.q} onChange={(q) => update({ q })} />
        <label className="flex items-center gap-2 text-sm">
          <span className="font-semibold">State</span>
          <select
            value={query.state ?? ''}
            onChange={(e) => update({ state: e.target.value || undefined })}
            className="min-h-10 rounded-control border border-seam-strong bg-cloth-raised px-2 text-base"
          >
            <option value="">All states</option>
            {JOB_STATES.map((s) => (
              <option key={s} value={s}>
                {JOB_STATE_LABELS[s]}
              </option>
            ))}
          </select>
        </label>
      </div>
      {jobs.data ? <JobsTable page={jobs.data} params={params} onChange={update} busy={jobs.isPlaceholderData} /> : <Loading />}
    </>
  );
}
