import { Dec, formatAmount, minorUnits, parseAmount, parseDecimal, roundHalfUp } from '../money.js';

const HUNDRED = new Dec(100);

/**
 * The workshop's deposit policy (its settings): no deposit; a percentage of the inspection quote,
 * asked when the owner accepts it; or a percentage of newly approved work, asked when the owner
 * approves work worth more than the threshold (the percentage is of the whole approval). Amounts
 * are decimal strings including VAT; percentages up to two decimals.
 */
export type WorkshopDepositPolicy =
  | { kind: 'none' }
  | { kind: 'quote_percent'; percent: string }
  | { kind: 'approved_work_percent'; percent: string; threshold: string };

export interface DepositAsk {
  applies: boolean;
  /** The value the percentage was taken of (incl. VAT). */
  basis: string;
  /** The deposit to request, rounded half-up to the minor unit; "0.00" when none applies. */
  amount: string;
}

function ask(basis: Dec, percent: string, currency: string): DepositAsk {
  const dp = minorUnits(currency);
  const amount = roundHalfUp(basis.times(parseDecimal(percent, 'policy.percent')).dividedBy(HUNDRED), dp);
  return { applies: amount.greaterThan(0), basis: formatAmount(basis, dp), amount: formatAmount(amount, dp) };
}

const none = (basis: Dec, currency: string): DepositAsk => {
  const dp = minorUnits(currency);
  return { applies: false, basis: formatAmount(basis, dp), amount: formatAmount(new Dec(0), dp) };
};

/** The deposit to ask when the owner accepts the inspection quote of `quotedGross` (estimate.quoted.gross). */
export function depositOnQuoteAccepted(quotedGross: string, currency: string, policy: WorkshopDepositPolicy): DepositAsk {
  const basis = parseAmount(quotedGross, currency, 'quotedGross');
  if (policy.kind !== 'quote_percent') return none(basis, currency);
  return ask(basis, policy.percent, currency);
}

/** The deposit to ask when the owner approves work worth `approvedGross` in one decision. */
export function depositOnWorkApproved(approvedGross: string, currency: string, policy: WorkshopDepositPolicy): DepositAsk {
  const basis = parseAmount(approvedGross, currency, 'approvedGross');
  if (policy.kind !== 'approved_work_percent') return none(basis, currency);
  if (!basis.greaterThan(parseAmount(policy.threshold, currency, 'policy.threshold'))) return none(basis, currency);
  return ask(basis, policy.percent, currency);
}
