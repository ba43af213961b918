import type { FindingDto } from '@wingstage/shared';
import { fireEvent, screen, waitFor } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { aFinding } from '@/testing/fixtures';
import { renderWithApp } from '@/testing/render';
import { FindingActions } from './finding-actions';

const finding: FindingDto = aFinding();

const names = () => screen.queryAllByRole('button').map((b) => b.textContent);

describe('FindingActions', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => vi.stubGlobal('fetch', fetchMock));
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  it('when a finding is priced, then the office may withdraw it and nobody may mark it rectified', () => {
    const { unmount } = renderWithApp(<FindingActions jobId={finding.jobId} finding={finding} role="manager" />);
    expect(names()).toEqual(['Withdraw finding']);
    unmount();
    renderWithApp(<FindingActions jobId={finding.jobId} finding={finding} role="engineer" />);
    expect(names()).toEqual([]);
  });

  it('when approved work is not yet recorded as done, then an engineer may mark it rectified; accounts and owners may not', () => {
    const approved = { ...finding, state: 'approved' as const };
    const { unmount } = renderWithApp(<FindingActions jobId={finding.jobId} finding={approved} role="engineer" />);
    expect(names()).toEqual(['Mark rectified']);
    unmount();
    for (const role of ['accounts', 'owner'] as const) {
      const r = renderWithApp(<FindingActions jobId={finding.jobId} finding={approved} role={role} />);
      expect(names()).toEqual([]);
      r.unmount();
    }
    renderWithApp(<FindingActions jobId={finding.jobId} finding={{ ...approved, rectifiedAt: '2026-12-01T09:00:00Z' }} role="manager" />);
    expect(names()).toEqual([]);
  });

  it("when marked rectified, then the finding's version is sent and a refusal is shown in words", async () => {
    fetchMock.mockResolvedValueOnce(
      new Response(JSON.stringify({ error: { code: 'stale_version', message: 'Someone else changed this finding.' } }), { status: 409, headers: { 'Content-Type': 'application/json' } }),
    );
    renderWithApp(<FindingActions jobId={finding.jobId} finding={{ ...finding, state: 'approved' }} role="manager" />);
    fireEvent.click(screen.getByRole('button', { name: 'Mark rectified' }));
    expect(await screen.findByRole('alert')).toHaveProperty('textContent', 'Someone else changed this finding.');
    await waitFor(() => expect(fetchMock).toHaveBeenCalled());
    const [url, init] = fetchMock.mock.calls[0]!;
    expect(url).toBe(`/api/jobs/${finding.jobId}/findings/${finding.id}/rectified`);
    expect(JSON.parse(String(init?.body))).toEqual({ version: 4 });
  });
});
