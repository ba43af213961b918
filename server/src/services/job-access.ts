import type { Includeable, Transaction } from 'sequelize';
import { notFound } from '../errors/app-error.js';
import { Aircraft, Customer, Job } from '../models/index.js';
import { inWorkshop, ownedRows, type Scope } from './scope.js';

export type JobRow = Job & { aircraft: Aircraft & { customer: Customer } };

/** Jobs reach owners through their aircraft: the owner filter rides on the required join. */
export function scopedInclude(scope: Scope): Includeable[] {
  return [
    {
      model: Aircraft,
      as: 'aircraft',
      required: true,
      attributes: ['id', 'registration', 'type', 'customerId'],
      where: ownedRows(scope, 'customerId'),
      include: [{ model: Customer, as: 'customer', required: true, attributes: ['id', 'name'] }],
    },
  ];
}

/**
 * The one way to reach a job: in the caller's workshop and, for an owner, through their own
 * aircraft. Everything that hangs off a job (estimate, checklist, findings, time) comes through here.
 */
export async function findJob(scope: Scope, id: string, t?: Transaction, lock = false): Promise<JobRow> {
  const job = await Job.findOne({
    where: inWorkshop(scope, { id }),
    include: scopedInclude(scope),
    transaction: t,
    // Lock only the job row; the joined rows are read, not changed.
    lock: lock && t ? { level: t.LOCK.UPDATE, of: Job } : undefined,
  });
  if (!job) throw notFound('That job');
  return job as JobRow;
}

/** The job's own columns with its aircraft and owner, for reads that only show it. */
export type JobView = Pick<
  Job,
  'id' | 'number' | 'aircraftId' | 'title' | 'type' | 'state' | 'bookedInOn' | 'dueOn' | 'notes' | 'version' | 'createdAt' | 'updatedAt'
> & { aircraft: Pick<Aircraft, 'registration' | 'type' | 'customerId'> & { customer: Pick<Customer, 'name'> } };

/**
 * findJob's access rule as a plain row (raw, nested): no model instances are built for a read that
 * only shows the job. Anything that changes the job uses findJob.
 */
export async function viewJob(scope: Scope, id: string): Promise<JobView> {
  const job = await Job.findOne({ where: inWorkshop(scope, { id }), include: scopedInclude(scope), raw: true, nest: true });
  if (!job) throw notFound('That job');
  return job as unknown as JobView;
}
