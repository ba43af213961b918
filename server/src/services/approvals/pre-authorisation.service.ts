import { QueryTypes, type Transaction } from 'sequelize';
import type { z } from 'zod';
import { Dec, formatMoney, decidePreAuthorised, formatAmount, minorUnits, type PreAuthorisationDto, type preAuthorisationSchema } from '@wingstage/shared';
import { staleVersion } from '../../errors/app-error.js';
import { boundSequelize, type Job } from '../../models/index.js';
import { recordAudit } from '../audit.js';
import { findJob } from '../job-access.js';
import { loadWorkshop } from '../pricing.js';
import { requireStaff, type Scope } from '../scope.js';
import { inTransaction } from '../../db/transaction.js';

type PreAuthInput = z.output<typeof preAuthorisationSchema>;


/** Gross already approved within the limit on this job. Pre-authorisation covers findings only, never the quote. */
export async function usedSoFar(jobId: string, t?: Transaction): Promise<string> {
  const [row] = await boundSequelize().query<{ used: string | null }>(
    `SELECT COALESCE(SUM(within_limit_gross), 0)::numeric(14,2)::text AS used FROM findings WHERE job_id = $1 AND state = $2`,
    { bind: [jobId, 'approved_within_limit'], type: QueryTypes.SELECT, transaction: t },
  );
  return row?.used ?? '0.00';
}

function preAuthDto(job: Job, currency: string, used: string): PreAuthorisationDto {
  // The engine works out the headroom, so this file carries no money formula of its own.
  const limit = decidePreAuthorised({ perFinding: job.preAuthPerFinding, perJob: job.preAuthPerJob, usedSoFar: used }, [], currency);
  return { perFinding: job.preAuthPerFinding ?? null, perJob: job.preAuthPerJob ?? null, agreedHow: job.preAuthAgreedHow ?? '', usedSoFar: used, headroom: limit.headroom };
}

export async function getPreAuthorisation(scope: Scope, jobId: string): Promise<PreAuthorisationDto> {
  const job = await findJob(scope, jobId);
  const w = await loadWorkshop(scope);
  return preAuthDto(job, w.currency, await usedSoFar(job.id));
}

export async function putPreAuthorisation(scope: Scope, jobId: string, input: PreAuthInput): Promise<PreAuthorisationDto & { version: number }> {
  requireStaff(scope);
  return inTransaction(async (t) => {
    const job = await findJob(scope, jobId, t, true);
    if (job.version !== input.version) throw staleVersion();
    const w = await loadWorkshop(scope, t);
    const fmt = (v: string | null) => (v === null ? null : formatAmount(new Dec(v), minorUnits(w.currency)));
    await job.update({ preAuthPerFinding: fmt(input.perFinding), preAuthPerJob: fmt(input.perJob), preAuthAgreedHow: input.agreedHow }, { transaction: t });
    const describe = (v: string | null) => (v === null ? 'none' : formatMoney(v, w.currency));
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'job.pre_authorisation_set',
      summary: `Standing go-ahead (pre-authorised limit): per finding ${describe(fmt(input.perFinding))}, per job ${describe(fmt(input.perJob))} incl. VAT${input.agreedHow ? ` (${input.agreedHow})` : ''}`,
      detail: { perFinding: fmt(input.perFinding), perJob: fmt(input.perJob), agreedHow: input.agreedHow },
    });
    return { ...preAuthDto(job, w.currency, await usedSoFar(job.id, t)), version: job.version };
  });
}
