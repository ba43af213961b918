/**
 * The processing fee on a card payment, in integer minor units: a percentage (in basis points) of
 * the amount, rounded half-up to a whole minor unit, plus a fixed part. No float touches the amount.
 */
export interface FeeSchedule {
  /** 150 = 1.5 %. */
  percentBasisPoints: number;
  /** In minor units: 20 = 20p. */
  fixed: number;
}

/** The UK standard card fee, 1.5 % + 20p (see the handbook's sources, "Card payments"). */
export const UK_STANDARD_CARD_FEE: FeeSchedule = { percentBasisPoints: 150, fixed: 20 };

export function cardFee(amount: number, schedule: FeeSchedule = UK_STANDARD_CARD_FEE): number {
  if (!Number.isSafeInteger(amount) || amount < 0) throw new RangeError(`amount must be a whole number of minor units, not ${amount}`);
  // Half-up on a non-negative integer ratio: floor((a·bp + 5000) / 10000), all in integers.
  const percent = Math.floor((amount * schedule.percentBasisPoints + 5000) / 10000);
  return percent + schedule.fixed;
}
