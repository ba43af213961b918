import type Stripe from 'stripe';

/** An error in the processor's own shape: `{ error: { type, code, decline_code, message, param } }`. */
export class FakeError extends Error {
  constructor(
    readonly status: number,
    readonly type: 'invalid_request_error' | 'card_error' | 'idempotency_error' | 'authentication_error' | 'api_error',
    message: string,
    readonly extra: { code?: string; decline_code?: string; param?: string; payment_intent?: Stripe.PaymentIntent } = {},
  ) {
    super(message);
  }

  body() {
    return { error: { type: this.type, message: this.message, ...this.extra } };
  }
}

export const missing = (param: string) => new FakeError(400, 'invalid_request_error', `Missing required param: ${param}.`, { code: 'parameter_missing', param });
export const invalid = (param: string, message: string) => new FakeError(400, 'invalid_request_error', message, { code: 'parameter_invalid', param });
export const noSuch = (kind: string, id: string, param = 'id') =>
  new FakeError(404, 'invalid_request_error', `No such ${kind}: '${id}'`, { code: 'resource_missing', param });
export const unexpectedState = (message: string) => new FakeError(400, 'invalid_request_error', message, { code: 'payment_intent_unexpected_state' });
