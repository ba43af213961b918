import { Dec, MoneyError, formatAmount, minorUnits, parseAmount } from '../money.js';

/**
 * The owner's standing go-ahead, amounts incl. VAT. Either limit may be absent; with neither, no
 * finding is approved on the owner's behalf. `usedSoFar` is what earlier findings on this job have
 * already taken from the per-job limit.
 */
export interface PreAuthorisedLimit {
  perFinding?: string | null;
  perJob?: string | null;
  usedSoFar?: string | null;
}

export type LimitOutcome = 'inside' | 'over-finding-limit' | 'over-job-limit' | 'no-limit';

export interface LimitDecision {
  id: string;
  gross: string;
  inside: boolean;
  outcome: LimitOutcome;
  /** Per-job headroom left after this finding was considered; null without a per-job limit. */
  headroomAfter: string | null;
}

export interface LimitResult {
  decisions: LimitDecision[];
  /** Sum of the findings that fell inside. */
  approvedWithinLimit: string;
  /** Per-job limit minus everything used, including this batch; null without a per-job limit. */
  headroom: string | null;
}

/**
 * Walks the priced findings in the order given (the workshop's order of urgency) and approves each
 * one that fits: its price is at or below the per-finding limit, and adding it keeps the job's
 * running total at or below the per-job limit. A finding that does not fit is skipped and the walk
 * goes on, so a later, smaller finding may still fit. "Up to £150" includes £150 itself
 * [practice: a limit the owner names is a ceiling they accept].
 */
export function decidePreAuthorised(limit: PreAuthorisedLimit, findings: { id: string; gross: string }[], currency: string): LimitResult {
  const dp = minorUnits(currency);
  const perFinding = limit?.perFinding == null ? null : parseAmount(limit.perFinding, currency, 'limit.perFinding');
  const perJob = limit?.perJob == null ? null : parseAmount(limit.perJob, currency, 'limit.perJob');
  let used = limit?.usedSoFar == null ? new Dec(0) : parseAmount(limit.usedSoFar, currency, 'limit.usedSoFar');
  if (!Array.isArray(findings)) throw new MoneyError('invalid_input', 'findings must be an array.', 'findings');
  let approved = new Dec(0);
  const headroomOf = () => (perJob === null ? null : formatAmount(Dec.max(perJob.minus(used), 0), dp));
  const decisions = findings.map((f, i): LimitDecision => {
    if (typeof f?.id !== 'string' || f.id.length === 0) throw new MoneyError('invalid_input', 'an id is required.', `findings[${i}].id`);
    const gross = parseAmount(f.gross, currency, `findings[${i}].gross`);
    let outcome: LimitOutcome;
    if (perFinding === null && perJob === null) outcome = 'no-limit';
    else if (perFinding !== null && gross.greaterThan(perFinding)) outcome = 'over-finding-limit';
    else if (perJob !== null && used.plus(gross).greaterThan(perJob)) outcome = 'over-job-limit';
    else outcome = 'inside';
    if (outcome === 'inside') {
      used = used.plus(gross);
      approved = approved.plus(gross);
    }
    return { id: f.id, gross: formatAmount(gross, dp), inside: outcome === 'inside', outcome, headroomAfter: headroomOf() };
  });
  return { decisions, approvedWithinLimit: formatAmount(approved, dp), headroom: headroomOf() };
}
