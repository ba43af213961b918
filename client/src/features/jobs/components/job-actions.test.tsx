import type { JobDto } from '@wingstage/shared';
import { fireEvent, screen, waitFor } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { aJob } from '@/testing/fixtures';
import { renderWithApp } from '@/testing/render';
import { JobActions } from './job-actions';

const job: JobDto = aJob();

describe('JobActions', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => vi.stubGlobal('fetch', fetchMock));
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  it('offers the next states from the shared table, labelled with their actions', () => {
    renderWithApp(<JobActions job={job} role="manager" />);
    const labels = screen.getAllByRole('button').map((b) => b.textContent);
    expect(labels).toEqual(['Hold for owner', 'Mark ready for release', 'Cancel job']);
  });

  it('offers an engineer only the start of an inspection', () => {
    const { unmount } = renderWithApp(<JobActions job={job} role="engineer" />);
    expect(screen.queryAllByRole('button')).toHaveLength(0);
    unmount();
    renderWithApp(<JobActions job={{ ...job, state: 'booked_in' }} role="engineer" />);
    expect(screen.getAllByRole('button').map((b) => b.textContent)).toEqual(['Start inspection']);
  });

  it("sends the job's version and shows the server's reason when the move is refused", async () => {
    const reason = 'An open airworthiness finding must be rectified before release.';
    fetchMock.mockResolvedValueOnce(
      new Response(JSON.stringify({ error: { code: 'invalid_transition', message: reason } }), { status: 409, headers: { 'Content-Type': 'application/json' } }),
    );
    fetchMock.mockResolvedValue(new Response(JSON.stringify(job), { status: 200, headers: { 'Content-Type': 'application/json' } }));
    renderWithApp(<JobActions job={job} role="manager" />);
    fireEvent.click(screen.getByRole('button', { name: 'Mark ready for release' }));

    expect(await screen.findByText(reason)).toBeTruthy();
    const [url, init] = fetchMock.mock.calls[0]!;
    expect(url).toBe(`/api/jobs/${job.id}/transition`);
    expect(JSON.parse(String(init?.body))).toEqual({ to: 'ready_for_release', version: 3 });
    await waitFor(() => expect(screen.getByRole('button', { name: 'Mark ready for release' }).hasAttribute('disabled')).toBe(false));
  });

  it('says someone else moved the job when the version is stale', async () => {
    fetchMock.mockResolvedValueOnce(
      new Response(JSON.stringify({ error: { code: 'stale_version', message: 'Someone else changed this job.' } }), { status: 409, headers: { 'Content-Type': 'application/json' } }),
    );
    fetchMock.mockResolvedValue(new Response(JSON.stringify(job), { status: 200, headers: { 'Content-Type': 'application/json' } }));
    renderWithApp(<JobActions job={job} role="manager" />);
    fireEvent.click(screen.getByRole('button', { name: 'Hold for owner' }));
    expect(await screen.findByText(/Someone else moved this job a moment ago/)).toBeTruthy();
  });

  it('says a finished job has no further steps', () => {
    renderWithApp(<JobActions job={{ ...job, state: 'closed' }} role="admin" />);
    expect(screen.getByText(/No further steps/)).toBeTruthy();
  });
  it('when a job is cancelled, then the reason is asked for first and sent with the move', async () => {
    fetchMock.mockResolvedValue(new Response(JSON.stringify({ ...job, state: 'cancelled', version: 4 }), { status: 200, headers: { 'Content-Type': 'application/json' } }));
    renderWithApp(<JobActions job={job} role="manager" />);
    fireEvent.click(screen.getByRole('button', { name: 'Cancel job' }));
    // Nothing is sent until a reason is given.
    const form = screen.getByLabelText(/Why is this job cancelled/);
    fireEvent.submit(form.closest('form')!);
    expect(await screen.findByText('Say why the job is cancelled.')).toBeTruthy();
    expect(fetchMock).not.toHaveBeenCalled();

    fireEvent.change(form, { target: { value: 'Owner sold the aircraft' } });
    fireEvent.submit(form.closest('form')!);
    await waitFor(() => expect(fetchMock).toHaveBeenCalled());
    const [, init] = fetchMock.mock.calls[0]!;
    expect(JSON.parse(String(init?.body))).toEqual({ to: 'cancelled', version: 3, reason: 'Owner sold the aircraft' });
  });

  it('when a job is ready for release, then no button marks it invoiced: issuing the invoice does that', () => {
    renderWithApp(<JobActions job={aJob({ state: 'ready_for_release' })} role="manager" />);
    expect(screen.queryByRole('button', { name: /invoiced|Issue invoice/ })).toBeNull();
    expect(screen.getByRole('button', { name: 'Start work' })).toBeTruthy();
  });

  it('when a job is invoiced, then no button marks it paid; the page says the money received does', () => {
    renderWithApp(<JobActions job={aJob({ state: 'invoiced' })} role="accounts" />);
    expect(screen.queryByRole('button')).toBeNull();
    expect(screen.getByText(/becomes paid when the money received covers the invoice/)).toBeTruthy();
  });
});
