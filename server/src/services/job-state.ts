import type { Transaction } from 'sequelize';
import { JOB_STATE_LABELS, assertJobMove, type JobState } from '@wingstage/shared';
import type { Job } from '../models/index.js';
import { recordAudit } from './audit.js';
import type { Scope } from './scope.js';
import { AuditEvent } from '../models/index.js';

/**
 * The one place a job's state is written: checked against the job table first (a forbidden move
 * throws `StateMoveError`, 409, nothing written), then recorded in the history with the reason.
 * `scope` is null for a move the app makes by itself (the owner's decision).
 */
export async function moveJob(scope: Scope | null, job: Job, to: JobState, why: string, t: Transaction): Promise<void> {
  const from: JobState = job.state;
  assertJobMove(from, to);
  await job.update({ state: to }, { transaction: t });
  const summary = `${JOB_STATE_LABELS[from]} → ${JOB_STATE_LABELS[to]}${why ? `: ${why}` : ''}`;
  const detail = { from, to, reason: why };
  if (scope) await recordAudit(scope, t, { jobId: job.id, action: 'job.state_changed', summary, detail });
  else await AuditEvent.create({ workshopId: job.workshopId, jobId: job.id, actorUserId: null, action: 'job.state_changed', summary, detail }, { transaction: t });
}
