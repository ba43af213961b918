import { estimateEngineInput, priceEstimate, type EstimateDto, type EstimateLineDto, type FindingDto, type SendForApprovalResultDto } from '@wingstage/shared';
import { fireEvent, screen, waitFor } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { aFinding } from '@/testing/fixtures';
import { renderWithApp } from '@/testing/render';
import { SendForApproval } from './send-for-approval';

const JOB = '5b0c1d7e-8f3a-4b61-9d2e-0a1b2c3d4e5f';
const finding = (id: string, number: string, category: FindingDto['category'], state: FindingDto['state'] = 'priced'): FindingDto =>
  aFinding({ id, jobId: JOB, number, title: `Finding ${number}`, location: 'Engine', category, seen: 'Seen.', state, remedy: { description: '', hours: '0.5', labourRateCode: 'standard', parts: [], accessTask: null }, version: 1 });
const A = finding('7c1e2a3b-4d5e-4f60-8a9b-0c1d2e3f4a5b', 'F-1', 'recommended');
const B = finding('8d2f3b4c-5e6f-4a71-9bac-1d2e3f4a5b6c', 'F-2', 'airworthiness');
const COWL = '9e3a4b5c-6d7e-4f80-9a1b-2c3d4e5f6a7b';
const VAT_RATES = { standard: '20', reduced: '5', zero: '0' };

const feeLine = (over: Partial<EstimateLineDto> & Pick<EstimateLineDto, 'stage' | 'amount'>): EstimateLineDto => ({
  id: crypto.randomUUID(),
  kind: 'fee',
  description: 'Work',
  quantity: '1',
  labourRateCode: null,
  ratePerHour: null,
  partId: null,
  supplierId: null,
  unitCost: null,
  unitPrice: null,
  markupPercent: null,
  vatRate: 'standard',
  findingId: null,
  accessTaskId: null,
  discountPercent: null,
  agreedAt: null,
  agreedHow: null,
  ...over,
});

/**
 * A saved estimate priced by the engine: £100 of the quote agreed, £50 not yet; F-1 £50 and F-2 £25,
 * both needing the £15 cowling. At 20% VAT: quote awaiting £60.00, F-1 £60.00, F-2 £30.00, cowling £18.00.
 */
function estimate({ quoteAgreed = false } = {}): EstimateDto {
  const lines = [
    feeLine({ stage: 'inspection', amount: '100.00', agreedAt: '2026-11-30T09:00:00Z', agreedHow: 'phone' }),
    feeLine({ stage: 'inspection', amount: '50.00', agreedAt: quoteAgreed ? '2026-11-30T09:00:00Z' : null, agreedHow: quoteAgreed ? 'phone' : null }),
    feeLine({ stage: 'discovered', amount: '50.00', findingId: A.id, accessTaskId: COWL }),
    feeLine({ stage: 'discovered', amount: '25.00', findingId: B.id, accessTaskId: COWL }),
  ];
  const accessTasks = [{ id: COWL, name: 'Cowling off', hours: '1', labourRateCode: null, ratePerHour: '15.00', vatRate: 'standard' as const }];
  const priced = priceEstimate(estimateEngineInput(lines, accessTasks), {
    currency: 'GBP',
    vatRounding: 'invoice-nearest',
    vatRates: VAT_RATES,
    partsMarkupPercent: '20',
    subcontractMarkupPercent: '10',
  });
  return {
    jobId: JOB,
    version: 7,
    currency: 'GBP',
    lines,
    accessTasks,
    priced,
    quote: {
      state: quoteAgreed ? 'agreed' : 'changed',
      awaitingGross: priced.quoteAwaiting.gross,
      agreedBy: 'the owner',
      agreedAt: '2026-11-30T09:00:00Z',
      agreedHow: 'phone',
      openRequestId: null,
    },
  };
}

