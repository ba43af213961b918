import { randomInt } from 'node:crypto';

const BASE62 = '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz';

/** A random base62 string from the OS's CSPRNG (ids must not be guessable: a session id is a payment link). */
export function base62(length: number): string {
  let out = '';
  for (let i = 0; i < length; i += 1) out += BASE62[randomInt(62)];
  return out;
}

/** The prefixes the processor gives its objects, so code that checks an id's kind works unchanged. */
export const PREFIX = {
  customer: 'cus_',
  checkoutSession: 'cs_test_',
  paymentIntent: 'pi_',
  paymentMethod: 'pm_',
  charge: 'ch_',
  refund: 're_',
  balanceTransaction: 'txn_',
  payout: 'po_',
  event: 'evt_',
  request: 'req_',
  lineItem: 'li_',
  price: 'price_',
  product: 'prod_',
  delivery: 'whd_',
} as const;

export function newId(prefix: string): string {
  return prefix + base62(prefix === PREFIX.checkoutSession ? 58 : 24);
}
