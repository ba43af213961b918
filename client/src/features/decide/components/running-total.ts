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
  /**
   * The findings' own prices add up to more than the request: some share opening-up work that is
   * charged once when they are approved together, so a part-way figure may come out lower.
   */
  sharesOpeningUp: boolean;
  chosen: number;
  of: number;
}

/**
 * Every figure is a sum of the engine's Totals frozen in the snapshot, added with the shared money
 * helpers; nothing is priced again here. When a figure covers every finding of the request (all
 * approved, or none decided yet) the snapshot's own "this request" total is used, because the
 * engine charges shared opening-up work once across the request, while the findings' own prices
 * each carry it.
 */
export function runningTotal(snapshot: ApprovalSnapshot, choices: Choices): RunningTotal {
  const c = snapshot.currency;
  const findings = snapshot.findings;
  const approved = findings.filter((f) => choices[f.findingId] === 'approve');
  const open = findings.filter((f) => choices[f.findingId] === undefined);
  const whole = snapshot.totals.thisRequest.gross;
  // A whole request is the engine's own figure; a part of it is the sum of the findings' own prices.
  const partOf = (part: typeof findings) => (part.length === findings.length && findings.length > 0 ? whole : sumAmounts(part.map((f) => f.price.gross), c));
  const thisRequestAsChosen = partOf(approved);
  return {
    quoted: snapshot.totals.quoted.gross,
    approvedSoFar: snapshot.totals.approvedSoFar.gross,
    thisRequestAsChosen,
    undecided: sumAmounts([partOf(open), snapshot.totals.undecidedElsewhere.gross], c),
    sharesOpeningUp: compareAmounts(sumAmounts(findings.map((f) => f.price.gross), c), whole) > 0,
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
