import type { QueryInterface } from 'sequelize';
import { QueryTypes } from 'sequelize';

type Ctx = { context: QueryInterface };

/*
 * The quote goes to the owner. An inspection line counts as agreed only with a record of how:
 * online through a request (owner_link, the request's id in agreed_ref), by phone (who, when), or
 * recorded before owners agreed quotes online (set here, once, for jobs already in work or later).
 * Requests can hold the quote as the item "quote"; decisions are per item; staff mark decisions seen.
 *
 * Stored snapshots are converted once to version 3. `snapshot_hash` stays the hash of what the owner
 * saw: that document moves to `snapshot_as_sent`, and `snapshot` holds the converted one. The
 * conversion is written out here with its own literal logic and never changes afterwards.
 */

// Literal values of this migration (not imported: a migration must mean the same thing forever).
const AGREED_HOW = ['owner_link', 'phone', 'recorded_before'];
const WORK_STARTED = ['in_work', 'ready_for_release', 'invoiced', 'paid', 'closed'];
const QUOTE = 'quote';

const list = (values: readonly string[]) => values.map((v) => `'${v}'`).join(', ');

interface OldLine {
  description: string;
  kind: string;
  quantity: string;
  net: string;
  vatRate?: string;
  accessTaskId?: string | null;
}
interface OldTotals {
  net: string;
  vat: string;
  gross: string;
  byRate: unknown[];
}
interface OldSnapshot {
  version?: number;
  currency: string;
  rounding: string;
  findings: (Record<string, unknown> & { findingId: string; lines: OldLine[]; price: OldTotals; photos?: unknown[] })[];
  pricingBasis?: {
    vatRates: { standard: string; reduced: string; zero: string };
    accessTasks: { id: string; name: string; net: string; vatRate: string }[];
    accessPaid: string[];
    committed?: { lines: { kind: string; net: string; vatRate: string; accessTaskId: string | null }[]; accessTasks: { id: string; net: string; vatRate: string }[] };
  };
  totals: { quoted: OldTotals; approvedSoFar: OldTotals; thisRequest: OldTotals };
  [k: string]: unknown;
}

/** Pence arithmetic on 2-dp strings (no float): the old figures are whole pence. */
function pence(s: string): bigint {
  const neg = s.startsWith('-');
  const [i, f = ''] = (neg ? s.slice(1) : s).split('.');
  const v = BigInt(i || '0') * 100n + BigInt((f + '00').slice(0, 2));
  return neg ? -v : v;
}
function fromPence(p: bigint): string {
  const neg = p < 0n;
  const a = neg ? -p : p;
  return `${neg ? '-' : ''}${a / 100n}.${String(a % 100n).padStart(2, '0')}`;
}
const add = (a: string, b: string) => fromPence(pence(a) + pence(b));

/**
 * Version 3 from an older snapshot. The basis is built from what the old one carried (its lines'
 * nets are the engine's, its opening-up and committed work as recorded); a snapshot sent before the
 * committed work was recorded gets an empty committed list, so live figures count from nothing
 * agreed. The stored totals keep the figures the owner saw at sending.
 */
export function convertSnapshot(old: OldSnapshot): Record<string, unknown> {
  if (old.version === 3) return old;
  const basisIn = old.pricingBasis;
  const vatRates = basisIn?.vatRates ?? { standard: '20', reduced: '5', zero: '0' };
  const paid = new Set(basisIn?.accessPaid ?? []);
  const committedTasks = new Map((basisIn?.committed?.accessTasks ?? []).map((t) => [t.id, { id: t.id, net: t.net, vatRate: t.vatRate }]));
  for (const t of basisIn?.accessTasks ?? []) if (paid.has(t.id) && !committedTasks.has(t.id)) committedTasks.set(t.id, { id: t.id, net: t.net, vatRate: t.vatRate });
  const committedLines = (basisIn?.committed?.lines ?? []).map((l) => ({ kind: l.kind, net: l.net, vatRate: l.vatRate, accessTaskId: l.accessTaskId ?? null }));
  // A task paid by committed work but with no committed line recorded: a nil line keeps it paid there.
  for (const id of committedTasks.keys()) {
    if (!committedLines.some((l) => l.accessTaskId === id)) committedLines.push({ kind: 'fee', net: '0.00', vatRate: committedTasks.get(id)!.vatRate, accessTaskId: id });
  }
  const line = (l: OldLine) => ({ description: l.description, kind: l.kind, quantity: l.quantity, net: l.net, vatRate: l.vatRate ?? 'standard', accessTaskId: l.accessTaskId ?? null });
  const neededBy = (taskId: string) => old.findings.filter((f) => f.lines.some((l) => l.accessTaskId === taskId)).map((f) => f.findingId);
  const openingUp = (basisIn?.accessTasks ?? []).filter((t) => !paid.has(t.id));
  const { pricingBasis: _b, totals, findings, ...rest } = old;
  const agreedSoFar = totals.approvedSoFar;
  return {
    ...rest,
    version: 3,
    basis: {
      currency: old.currency,
      rounding: old.rounding,
      vatRates,
      committed: { lines: committedLines, accessTasks: [...committedTasks.values()] },
      items: findings.map((f) => ({ id: f.findingId, kind: 'finding', lines: f.lines.map((l) => ({ kind: l.kind, net: l.net, vatRate: l.vatRate ?? 'standard', accessTaskId: l.accessTaskId ?? null })) })),
      accessTasks: openingUp.map((t) => ({ id: t.id, name: t.name, net: t.net, vatRate: t.vatRate })),
    },
    quote: null,
    findings: findings.map((f) => {
      const { price, accessCovered: _c, accessSavingGross: _s, ...keep } = f;
      return { ...keep, photos: f.photos ?? [], lines: f.lines.map(line), gross: price.gross };
    }),
    totals: {
      quoted: totals.quoted,
      agreedSoFar,
      ifAllApproved: { ...totals.thisRequest, net: add(agreedSoFar.net, totals.thisRequest.net), vat: add(agreedSoFar.vat, totals.thisRequest.vat), gross: add(agreedSoFar.gross, totals.thisRequest.gross), byRate: [] },
      approvingNow: { net: totals.thisRequest.net, vat: totals.thisRequest.vat, gross: totals.thisRequest.gross },
      openingUp: openingUp.map((t) => ({ id: t.id, name: t.name, gross: '0.00', neededBy: neededBy(t.id) })),
    },
  };
}

