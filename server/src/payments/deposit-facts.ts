import { QueryTypes, type Transaction } from 'sequelize';
import type { DepositMailFacts } from '../mail/deposit-mails.js';
import { boundSequelize, type DepositRequest } from '../models/index.js';
import type { Deps } from '../services/deps.js';

/** The owner's page for one job, where "Pay deposit" is. */
export const ownerJobLink = (deps: Deps, jobId: string) => `${deps.config.APP_URL.replace(/\/$/, '')}/my-aircraft?job=${jobId}`;

/** What a deposit e-mail says, read in the caller's transaction; null when the job's owner has no e-mail. */
export async function depositMailFacts(deps: Deps, d: DepositRequest, t: Transaction): Promise<DepositMailFacts | null> {
  const [row] = await boundSequelize().query<{ email: string | null; name: string; workshopName: string; registration: string; number: string }>(
    `SELECT c.email, c.name, w.name AS "workshopName", a.registration, j.number
       FROM jobs j JOIN aircraft a ON a.id = j.aircraft_id JOIN customers c ON c.id = a.customer_id JOIN workshops w ON w.id = j.workshop_id
      WHERE j.id = $1`,
    { bind: [d.jobId], type: QueryTypes.SELECT, transaction: t },
  );
  if (!row?.email) return null;
  return {
    to: row.email,
    ownerName: row.name,
    workshopName: row.workshopName,
    registration: row.registration,
    jobNumber: row.number,
    reason: d.reason,
    amount: d.amount,
    currency: d.currency,
    link: ownerJobLink(deps, d.jobId),
  };
}
