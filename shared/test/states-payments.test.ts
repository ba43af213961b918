import { describe, expect, it } from 'vitest';
import { PAYMENT_STATES, PAYMENT_STATE_LABELS, StateMoveError, assertPaymentMove, canMovePayment, isTerminalPaymentState, type PaymentState } from '../src/states.js';

describe('payment state machine', () => {
  it('when a card payment is taken and then refunded in two parts, then every step is allowed', () => {
    const path: PaymentState[] = ['pending', 'succeeded', 'partially_refunded', 'refunded'];
    for (let i = 0; i < path.length - 1; i++) expect(canMovePayment(path[i]!, path[i + 1]!)).toEqual({ ok: true });
    expect(canMovePayment('succeeded', 'refunded')).toEqual({ ok: true });
  });

  it('when a card is declined, then the payer may try again, and a late success still lands', () => {
    expect(canMovePayment('pending', 'failed').ok).toBe(true);
    expect(canMovePayment('failed', 'pending').ok).toBe(true);
    expect(canMovePayment('failed', 'succeeded').ok).toBe(true);
  });

  it('when a payment has succeeded, then it cannot fail, be cancelled or go back to pending', () => {
    for (const to of ['failed', 'cancelled', 'pending'] as PaymentState[]) {
      expect(canMovePayment('succeeded', to)).toEqual({ ok: false, reason: `A payment that is paid cannot become ${PAYMENT_STATE_LABELS[to].toLowerCase()}.` });
    }
  });

  it('when refunded or cancelled, then it is terminal; every other state is not', () => {
    for (const s of PAYMENT_STATES) expect(isTerminalPaymentState(s)).toBe(s === 'refunded' || s === 'cancelled');
  });

  it('when a move is asked to the state it is in, then it is refused as already there', () => {
    for (const s of PAYMENT_STATES) {
      const r = canMovePayment(s, s);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.reason).toMatch(/already/);
    }
  });

  it('when assertPaymentMove meets a forbidden move, then it throws with both states and the reason', () => {
    expect(() => assertPaymentMove('pending', 'succeeded')).not.toThrow();
    const err = (() => {
      try {
        assertPaymentMove('refunded', 'succeeded');
      } catch (e) {
        return e;
      }
    })();
    expect(err).toBeInstanceOf(StateMoveError);
    expect(err).toMatchObject({ from: 'refunded', to: 'succeeded', message: 'A payment that is refunded cannot become paid.' });
  });
});
