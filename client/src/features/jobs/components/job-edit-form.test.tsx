import type { JobDto } from '@wingstage/shared';
import { fireEvent, screen, waitFor } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { aJob } from '@/testing/fixtures';
import { renderWithApp } from '@/testing/render';
import { json } from '@/testing/http';
import { changedByOthers, JobEditForm } from './job-edit-form';

const job: JobDto = aJob();
const theirs: JobDto = { ...job, version: 4, dueOn: '2026-12-18', notes: 'Owner collects on a Friday', updatedAt: '2026-12-01T10:15:00Z' };

describe('JobEditForm', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => vi.stubGlobal('fetch', fetchMock));
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  it('lists only the fields the other person changed, in words', () => {
    expect(changedByOthers(job, theirs).map((d) => [d.label, d.value])).toEqual([
      ['Due back', '18 Dec 2026'],
      ['Notes', 'Owner collects on a Friday'],
    ]);
  });

  it('when someone else saved first, then the typed title stays, their changes are listed, and saving again sends their version', async () => {
    const onDone = vi.fn();
    fetchMock
      .mockResolvedValueOnce(json({ error: { code: 'stale_version', message: 'Someone else changed this job.' } }, 409))
      .mockResolvedValueOnce(json(theirs)) // the update hook's refetch or the form's own fetch
      .mockResolvedValue(json(theirs));
    renderWithApp(<JobEditForm job={job} onDone={onDone} />);
    const title = screen.getByLabelText(/Title/) as HTMLInputElement;
    fireEvent.change(title, { target: { value: 'Annual permit inspection and wing re-cover' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save changes' }));

    expect(await screen.findByText('Someone else changed this job while you were editing')).toBeTruthy();
    expect((screen.getByLabelText(/Title/) as HTMLInputElement).value).toBe('Annual permit inspection and wing re-cover');
    const list = await screen.findByTestId('their-changes');
    expect(list.textContent).toContain('Due back: 18 Dec 2026');
    expect(list.textContent).toContain('Notes: Owner collects on a Friday');
    expect(onDone).not.toHaveBeenCalled();

    fetchMock.mockReset();
    fetchMock.mockResolvedValue(json({ ...theirs, title: 'Annual permit inspection and wing re-cover', version: 5 }));
    fireEvent.click(screen.getByRole('button', { name: 'Save changes' }));
    await waitFor(() => expect(onDone).toHaveBeenCalled());
    const patch = fetchMock.mock.calls.find(([, init]) => init?.method === 'PATCH')!;
    expect(JSON.parse(String(patch[1]?.body))).toMatchObject({ version: 4, title: 'Annual permit inspection and wing re-cover' });
  });

  it('when the person takes their version, then the form shows the saved job and the notice goes', async () => {
    fetchMock.mockResolvedValueOnce(json({ error: { code: 'stale_version', message: 'Someone else changed this job.' } }, 409)).mockResolvedValue(json(theirs));
    renderWithApp(<JobEditForm job={job} onDone={vi.fn()} />);
    fireEvent.change(screen.getByLabelText(/Title/), { target: { value: 'Something else' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save changes' }));
    fireEvent.click(await screen.findByRole('button', { name: 'Take their version' }));
    expect((screen.getByLabelText(/Title/) as HTMLInputElement).value).toBe('Annual permit inspection');
    expect((screen.getByLabelText(/Notes/) as HTMLTextAreaElement).value).toBe('Owner collects on a Friday');
    expect(screen.queryByText('Someone else changed this job while you were editing')).toBeNull();
  });
});
