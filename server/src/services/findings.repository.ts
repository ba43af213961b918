import type { Transaction } from 'sequelize';
import { assertFindingMove, type FindingState } from '@wingstage/shared';
import { Finding } from '../models/index.js';

/**
 * The one place a finding's state is written. Every move is checked against the finding table
 * (shared/src/states.ts) first; a forbidden one throws `StateMoveError` (409) and nothing is written.
 * Returns the moved findings' numbers in order.
 */
export async function moveFindings(
  jobId: string,
  ids: readonly string[],
  to: FindingState,
  t: Transaction,
  extra: Partial<Pick<Finding, 'withinLimitGross'>> = {},
): Promise<number[]> {
  if (!ids.length) return [];
  const rows = await Finding.findAll({ where: { jobId, id: [...ids] }, transaction: t, lock: t.LOCK.UPDATE, order: [['seq', 'ASC']] });
  for (const f of rows) assertFindingMove(f.state, to);
  for (const f of rows) await f.update({ state: to, ...extra }, { transaction: t });
  return rows.map((f) => f.seq);
}

/** Findings of a job in one state (ids only). */
export async function findingIdsIn(jobId: string, state: FindingState, t?: Transaction): Promise<string[]> {
  return (await Finding.findAll({ where: { jobId, state }, attributes: ['id'], transaction: t })).map((f) => f.id);
}
