import { compareAmounts, FINDING_CATEGORY_LABELS, sumAmounts, type ApprovalSnapshot, type Decision } from '@wingstage/shared';

export type Choices = Record<string, Decision | undefined>;

export interface RunningTotal {
  quoted: string;
  approvedSoFar: string;
  /** This request, counting only what the owner has chosen to approve. */
  thisRequestAsChosen: string;
  /** Findings of this request without a choice yet, plus discovered work awaiting a decision elsewhere. */
  undecided: string;
  /** Approved so far plus this request as chosen: what the bill would come to. */
  newTotal: string;
  chosen: number;
  of: number;
}

/**
 * Every figure is a sum of the engine's Totals frozen in the snapshot, added with the shared money
 * helpers; nothing is priced again here. When every finding is approved the snapshot's own
 * "this request" total is used, because the engine charges shared opening-up work once across the
 * request, while the findings' own prices each carry it.
 */
export function runningTotal(snapshot: ApprovalSnapshot, choices: Choices): RunningTotal {
  const c = snapshot.currency;
  const findings = snapshot.findings;
  const approved = findings.filter((f) => choices[f.findingId] === 'approve');
  const open = findings.filter((f) => choices[f.findingId] === undefined);
  const thisRequestAsChosen =
    approved.length === findings.length && findings.length > 0 ? snapshot.totals.thisRequest.gross : sumAmounts(approved.map((f) => f.price.gross), c);
  return {
    quoted: snapshot.totals.quoted.gross,
    approvedSoFar: snapshot.totals.approvedSoFar.gross,
    thisRequestAsChosen,
    undecided: sumAmounts([...open.map((f) => f.price.gross), snapshot.totals.undecidedElsewhere.gross], c),
    newTotal: sumAmounts([snapshot.totals.approvedSoFar.gross, thisRequestAsChosen], c),
    chosen: findings.length - open.length,
    of: findings.length,
  };
}

/**
 * The product brief: a declined airworthiness defect is still a defect. Said plainly, and always
 * deferring to the inspector.
 */
export function declinedAirworthinessWords(registration: string): string {
  return `You have declined an ${FINDING_CATEGORY_LABELS.airworthiness.toLowerCase()} item. ${registration} cannot be released to fly while it is open. The inspector decides what the aircraft needs before release, and we will talk it through with you.`;
}

/** The access-labour saving, in words, or null when there is none. */
export function accessSavingWords(f: ApprovalSnapshot['findings'][number], formatted: string): string | null {
  if (f.accessCovered.length === 0 || compareAmounts(f.accessSavingGross, '0') <= 0) return null;
  const tasks = f.accessCovered.map((t) => `“${t}”`).join(' and ');
  return `The opening-up work (${tasks}) is already being done for other work, so it is not charged again here. That saves you ${formatted}.`;
}
