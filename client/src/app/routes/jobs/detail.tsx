import { JOB_TYPE_LABELS } from '@wingstage/shared';
import { useQuery, useSuspenseQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { Caution, Loading, Notice } from '@/components/ui/notice';
import { Card, Facts, PageHeader } from '@/components/ui/page';
import { StateBadge } from '@/components/ui/state-badge';
import { jobQueryOptions } from '@/features/jobs/api/get-job';
import { jobHistoryQueryOptions } from '@/features/jobs/api/get-job-history';
import { JobActions } from '@/features/jobs/components/job-actions';
import { JobEditForm } from '@/features/jobs/components/job-edit-form';
import { JobHistory } from '@/features/jobs/components/job-history';
import { formatDate } from '@/lib/format';
import { can } from '@/lib/permissions';
import { queryClient } from '@/lib/query-client';
import { requireSession, STAFF } from '../../guards';
import { useCurrentSession } from '../../use-current-session';

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
      <div className="grid items-start gap-5 lg:grid-cols-[2fr_1fr]">
        <div className="flex flex-col gap-5">
          {can.moveJob(role) ? (
            <Card title="Next step">
              <JobActions job={job} role={role} />
            </Card>
          ) : null}
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
                key={job.version}
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
        </div>
        {can.seeHistory(role) ? (
          <Card title="History">{history.data ? <JobHistory events={history.data} /> : history.isError ? <p>History could not be loaded.</p> : <Loading />}</Card>
        ) : null}
      </div>
      <Caution />
    </>
  );
}
