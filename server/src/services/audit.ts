import type { Transaction } from 'sequelize';
import { AuditEvent } from '../models/index.js';
import type { Scope } from './scope.js';

/** Written inside the caller's transaction: the change and its record commit together or not at all. */
export async function recordAudit(
  scope: Scope,
  t: Transaction,
  e: { jobId?: string | null; action: string; summary: string; detail?: Record<string, unknown> },
): Promise<void> {
  await AuditEvent.create(
    { workshopId: scope.workshopId, jobId: e.jobId ?? null, actorUserId: scope.userId, action: e.action, summary: e.summary, detail: e.detail ?? {} },
    { transaction: t },
  );
}
