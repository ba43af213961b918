import type { FindingDto, SendForApprovalResultDto } from '@wingstage/shared';
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
const prices = new Map([
  [A.id, '76.37'],
  [B.id, '37.20'],
]);

describe('SendForApproval', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => vi.stubGlobal('fetch', fetchMock));
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  const renderPanel = (over: { unsaved?: boolean; selected?: Set<string> } = {}) =>
    renderWithApp(
      <SendForApproval
        jobId={JOB}
        ownerName="Saltmarsh Flyers Group"
        findings={[A, B]}
        selected={over.selected ?? new Set([A.id, B.id])}
        prices={prices}
        currency="GBP"
        estimateVersion={7}
        unsaved={over.unsaved ?? false}
        onSent={() => {}}
      />,
    );

  it('when findings are ticked, then their total is summed exactly and an airworthiness one brings a caution', () => {
    renderPanel();
    expect(screen.getByText(/2 findings ticked, £113\.57 incl\. VAT/)).toBeTruthy();
    expect(screen.getByText(/An airworthiness finding is ticked/)).toBeTruthy();
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
    expect(await screen.findByText(/Approved within the pre-authorised limit, and reported to the owner: F-1 \(£76\.37 incl\. VAT\)/)).toBeTruthy();
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
