import { describe, expect, it } from 'vitest';
import {
  DEPOSIT_REQUEST_STATES,
  INVOICE_STATES,
  StateMoveError,
  assertDepositRequestMove,
  assertExceptionMove,
  assertInvoiceMove,
  canMoveDepositRequest,
  canMoveInvoice,
} from '../src/states.js';

describe('deposit request state machine', () => {
  it('when a waiting deposit is paid or cancelled, then the move is allowed, and nothing leaves paid or cancelled', () => {
    expect(canMoveDepositRequest('waiting', 'paid')).toEqual({ ok: true });
    expect(canMoveDepositRequest('waiting', 'cancelled')).toEqual({ ok: true });
    for (const from of ['paid', 'cancelled'] as const) {
      for (const to of DEPOSIT_REQUEST_STATES) expect(canMoveDepositRequest(from, to).ok).toBe(false);
    }
  });

  it('when staff try to cancel a paid deposit, then the reason says to refund it instead', () => {
    expect(canMoveDepositRequest('paid', 'cancelled')).toEqual({ ok: false, reason: 'A paid deposit cannot be cancelled: refund it instead, with a credit note.' });
    expect(() => assertDepositRequestMove('paid', 'cancelled')).toThrow(StateMoveError);
  });
});

describe('invoice state machine', () => {
  it('when an issued invoice is paid and later credited in full, then each move is allowed; credited is final', () => {
    expect(canMoveInvoice('issued', 'paid').ok).toBe(true);
    expect(canMoveInvoice('paid', 'credited').ok).toBe(true);
    for (const to of INVOICE_STATES) expect(canMoveInvoice('credited', to).ok).toBe(false);
    expect(() => assertInvoiceMove('credited', 'issued')).toThrow(StateMoveError);
  });
});

describe('exception state machine', () => {
  it('when an exception is resolved, then it stays resolved', () => {
    expect(() => assertExceptionMove('open', 'resolved')).not.toThrow();
    expect(() => assertExceptionMove('resolved', 'open')).toThrow('A resolved exception stays resolved.');
  });
});
