import {
  FINDING_CATEGORY_LABELS,
  priceChoice,
  type ApprovalSnapshot,
  type Decision,
  type PricedChoice,
} from '@wingstage/shared';

export type Choices = Record<string, Decision | undefined>;

/**
 * The running total the owner's page shows, read straight from `priceChoice` (shared): no figure
 * is worked here. Kept as a small adapter while the page moves onto `PricedChoice` itself.
 */
export interface RunningTotal {
  quoted: string;
  /** Agreed before this request. */
  approvedSoFar: string;
  /** What this choice approves: the approved items plus the opening-up they need, charged once. */
  thisRequestAsChosen: string;
  /** What the items without a choice would add if approved. */
  undecided: string;
  /** The estimate's committed total once this choice is recorded. */
  newTotal: string;
  /** newTotal − approvedSoFar (the same as thisRequestAsChosen: the figures add up). */
  addsToTotal: string;
  wholeInvoice: true;
  exact: true;
  sharesOpeningUp: boolean;
  sharedSaving: null;
  chosen: number;
  of: number;
  priced: PricedChoice;
}

/** Only the request's own items: a choice kept for anything else is ignored. */
function own(snapshot: ApprovalSnapshot, choices: Choices): Choices {
  const ids = new Set(snapshot.basis.items.map((i) => i.id));
  return Object.fromEntries(Object.entries(choices).filter(([k]) => ids.has(k)));
}

export function runningTotal(snapshot: ApprovalSnapshot, choices: Choices): RunningTotal {
  const p = priceChoice(snapshot.basis, own(snapshot, choices));
  return {
    quoted: snapshot.totals.quoted.gross,
    approvedSoFar: p.agreedSoFar.gross,
    thisRequestAsChosen: p.approvingNow.gross,
    undecided: p.undecidedGross,
    newTotal: p.newTotal.gross,
    addsToTotal: p.approvingNow.gross,
    wholeInvoice: true,
    exact: true,
    sharesOpeningUp: p.openingUp.length > 0,
    sharedSaving: null,
    chosen: p.chosen,
    of: p.of,
    priced: p,
  };
}

/** What approving this item adds alongside the owner's other choices (its share, excl. opening-up shown on its own line). */
export function addsWithChoices(snapshot: ApprovalSnapshot, choices: Choices, itemId: string): string | null {
  const p = priceChoice(snapshot.basis, { ...own(snapshot, choices), [itemId]: 'approve' });
  return p.items.find((i) => i.id === itemId)?.gross ?? null;
}

/**
 * The product brief: a declined airworthiness defect is still a defect. Said plainly, and always
 * deferring to the inspector.
 */
export function declinedAirworthinessWords(registration: string): string {
  return `You have declined an ${FINDING_CATEGORY_LABELS.airworthiness.toLowerCase()} item. ${registration} cannot be released to fly while it is open. The inspector decides what the aircraft needs before release, and we will talk it through with you.`;
}
