import { JOB_STATES, JOB_TRANSITION_ACTIONS, nextJobStates, type JobDto, type JobState, type Role } from '@wingstage/shared';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-client';
import { useTransitionJob } from '../api/transition-job';

/** Engineers may only start an inspection; the rest of the moves belong to the office. */
function offered(role: Role, from: JobState): readonly JobState[] {
  const next = nextJobStates(from);
  if (role === 'engineer') return next.filter((s) => from === 'booked_in' && s === 'inspecting');
  return next;
}

export function JobActions({ job, role }: { job: JobDto; role: Role }) {
  const transition = useTransitionJob(job.id);
  const [problem, setProblem] = useState<string | null>(null);
  const [pending, setPending] = useState<JobState | null>(null);
  const states = offered(role, job.state);

  if (states.length === 0) {
    return <p className="text-sm text-slate-soft">No further steps: this job is finished.</p>;
  }

  const move = async (to: JobState) => {
    setProblem(null);
    if (to === 'cancelled' && !window.confirm('Cancel this job? A cancelled job cannot be reopened.')) return;
    setPending(to);
    try {
      await transition.mutateAsync({ to, version: job.version });
    } catch (e) {
      if (isApiError(e) && e.code === 'stale_version') {
        setProblem('Someone else moved this job a moment ago. The page now shows where it is; choose again.');
      } else {
        setProblem(isApiError(e) ? e.message : 'The job could not be moved. Please try again.');
      }
    } finally {
      setPending(null);
    }
  };

  return (
    <div className="flex flex-col gap-3">
      {problem ? <Notice tone="problem" title="Not moved">{problem}</Notice> : null}
      <div className="flex flex-wrap gap-2">
        {states.map((s) => (
          <Button
            key={s}
            // Only moves forward along the job's path take the accent; going back a step or
            // cancelling is offered, but quieter.
            variant={s !== 'cancelled' && JOB_STATES.indexOf(s) > JOB_STATES.indexOf(job.state) ? 'primary' : 'secondary'}
            busy={pending === s}
            disabled={pending !== null}
            onClick={() => void move(s)}
          >
            {JOB_TRANSITION_ACTIONS[s]}
          </Button>
        ))}
      </div>
    </div>
  );
}