describe('SendForApproval', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => vi.stubGlobal('fetch', fetchMock));
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  const renderPanel = (over: { unsaved?: boolean; selected?: Set<string>; quoteTicked?: boolean; estimate?: EstimateDto; onQuoteTicked?: (on: boolean) => void } = {}) =>
    renderWithApp(
      <SendForApproval
        jobId={JOB}
        ownerName="Saltmarsh Flyers Group"
        findings={[A, B]}
        selected={over.selected ?? new Set([A.id, B.id])}
        estimate={over.estimate ?? estimate()}
        vatRates={VAT_RATES}
        quoteTicked={over.quoteTicked ?? false}
        onQuoteTicked={over.onQuoteTicked ?? (() => {})}
        unsaved={over.unsaved ?? false}
        onSent={() => {}}
      />,
    );

  it('when findings sharing opening-up are ticked, then the preview prices them with priceChoice: each alone, the opening-up once, and the exact total', () => {
    renderPanel();
    const preview = screen.getByTestId('send-preview');
    expect(preview.textContent).toContain('F-1£60.00 incl. VAT');
    expect(preview.textContent).toContain('F-2£30.00 incl. VAT');
    expect(preview.textContent).toContain('Opening-up work shared by F-1 and F-2 (“Cowling off”), charged once£18.00 incl. VAT');
    // 60 + 30 + 18, not the findings' own prices added up with the cowling twice.
    expect(screen.getByTestId('send-preview-total').textContent).toBe('£108.00 incl. VAT');
    // Agreed so far: £100 + 20% = £120.00.
    expect(preview.textContent).toContain('Agreed so far £120.00 incl. VAT');
    expect(screen.getByText(/An airworthiness finding is ticked/)).toBeTruthy();
  });

  it('when some of the inspection scope is not agreed, then a Quote tick is offered and, ticked, the quote joins the preview and the request', async () => {
    const onQuoteTicked = vi.fn();
    const { unmount } = renderPanel({ selected: new Set(), onQuoteTicked });
    const tick = screen.getByRole('checkbox', { name: /^Quote: the inspection scope not yet agreed, £60\.00 incl\. VAT/ });
    fireEvent.click(tick);
    expect(onQuoteTicked).toHaveBeenCalledWith(true);
    unmount();

    fetchMock.mockResolvedValueOnce(new Response(JSON.stringify({ approvedWithinLimit: [], request: null }), { status: 201, headers: { 'Content-Type': 'application/json' } }));
    renderPanel({ selected: new Set([B.id]), quoteTicked: true });
    const preview = screen.getByTestId('send-preview');
    expect(preview.textContent).toContain('The quote£60.00 incl. VAT');
    // 60 + 30 + 18 (F-2 alone still needs the cowling).
    expect(screen.getByTestId('send-preview-total').textContent).toBe('£108.00 incl. VAT');
    fireEvent.click(screen.getByRole('button', { name: 'Send for approval' }));
    await waitFor(() => expect(fetchMock).toHaveBeenCalled());
    expect(JSON.parse(String(fetchMock.mock.calls[0]![1]?.body))).toEqual({ findingIds: [B.id], includeQuote: true, message: '', estimateVersion: 7 });
  });

  it('when the whole quote is agreed, then no Quote tick is offered', () => {
    renderPanel({ estimate: estimate({ quoteAgreed: true }) });
    expect(screen.queryByRole('checkbox', { name: /^Quote/ })).toBeNull();
  });

  it('when the estimate has unsaved changes, then sending waits for a save', () => {
    renderPanel({ unsaved: true });
    expect((screen.getByRole('button', { name: 'Send for approval' }) as HTMLButtonElement).disabled).toBe(true);
    expect(screen.getByText(/Save the estimate first/)).toBeTruthy();
  });

  it('when sent, then the findings in panel order, the message and the estimate version go to the server, and the result names what the limit approved', async () => {
    const result: SendForApprovalResultDto = {
      approvedWithinLimit: [{ findingId: A.id, number: 'F-1', gross: '76.37' }],
      request: {
        id: '1a2b3c4d-5e6f-4a7b-8c9d-0e1f2a3b4c5d',
        jobId: JOB,
        state: 'sent',
        findingIds: [B.id],
        includesQuote: false,
        sentAt: '2026-12-01T10:00:00Z',
        expiresAt: '2026-12-08T10:00:00Z',
        decidedAt: null,
        decidedByName: null,
        revokedAt: null,
        replacedById: null,
        lastRemindedAt: null,
        snapshotHash: 'b'.repeat(64),
        gross: '37.20',
      },
    };
    fetchMock.mockResolvedValueOnce(new Response(JSON.stringify(result), { status: 201, headers: { 'Content-Type': 'application/json' } }));
    renderPanel();
    fireEvent.change(screen.getByLabelText('A short message to the owner (optional)'), { target: { value: 'Two things turned up.' } });
    fireEvent.click(screen.getByRole('button', { name: 'Send for approval' }));
    expect(await screen.findByText(/Approved under the owner's standing go-ahead, and reported to the owner: F-1 \(£76\.37 incl\. VAT\)/)).toBeTruthy();
    expect(screen.getByTestId('request-sent').textContent).toContain('Request sent to Saltmarsh Flyers Group with F-2, £37.20 incl. VAT');
    await waitFor(() => expect(fetchMock).toHaveBeenCalled());
    const [url, init] = fetchMock.mock.calls[0]!;
    expect(url).toBe(`/api/jobs/${JOB}/approval-requests`);
    expect(JSON.parse(String(init?.body))).toEqual({ findingIds: [A.id, B.id], includeQuote: false, message: 'Two things turned up.', estimateVersion: 7 });
  });

  it('when the server refuses (a stale estimate), then its reason is shown', async () => {
    fetchMock.mockResolvedValueOnce(
      new Response(JSON.stringify({ error: { code: 'stale_version', message: 'Someone else changed the estimate; check the prices and send again.' } }), {
        status: 409,
        headers: { 'Content-Type': 'application/json' },
      }),
    );
    renderPanel();
    fireEvent.click(screen.getByRole('button', { name: 'Send for approval' }));
    expect((await screen.findByRole('alert')).textContent).toBe('Someone else changed the estimate; check the prices and send again.');
  });
});
