import { Op, QueryTypes, type Transaction } from 'sequelize';
import { isoTimestampSql } from '../../db/sql-json.js';
import { APPROVAL_REQUEST_STATES, assertRequestMove, type ApprovalRequestState, type Decision, type JobDecisionsToSee } from '@wingstage/shared';
import { ApprovalRequest, boundSequelize } from '../../models/index.js';

/**
 * The approvals tables reached by SQL (approval_request_findings, approval_decisions,
 * approval_superseded_links) and every write of a request's state. Values from a request are always
 * parameters; only the code's own fixed words (a state, a decision) are written into the SQL.
 */

/** The state of a request still waiting for the owner: the only one reads look for (APPROVAL_REQUEST_STATES[0]). */
export const OPEN_REQUEST: ApprovalRequestState = APPROVAL_REQUEST_STATES[0];

/** The one place a request's state is written: the move is checked against the request table first. */
export async function moveRequest(
  r: ApprovalRequest,
  to: ApprovalRequestState,
  t: Transaction,
  extra: Partial<Pick<ApprovalRequest, 'decidedAt' | 'decidedByName' | 'decidedIp' | 'decidedUserAgent' | 'revokedAt' | 'replacedById'>> = {},
): Promise<void> {
  assertRequestMove(r.state, to);
  await r.update({ state: to, ...extra }, { transaction: t });
}

export async function findingIdsOf(requestIds: string[], t?: Transaction): Promise<Map<string, string[]>> {
  const map = new Map<string, string[]>();
  if (!requestIds.length) return map;
  const rows = await boundSequelize().query<{ request_id: string; finding_id: string }>(
    `SELECT request_id, finding_id FROM approval_request_findings WHERE request_id = ANY($1::uuid[]) ORDER BY position`,
    { bind: [requestIds], type: QueryTypes.SELECT, transaction: t },
  );
  for (const r of rows) map.set(r.request_id, [...(map.get(r.request_id) ?? []), r.finding_id]);
  return map;
}

export async function addRequestFindings(jobId: string, requestId: string, findingIds: string[], t: Transaction): Promise<void> {
  if (!findingIds.length) return;
  await boundSequelize().query(
    `INSERT INTO approval_request_findings (job_id, request_id, finding_id, position) SELECT $1, $2, f, i FROM unnest($3::uuid[]) WITH ORDINALITY AS x(f, i)`,
    { bind: [jobId, requestId, findingIds], transaction: t },
  );
}

export async function insertDecision(
  r: { jobId: string; id: string },
  d: { itemId: string; findingId: string | null; decision: Decision; note: string },
  t: Transaction,
): Promise<void> {
  await boundSequelize().query(`INSERT INTO approval_decisions (job_id, request_id, item_id, finding_id, decision, note) VALUES ($1, $2, $3, $4, $5, $6)`, {
    bind: [r.jobId, r.id, d.itemId, d.findingId, d.decision, d.note],
    transaction: t,
  });
}

/** A request's decisions in the order the owner met the items: the quote first, then findings as sent. */
export async function decisionsOf(requestId: string, t?: Transaction): Promise<{ itemId: string; decision: Decision; note: string }[]> {
  const rows = await boundSequelize().query<{ item_id: string; decision: Decision; note: string }>(
    `SELECT d.item_id, d.decision, d.note FROM approval_decisions d
       LEFT JOIN approval_request_findings f ON f.request_id = d.request_id AND f.finding_id = d.finding_id
      WHERE d.request_id = $1 ORDER BY f.position NULLS FIRST`,
    { bind: [requestId], type: QueryTypes.SELECT, transaction: t },
  );
  return rows.map((r) => ({ itemId: r.item_id, decision: r.decision, note: r.note }));
}

export async function supersedeLink(tokenHash: string, requestId: string, t: Transaction): Promise<void> {
  await boundSequelize().query(`INSERT INTO approval_superseded_links (token_hash, request_id, superseded_at) VALUES ($1, $2, now()) ON CONFLICT DO NOTHING`, {
    bind: [tokenHash, requestId],
    transaction: t,
  });
}

/** The request a superseded link belonged to, and when its newest link was sent; null if the link was never issued. */
export async function bySupersededHash(tokenHash: string, t: Transaction): Promise<{ requestId: string; newestAt: Date } | null> {
  const [row] = await boundSequelize().query<{ request_id: string; newest_at: Date }>(
    `SELECT s.request_id, (SELECT max(x.superseded_at) FROM approval_superseded_links x WHERE x.request_id = s.request_id) AS newest_at
       FROM approval_superseded_links s WHERE s.token_hash = $1`,
    { bind: [tokenHash], type: QueryTypes.SELECT, transaction: t },
  );
  return row ? { requestId: row.request_id, newestAt: new Date(row.newest_at) } : null;
}

