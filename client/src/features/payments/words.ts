import type { DepositRequestState, PaymentState } from '@wingstage/shared';

/** The owner's words for deposits and card payments: plain, from their side. */
export const OWNER_PAY_WORDS = {
  heading: 'Deposits',
  pay: 'Pay deposit',
  payAgain: 'Try again with another card',
  opening: 'Opening the payment page…',
  asked: (amount: string) => `The workshop asks for a deposit of ${amount}.`,
  forWhat: 'What it is for',
  paidOn: (when: string) => `Paid on ${when}. Thank you.`,
  cancelled: 'The workshop no longer needs this deposit.',
  declined: 'Your card was not accepted',
  declinedHelp: 'No money was taken. You can try again with the same or another card.',
  taken: 'The deposit is taken off your final invoice.',
  state: { waiting: 'Waiting for your payment', paid: 'Paid', cancelled: 'No longer needed' } satisfies Record<DepositRequestState, string>,
  // The return page
  checking: 'Checking your payment with the card company…',
  paidTitle: 'Payment received',
  paidBody: (amount: string) => `We have received ${amount}. A receipt is on its way by e-mail.`,
  notYetTitle: 'We have not received your payment yet',
  notYetBody: 'If you have just paid, it can take a moment to reach us. Check again, or go back to your aircraft and pay from there.',
  closedTitle: 'This payment page closed without a payment',
  closedBody: 'No money was taken. You can open a new payment page from your aircraft page.',
  refundedTitle: 'This deposit had already been paid',
  refundedBody: 'So we are handing this payment back to your card in full. It can take a few days to show on your statement.',
  checkAgain: 'Check again',
  back: 'Back to my aircraft',
  problem: 'We could not check this payment',
} as const;

/** Staff words for deposits on the job, the waiting list and accounts' first page. */
export const STAFF_PAY_WORDS = {
  jobHeading: 'Deposits',
  request: 'Request deposit',
  cancel: 'Cancel deposit',
  cancelConfirm: 'Cancel this deposit? Any open payment page for it is closed.',
  none: 'No deposit has been asked on this job.',
  waitingHeading: 'Deposits waiting',
  waitingLead: 'Deposits asked of owners and not yet paid, oldest first.',
  waitingEmpty: 'No deposit is waiting.',
  accountsHeading: 'Accounts: deposits',
  accountsLead: 'Deposits received by card, with the card fee and what reaches the bank, and deposits still waiting.',
  received: 'Deposits received',
  receivedEmpty: 'No deposit has been received yet.',
  flagged: 'Amount differs from the deposit asked: check it',
  origin: { quote_accepted: 'Asked on the accepted quote', work_approved: 'Asked on approved work', manual: 'Asked by hand' },
  paymentState: { pending: 'Payment page open', succeeded: 'Paid', failed: 'Card declined', cancelled: 'Page closed unpaid', partially_refunded: 'Partly refunded', refunded: 'Refunded' } satisfies Record<PaymentState, string>,
} as const;
