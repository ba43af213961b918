import { useQuery, useSuspenseQuery } from '@tanstack/react-query';
import { useEffect, useRef, useState } from 'react';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { Caution, Loading, Notice } from '@/components/ui/notice';
import { Card, PageHeader } from '@/components/ui/page';
import { StateBadge } from '@/components/ui/state-badge';
import { checklistQueryOptions, findingsQueryOptions, timeQueryOptions } from '@/features/findings/api/get-job-work';
import { Checklist } from '@/features/findings/components/checklist';
import type { FindingPrefill } from '@/features/findings/components/finding-form';
import { describeRaise, RaiseFinding, type UnsentPhotos } from '@/features/findings/components/raise-finding';
import { FindingActions } from '@/features/findings/components/finding-actions';
import { FindingsList } from '@/features/findings/components/findings-list';
import { TimeLog } from '@/features/findings/components/time-log';
import { JobCautions } from '@/features/findings/components/job-cautions';
import { HANGAR_WORDS } from '@/features/findings/words';
import { jobQueryOptions } from '@/features/jobs/api/get-job';
import { workshopQueryOptions } from '@/features/workshop/api/get-workshop';
import { SAFETY_CAUTION } from '@/lib/cautions';
import { can } from '@/lib/permissions';
import { queryClient } from '@/lib/query-client';
import { requireSession } from '../../guards';
import { useCurrentSession } from '../../use-current-session';

const HANDS_ON = ['admin', 'manager', 'engineer'] as const;

export async function loader({ request, params }: LoaderFunctionArgs) {
  await requireSession(request, HANDS_ON);
  await Promise.all([
    queryClient.ensureQueryData(jobQueryOptions(params.id!)),
    queryClient.ensureQueryData(checklistQueryOptions(params.id!)),
    queryClient.ensureQueryData(workshopQueryOptions()),
  ]);
  return null;
}

export function Component() {
  const { id } = useParams() as { id: string };
  const session = useCurrentSession();
  const role = session.user.role;
  const { data: job } = useSuspenseQuery(jobQueryOptions(id));
  const { data: checklist } = useSuspenseQuery(checklistQueryOptions(id));
  const { data: workshop } = useSuspenseQuery(workshopQueryOptions());
  const findings = useQuery(findingsQueryOptions(id));
  const time = useQuery(timeQueryOptions(id));
  const [raising, setRaising] = useState<FindingPrefill | null>(null);
  const [raised, setRaised] = useState<ReturnType<typeof describeRaise> | null>(null);
  // Photos that did not go up with their new finding wait on its card for another try.
  const [unsent, setUnsent] = useState<Record<string, UnsentPhotos>>({});
  const formRef = useRef<HTMLDivElement>(null);
  const canWork = can.raiseFinding(role) && (job.state === 'inspecting' || job.state === 'in_work');

  useEffect(() => {
    if (raising) formRef.current?.scrollIntoView({ block: 'start' });
  }, [raising]);

  return (
    <>
      <PageHeader
        back={{ to: '/hangar', label: 'Hangar' }}
        title={
          <>
            {job.registration} · {job.title}
          </>
        }
        lead={
          <span className="flex flex-wrap items-center gap-2">
            <StateBadge state={job.state} />
            <span>
              {job.aircraftType} · <span className="tabular-nums">{job.number}</span>
            </span>
            {can.seeJobs(role) && role !== 'engineer' ? <Link to={`/jobs/${job.id}`}>Open the job and estimate</Link> : null}
          </span>
        }
      />
      <div className="mb-4 flex flex-col gap-3">
        <JobCautions checklist={checklist} scopeCautions={job.scopeCautions} />
        <Notice title={HANGAR_WORDS.whoCertifiesTitle}>
          <p>{SAFETY_CAUTION}</p>
        </Notice>
      </div>
      {!canWork ? (
        <div className="mb-4">
          <Notice>This job is not being inspected or worked on, so the checklist and findings are read-only here.</Notice>
        </div>
      ) : null}
      {raised ? (
        <div className="mb-4">
          <Notice title={raised.title} tone={raised.problem ? 'problem' : 'info'}>
            <p>{raised.text}</p>
            {raised.problem ? (
              <div>
                <Button variant="secondary" size="lg" onClick={() => document.querySelector(`[data-finding="${raised.number}"]`)?.scrollIntoView({ block: 'start' })}>
                  Go to {raised.number}
                </Button>
              </div>
            ) : null}
          </Notice>
        </div>
      ) : null}

      <div className="flex flex-col gap-5 lg:grid lg:grid-cols-[3fr_2fr] lg:items-start">
        <div className="flex flex-col gap-5">
          {raising ? (
            <div ref={formRef} className="scroll-mt-4">
              <Card title="Raise finding">
                <RaiseFinding
                  jobId={id}
                  prefill={raising}
                  workshop={workshop}
                  onCancel={() => setRaising(null)}
                  onRaised={(outcome) => {
                    setRaising(null);
                    setRaised(describeRaise(outcome));
                    const left = outcome.unsent;
                    if (left) setUnsent((u) => ({ ...u, [outcome.finding.id]: left }));
                  }}
                />
              </Card>
            </div>
          ) : null}
          <Card title="Checklist">
            <Checklist
              jobId={id}
              items={checklist}
              canRecord={canWork}
              onRaise={(p) => {
                setRaised(null);
                setRaising(p);
              }}
            />
          </Card>
        </div>
        <div className="flex flex-col gap-5">
          <Card
            title="Findings"
            actions={
              canWork && !raising ? (
                <Button
                  size="lg"
                  onClick={() => {
                    setRaised(null);
                    setRaising({});
                  }}
                >
                  Raise finding
                </Button>
              ) : null
            }
          >
            {findings.data ? (
              <FindingsList
                findings={findings.data}
                action={(f) => <FindingActions jobId={job.id} finding={f} role={session.user.role} />}
                photos={{
                  jobId: id,
                  canEdit: can.raiseFinding(role) && canWork,
                  unsent,
                  onUnsentSettled: (findingId) =>
                    setUnsent((u) => {
                      const { [findingId]: _gone, ...rest } = u;
                      return rest;
                    }),
                }}
              />
            ) : findings.isError ? <p>Findings could not be loaded.</p> : <Loading />}
          </Card>
          <Card title={HANGAR_WORDS.timeTitle}>
            {time.data ? <TimeLog jobId={id} entries={time.data} canLog={canWork} canChangeAll={role === 'admin' || role === 'manager'} userId={session.user.id} /> : time.isError ? <p>Time could not be loaded.</p> : <Loading />}
          </Card>
        </div>
      </div>
      <Caution>{SAFETY_CAUTION}</Caution>
    </>
  );
}
