import type { ApprovalRequestDto } from '@wingstage/shared';
import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { renderWithApp } from '@/testing/render';
import { ApprovalRequestsList } from './approval-requests-list';

const JOB = '5b0c1d7e-8f3a-4b61-9d2e-0a1b2c3d4e5f';
const base: ApprovalRequestDto = {
  id: '1a2b3c4d-5e6f-4a7b-8c9d-0e1f2a3b4c5d',
  jobId: JOB,
  state: 'sent',
  findingIds: [],
  includesQuote: false,
  sentAt: '2026-12-01T10:00:00Z',
  expiresAt: '2026-12-08T10:00:00Z',
  decidedAt: null,
  decidedByName: null,
  revokedAt: null,
  replacedById: null,
  lastRemindedAt: null,
  snapshotHash: 'b'.repeat(64),
  gross: '113.57',
};

describe('ApprovalRequestsList', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => vi.stubGlobal('fetch', fetchMock));
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  it('shows each state as a word with an icon, and offers Resend and Revoke link only while a request waits for the owner, and names the quote when it holds it', () => {
    const requests: ApprovalRequestDto[] = [
      { ...base, id: 'r-sent', includesQuote: true },
      { ...base, id: 'r-decided', state: 'decided', decidedAt: '2026-12-02T09:00:00Z', decidedByName: 'Hazel Brambury' },
      { ...base, id: 'r-replaced', state: 'replaced', replacedById: 'r-sent' },
      { ...base, id: 'r-expired', state: 'expired' },
    ];
    renderWithApp(<ApprovalRequestsList jobId={JOB} requests={requests} findings={[]} currency="GBP" canAct />);
    const items = screen.getAllByRole('listitem').filter((li) => li.hasAttribute('data-request'));
    const names = (li: HTMLElement) => within(li).queryAllByRole('button').map((b) => b.textContent);
    expect(items.map((li) => li.querySelector('[data-request-state]')?.textContent)).toEqual(['Sent', 'Decided', 'Replaced', 'Expired']);
    for (const li of items) expect(li.querySelector('[data-request-state] svg')).toBeTruthy();
    expect(names(items[0]!)).toEqual(['Resend', 'Revoke link']);
    expect(names(items[1]!)).toEqual([]);
    expect(items[1]!.textContent).toContain('by Hazel Brambury');
    expect(items[2]!.textContent).toContain('a newer request took its place');
    // Resend gives a waiting request a new link; a finished one (expired) is asked again by a new request.
    expect(names(items[3]!)).toEqual([]);
    expect(items[3]!.textContent).toContain('send a new request');
    expect(items[0]!.textContent).toContain('The quote (inspection scope not yet agreed)');
  });

  it('when the manager revokes a link, then the request is posted and the outcome is said in words', async () => {
    fetchMock.mockResolvedValueOnce(new Response(JSON.stringify({ ...base, state: 'revoked' }), { status: 200, headers: { 'Content-Type': 'application/json' } }));
    renderWithApp(<ApprovalRequestsList jobId={JOB} requests={[base]} findings={[]} currency="GBP" canAct />);
    fireEvent.click(screen.getByRole('button', { name: 'Revoke link' }));
    expect(await screen.findByText(/The link no longer works/)).toBeTruthy();
    await waitFor(() => expect(fetchMock).toHaveBeenCalled());
    expect(fetchMock.mock.calls[0]![0]).toBe(`/api/approval-requests/${base.id}/revoke`);
  });

  it('when the person may not act (accounts), then no buttons are offered', () => {
    renderWithApp(<ApprovalRequestsList jobId={JOB} requests={[base]} findings={[]} currency="GBP" canAct={false} />);
    expect(screen.queryAllByRole('button')).toHaveLength(0);
  });
});
