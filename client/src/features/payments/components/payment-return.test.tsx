import type { CheckoutSyncDto, DepositRequestDto, PaymentDto } from '@wingstage/shared';
import { screen } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { json } from '@/testing/http';
import { renderWithApp } from '@/testing/render';
import { PaymentReturn } from './payment-return';

const JOB = '00000000-0000-4000-8000-000000000001';
const payment = (over: Partial<PaymentDto>): PaymentDto => ({
  id: '00000000-0000-4000-8000-0000000000aa',
  jobId: JOB,
  kind: 'deposit',
  method: 'card',
  state: 'pending',
  depositRequestId: '00000000-0000-4000-8000-0000000000dd',
  invoiceId: null,
  currency: 'GBP',
  expectedAmount: '250.00',
  amount: null,
  fee: null,
  net: null,
  refunded: '0.00',
  amountMismatch: false,
  failureMessage: null,
  outcomeNote: null,
  receivedAt: null,
  createdAt: '2026-12-02T10:00:00.000Z',
  ...over,
});
const deposit: DepositRequestDto = { id: '00000000-0000-4000-8000-0000000000dd', jobId: JOB, origin: 'manual', reason: 'Propeller overhaul ordered', amount: '250.00', currency: 'GBP', state: 'waiting', createdAt: '2026-12-02T09:00:00.000Z', paidAt: null, cancelledAt: null, cancelReason: null, version: 0, payments: [], lastDecline: null };

describe('the page the owner comes back to from the payment page', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => vi.stubGlobal('fetch', fetchMock));
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  it('when the server has not received the payment, then it says so and never shows paid, whatever the address says', async () => {
    fetchMock.mockResolvedValue(json({ payment: payment({}), deposit, declined: null } satisfies CheckoutSyncDto));
    renderWithApp(<PaymentReturn jobId={JOB} sessionId="cs_test_abc" />);
    expect(await screen.findByRole('heading', { name: 'We have not received your payment yet' })).toBeTruthy();
    expect(screen.queryByText(/Payment received/)).toBeNull();
    const [url, init] = fetchMock.mock.calls[0]!;
    expect(String(url)).toContain(`/api/jobs/${JOB}/payments/sync`);
    expect(init?.method).toBe('POST');
    expect(JSON.parse(String(init?.body))).toEqual({ sessionId: 'cs_test_abc' });
  });

  it('when the server read the payment back as paid, then the amount received is shown', async () => {
    fetchMock.mockResolvedValue(json({ payment: payment({ state: 'succeeded', amount: '250.00' }), deposit: { ...deposit, state: 'paid' }, declined: null } satisfies CheckoutSyncDto));
    renderWithApp(<PaymentReturn jobId={JOB} sessionId="cs_test_abc" />);
    expect(await screen.findByRole('heading', { name: 'Payment received' })).toBeTruthy();
    expect(screen.getByText('We have received £250.00 incl. VAT. A receipt is on its way by e-mail.')).toBeTruthy();
  });

  it('when the card was declined, then the reason is shown with a way to try again', async () => {
    fetchMock.mockResolvedValue(json({ payment: payment({ state: 'failed', failureMessage: 'Your card has insufficient funds.' }), deposit, declined: 'Your card has insufficient funds.' } satisfies CheckoutSyncDto));
    renderWithApp(<PaymentReturn jobId={JOB} sessionId="cs_test_abc" />);
    expect(await screen.findByText('Your card has insufficient funds.')).toBeTruthy();
    expect(screen.getByRole('button', { name: 'Try again with another card' })).toBeTruthy();
    expect(screen.queryByText(/Payment received/)).toBeNull();
  });
});
