import { JOB_STATES, JOB_TRANSITION_ACTIONS, manualJobMoves, type JobDto, type JobState, type Role } from '@wingstage/shared';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { TextAreaField } from '@/components/ui/field';
import { Notice } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-client';
import { useTransitionJob } from '../api/transition-job';

/**
 * Engineers may only start an inspection; the rest of the moves belong to the office. Invoiced and
 * paid are never offered: issuing the invoice and the money received make those moves.
 */
function offered(role: Role, from: JobState): readonly JobState[] {
  const next = manualJobMoves(from);
  if (role === 'engineer') return next.filter((s) => from === 'booked_in' && s === 'inspecting');
  return next;
}

export function JobActions({ job, role }: { job: JobDto; role: Role }) {
  const transition = useTransitionJob(job.id);
  const [problem, setProblem] = useState<string | null>(null);
  const [pending, setPending] = useState<JobState | null>(null);
  // Cancelling asks why first: the reason goes into the job's history.
  const [cancelling, setCancelling] = useState(false);
  const [reason, setReason] = useState('');
  const [reasonError, setReasonError] = useState<string | undefined>();
  const states = offered(role, job.state);

  if (states.length === 0) {
    if (job.state === 'invoiced') {
      return <p className="text-sm text-slate-soft">Waiting for payment: the job becomes paid when the money received covers the invoice.</p>;
    }
    return <p className="text-sm text-slate-soft">No further steps: this job is finished.</p>;
  }

  const move = async (to: JobState, why = '') => {
    setProblem(null);
    setPending(to);
    try {
      await transition.mutateAsync(why ? { to, version: job.version, reason: why } : { to, version: job.version });
      setCancelling(false);
      setReason('');
    } catch (e) {
      if (isApiError(e) && e.fields?.reason) {
        setReasonError(e.fields.reason);
      } else if (isApiError(e) && e.code === 'stale_version') {
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
            onClick={() => (s === 'cancelled' ? setCancelling(true) : void move(s))}
          >
            {JOB_TRANSITION_ACTIONS[s]}
          </Button>
        ))}
      </div>
      {cancelling ? (
        <form
          className="flex flex-col gap-3 rounded-card border border-seam-strong bg-cloth-raised p-4"
          onSubmit={(e) => {
            e.preventDefault();
            if (!reason.trim()) {
              setReasonError('Say why the job is cancelled.');
              return;
            }
            void move('cancelled', reason.trim());
          }}
        >
          <TextAreaField
            label="Why is this job cancelled?"
            hint="A cancelled job cannot be reopened. The reason is kept in the job's history."
            required
            rows={2}
            maxChars={500}
            value={reason}
            error={reasonError}
            onChange={(e) => {
              setReason(e.target.value);
              setReasonError(undefined);
            }}
          />
          <div className="flex flex-wrap gap-2">
            <Button type="submit" variant="secondary" busy={pending === 'cancelled'} disabled={pending !== null}>
              Cancel job
            </Button>
            <Button type="button" variant="quiet" onClick={() => setCancelling(false)}>
              Keep the job
            </Button>
          </div>
        </form>
      ) : null}
    </div>
  );
}