export async function up({ context }: Ctx): Promise<void> {
  const q = (sql: string, bind?: unknown[]) => context.sequelize.query(sql, bind ? { bind } : undefined);
  await q(`
    ALTER TABLE estimate_lines
      ADD COLUMN agreed_at timestamptz,
      ADD COLUMN agreed_how text CHECK (agreed_how IN (${list(AGREED_HOW)})),
      ADD COLUMN agreed_by text,
      ADD COLUMN agreed_ref uuid,
      ADD CONSTRAINT estimate_lines_agreed_check CHECK ((agreed_at IS NULL) = (agreed_how IS NULL))`);
  await q(`
    ALTER TABLE approval_requests
      ADD COLUMN includes_quote boolean NOT NULL DEFAULT false,
      ADD COLUMN seen_at timestamptz,
      ADD COLUMN seen_by uuid REFERENCES users(id) ON DELETE SET NULL,
      ADD COLUMN snapshot_as_sent jsonb`);
  await q(`CREATE INDEX approval_requests_unseen_idx ON approval_requests (job_id) WHERE decided_at IS NOT NULL AND seen_at IS NULL`);

  // Decisions per item: a finding, or the quote.
  await q(`ALTER TABLE approval_decisions ADD COLUMN item_id text`);
  await q(`UPDATE approval_decisions SET item_id = finding_id::text`);
  await q(`ALTER TABLE approval_decisions DROP CONSTRAINT approval_decisions_pkey`);
  await q(`
    ALTER TABLE approval_decisions
      ALTER COLUMN item_id SET NOT NULL,
      ALTER COLUMN finding_id DROP NOT NULL,
      ADD PRIMARY KEY (request_id, item_id),
      ADD CONSTRAINT approval_decisions_item_check CHECK (
        (item_id = '${QUOTE}' AND finding_id IS NULL) OR (finding_id IS NOT NULL AND item_id = finding_id::text))`);

  // Quotes of jobs already in work or later were agreed before online agreement existed.
  const started = await context.sequelize.query<{ job_id: string; workshop_id: string; n: string }>(
    `UPDATE estimate_lines l SET agreed_at = now(), agreed_how = 'recorded_before'
       FROM jobs j WHERE j.id = l.job_id AND l.stage = 'inspection' AND j.state IN (${list(WORK_STARTED)})
     RETURNING l.job_id, l.workshop_id, '1' AS n`,
    { type: QueryTypes.SELECT },
  );
  const jobs = new Map(started.map((r) => [r.job_id, r.workshop_id]));
  for (const [jobId, workshopId] of jobs) {
    await q(
      `INSERT INTO audit_events (workshop_id, job_id, actor_user_id, action, summary, detail) VALUES ($1, $2, NULL, 'estimate.quote_agreed', $3, $4)`,
      [workshopId, jobId, 'Quote counted as agreed: recorded before owners agreed quotes online', JSON.stringify({ how: 'recorded_before' })],
    );
  }

  const rows = await context.sequelize.query<{ id: string; snapshot: OldSnapshot }>(`SELECT id, snapshot FROM approval_requests`, { type: QueryTypes.SELECT });
  for (const r of rows) {
    if (r.snapshot.version === 3) continue;
    await q(`UPDATE approval_requests SET snapshot_as_sent = snapshot, snapshot = $2 WHERE id = $1`, [r.id, JSON.stringify(convertSnapshot(r.snapshot))]);
  }
}

export async function down({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  await q(`UPDATE approval_requests SET snapshot = snapshot_as_sent WHERE snapshot_as_sent IS NOT NULL`);
  await q(`DELETE FROM approval_decisions WHERE finding_id IS NULL`);
  await q(`ALTER TABLE approval_decisions DROP CONSTRAINT approval_decisions_item_check, DROP CONSTRAINT approval_decisions_pkey`);
  await q(`ALTER TABLE approval_decisions ALTER COLUMN finding_id SET NOT NULL, ADD PRIMARY KEY (request_id, finding_id), DROP COLUMN item_id`);
  await q(`DROP INDEX IF EXISTS approval_requests_unseen_idx`);
  await q(`ALTER TABLE approval_requests DROP COLUMN includes_quote, DROP COLUMN seen_at, DROP COLUMN seen_by, DROP COLUMN snapshot_as_sent`);
  await q(`ALTER TABLE estimate_lines DROP CONSTRAINT estimate_lines_agreed_check, DROP COLUMN agreed_at, DROP COLUMN agreed_how, DROP COLUMN agreed_by, DROP COLUMN agreed_ref`);
}