/** The owner of a job's aircraft. */
export async function jobOwner(jobId: string, t?: Transaction): Promise<{ name: string; email: string } | null> {
  const [c] = await boundSequelize().query<{ email: string; name: string }>(
    `SELECT c.email, c.name FROM jobs j JOIN aircraft a ON a.id = j.aircraft_id JOIN customers c ON c.id = a.customer_id WHERE j.id = $1`,
    { bind: [jobId], type: QueryTypes.SELECT, transaction: t },
  );
  return c ?? null;
}

/**
 * The quote's two facts as scalar subqueries on a job id expression: the newest open request
 * holding the quote (open_id), and the owner's last word on the quote (decision). Shared by
 * quoteRequestFacts and the one-statement estimate read.
 */
export function quoteFactsSql(jobExpr: string): string {
  return `(SELECT r.id FROM approval_requests r
            WHERE r.job_id = ${jobExpr} AND r.includes_quote AND r.state = '${OPEN_REQUEST}' ORDER BY r.sent_at DESC LIMIT 1) AS open_id,
          (SELECT d.decision FROM approval_decisions d JOIN approval_requests r ON r.id = d.request_id
            WHERE r.job_id = ${jobExpr} AND d.finding_id IS NULL ORDER BY r.decided_at DESC LIMIT 1) AS decision`;
}

/** What the quote's state needs from the requests: the open one holding it, and the owner's last decision on it. */
export async function quoteRequestFacts(jobId: string, t?: Transaction): Promise<{ openRequestId: string | null; lastDecision: Decision | null }> {
  // One round trip: the newest open request holding the quote, and the owner's last word on it.
  const [row] = await boundSequelize().query<{ open_id: string | null; decision: Decision | null }>(`SELECT ${quoteFactsSql('$1')}`, {
    bind: [jobId],
    type: QueryTypes.SELECT,
    transaction: t,
  });
  return { openRequestId: row?.open_id ?? null, lastDecision: row?.decision ?? null };
}

/**
 * Decisions no member of staff has marked seen, per job, in one query for a whole list: how many
 * requests, whether an airworthiness finding was declined or the owner left a note, and when.
 */
export async function decisionsToSee(jobIds: string[]): Promise<Map<string, JobDecisionsToSee>> {
  const map = new Map<string, JobDecisionsToSee>();
  if (!jobIds.length) return map;
  const rows = await boundSequelize().query<{ job_id: string; requests: string; declined_aw: boolean; note: boolean; last_at: Date }>(
    `SELECT r.job_id,
            count(DISTINCT r.id) AS requests,
            bool_or(d.decision = $2 AND f.category = $3) AS declined_aw,
            bool_or(coalesce(d.note, '') <> '') AS note,
            max(r.decided_at) AS last_at
       FROM approval_requests r
       LEFT JOIN approval_decisions d ON d.request_id = r.id
       LEFT JOIN findings f ON f.id = d.finding_id
      WHERE r.job_id = ANY($1::uuid[]) AND r.decided_at IS NOT NULL AND r.seen_at IS NULL
      GROUP BY r.job_id`,
    { bind: [jobIds, 'decline', 'airworthiness'], type: QueryTypes.SELECT },
  );
  for (const r of rows) {
    map.set(r.job_id, { requests: Number(r.requests), declinedAirworthiness: !!r.declined_aw, ownerNote: !!r.note, lastDecidedAt: new Date(r.last_at).toISOString() });
  }
  return map;
}

/**
 * decisionsToSee for one job as a JSON subquery on a job id expression, already in
 * JobDecisionsToSee's shape (lastDecidedAt as toISOString writes it), for a one-statement read:
 * NULL when nothing waits. The same aggregate as decisionsToSee's, kept beside it;
 * reads-one-statement.test.ts compares the two answers.
 */
export function decisionsToSeeSql(jobExpr: string): string {
  return `(SELECT json_build_object('requests', x.requests, 'declinedAirworthiness', coalesce(x.declined_aw, false),
                                   'ownerNote', coalesce(x.note, false), 'lastDecidedAt', ${isoTimestampSql('x.last_at')}) FROM (
      SELECT count(DISTINCT r.id)::int AS requests,
             bool_or(d.decision = 'decline' AND f.category = 'airworthiness') AS declined_aw,
             bool_or(coalesce(d.note, '') <> '') AS note,
             max(r.decided_at) AS last_at
        FROM approval_requests r
        LEFT JOIN approval_decisions d ON d.request_id = r.id
        LEFT JOIN findings f ON f.id = d.finding_id
       WHERE r.job_id = ${jobExpr} AND r.decided_at IS NOT NULL AND r.seen_at IS NULL
      HAVING count(*) > 0) x)`;
}

/** Stamps a job's decided, unseen requests as seen by this user. */
export async function markDecisionsSeen(jobId: string, userId: string, t: Transaction): Promise<number> {
  const [n] = await ApprovalRequest.update({ seenAt: new Date(), seenBy: userId }, { where: { jobId, seenAt: null, decidedAt: { [Op.ne]: null } }, transaction: t });
  return n;
}
