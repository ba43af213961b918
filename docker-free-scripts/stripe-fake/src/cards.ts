/**
 * The processor's documented test cards (handbook sources, "Card payments" — Stripe docs "Testing"),
 * and the test payment-method ids that stand for them in API calls.
 */
export interface CardOutcome {
  last4: string;
  brand: string;
  /** null: the payment succeeds. */
  decline: { code: string; declineCode: string | null; message: string } | null;
}

const DECLINES = {
  generic: { code: 'card_declined', declineCode: 'generic_decline', message: 'Your card was declined.' },
  funds: { code: 'card_declined', declineCode: 'insufficient_funds', message: 'Your card has insufficient funds.' },
  expired: { code: 'expired_card', declineCode: 'expired_card', message: 'Your card has expired.' },
  cvc: { code: 'incorrect_cvc', declineCode: 'incorrect_cvc', message: "Your card's security code is incorrect." },
  authentication: {
    code: 'authentication_required',
    declineCode: 'authentication_required',
    message: 'Your card needs you to confirm this payment with your bank. The test payment page does not simulate that step.',
  },
};

export const TEST_CARDS: Record<string, CardOutcome & { label: string }> = {
  '4242424242424242': { last4: '4242', brand: 'visa', decline: null, label: 'succeeds' },
  '4000000000000002': { last4: '0002', brand: 'visa', decline: DECLINES.generic, label: 'declined' },
  '4000000000009995': { last4: '9995', brand: 'visa', decline: DECLINES.funds, label: 'declined: insufficient funds' },
  '4000000000000069': { last4: '0069', brand: 'visa', decline: DECLINES.expired, label: 'declined: expired card' },
  '4000000000000127': { last4: '0127', brand: 'visa', decline: DECLINES.cvc, label: 'declined: incorrect security code' },
  '4000002760003184': { last4: '3184', brand: 'visa', decline: DECLINES.authentication, label: 'always asks for authentication' },
};

/** Test payment-method ids for server-side confirms, as the processor names them. */
export const TEST_PAYMENT_METHODS: Record<string, string> = {
  pm_card_visa: '4242424242424242',
  pm_card_chargeDeclined: '4000000000000002',
  pm_card_chargeDeclinedInsufficientFunds: '4000000000009995',
  pm_card_chargeDeclinedExpiredCard: '4000000000000069',
  pm_card_chargeDeclinedIncorrectCvc: '4000000000000127',
  pm_card_authenticationRequired: '4000002760003184',
};

export function cardFor(number: string): CardOutcome | null {
  return TEST_CARDS[number.replace(/[\s-]/g, '')] ?? null;
}
