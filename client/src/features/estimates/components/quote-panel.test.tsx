import type { EstimateDto } from '@wingstage/shared';
import { fireEvent, screen, waitFor } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { TEST_JOB_ID } from '@/testing/fixtures';
import { renderWithApp } from '@/testing/render';
import { isoFromLocalInput, localDateTimeInput, QuotePanel } from './quote-panel';

const PRICED = { currency: 'GBP' } as EstimateDto['priced'];
const estimate = (quote: Partial<EstimateDto['quote']> = {}): EstimateDto => ({
  jobId: TEST_JOB_ID,
  version: 4,
  currency: 'GBP',
  lines: [],
  accessTasks: [],
  priced: PRICED,
  quote: { state: 'not_sent', awaitingGross: '446.40', agreedBy: null, agreedAt: null, agreedHow: null, openRequestId: null, ...quote },
});

describe('QuotePanel', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => vi.stubGlobal('fetch', fetchMock));
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  it('when the quote has not been sent, then its state reads in words with an icon and both ways of agreeing it are offered', () => {
    const onSendQuote = vi.fn();
    renderWithApp(<QuotePanel jobId={TEST_JOB_ID} estimate={estimate()} canAct onSendQuote={onSendQuote} />);
    const badge = screen.getByText('Quote not sent');
    expect(badge.closest('[data-quote-state]')!.querySelector('svg')).not.toBeNull();
    expect(screen.getByText('£446.40 incl. VAT')).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Send quote to owner' }));
    expect(onSendQuote).toHaveBeenCalled();
    expect(screen.getByRole('button', { name: 'Record agreement by phone' })).toBeTruthy();
  });

  it('when the quote was agreed by phone, then who, how and when are shown and nothing is offered', () => {
    renderWithApp(
      <QuotePanel jobId={TEST_JOB_ID} estimate={estimate({ state: 'agreed', awaitingGross: '0.00', agreedBy: 'Elspeth Marlow', agreedAt: '2026-11-30T09:15:00Z', agreedHow: 'phone' })} canAct onSendQuote={vi.fn()} />,
    );
    expect(screen.getByText('Quote agreed')).toBeTruthy();
    expect(screen.getByText(/^Elspeth Marlow, by phone, recorded by the workshop, 30 Nov 2026/)).toBeTruthy();
    expect(screen.queryAllByRole('button')).toHaveLength(0);
  });

  it('when the quote is with the owner, then it says so and offers no second send', () => {
    renderWithApp(<QuotePanel jobId={TEST_JOB_ID} estimate={estimate({ state: 'sent', openRequestId: 'r1' })} canAct onSendQuote={vi.fn()} />);
    expect(screen.getByText('Quote sent, waiting for the owner')).toBeTruthy();
    expect(screen.queryByRole('button', { name: 'Send quote to owner' })).toBeNull();
  });

  it('when the phone form is sent empty or for a future time, then the shared schema’s messages show and nothing is posted', async () => {
    renderWithApp(<QuotePanel jobId={TEST_JOB_ID} estimate={estimate()} canAct onSendQuote={vi.fn()} />);
    fireEvent.click(screen.getByRole('button', { name: 'Record agreement by phone' }));
    fireEvent.change(screen.getByLabelText(/^When/), { target: { value: localDateTimeInput(new Date(Date.now() + 3 * 24 * 3600 * 1000)) } });
    fireEvent.click(screen.getByRole('button', { name: 'Record agreement' }));
    expect((await screen.findAllByText('Say who agreed the quote on the phone.')).length).toBeGreaterThan(0);
    expect(screen.getAllByText('The call cannot be in the future.').length).toBeGreaterThan(0);
    expect(fetchMock).not.toHaveBeenCalled();
  });

  it('when the phone form is filled in, then who, the time as an instant, the note and the estimate version are posted', async () => {
    fetchMock.mockResolvedValue(new Response(JSON.stringify(estimate({ state: 'agreed', awaitingGross: '0.00' })), { status: 200, headers: { 'Content-Type': 'application/json' } }));
    renderWithApp(<QuotePanel jobId={TEST_JOB_ID} estimate={estimate()} canAct onSendQuote={vi.fn()} />);
    fireEvent.click(screen.getByRole('button', { name: 'Record agreement by phone' }));
    fireEvent.change(screen.getByLabelText(/^Who agreed it on the phone/), { target: { value: 'Elspeth Marlow, the owner' } });
    fireEvent.change(screen.getByLabelText(/^When/), { target: { value: '2026-11-30T09:15' } });
    fireEvent.change(screen.getByLabelText(/^Note/), { target: { value: 'Happy with the quote.' } });
    fireEvent.click(screen.getByRole('button', { name: 'Record agreement' }));
    await waitFor(() => expect(fetchMock).toHaveBeenCalled());
    const [url, init] = fetchMock.mock.calls[0]!;
    expect(url).toBe(`/api/jobs/${TEST_JOB_ID}/quote/phone-agreement`);
    expect(JSON.parse(String(init?.body))).toEqual({ agreedWith: 'Elspeth Marlow, the owner', agreedAt: isoFromLocalInput('2026-11-30T09:15'), note: 'Happy with the quote.', estimateVersion: 4 });
    expect(await screen.findByText('Agreement by phone recorded: the quote counts as agreed.')).toBeTruthy();
  });
});
