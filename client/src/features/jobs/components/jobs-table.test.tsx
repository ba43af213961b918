import { screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { aJob } from '@/testing/fixtures';
import { renderWithApp } from '@/testing/render';
import { JobsTable } from './jobs-table';

describe('JobsTable', () => {
  it('when an owner’s decision waits to be seen, then the job’s row carries the flag beside its state, and the stronger one names why', () => {
    const plain = aJob({ id: 'j1', number: 'J-0001', decisionsToSee: { requests: 1, declinedAirworthiness: false, ownerNote: false, lastDecidedAt: '2026-12-02T10:00:00Z' } });
    const strong = aJob({ id: 'j2', number: 'J-0002', decisionsToSee: { requests: 1, declinedAirworthiness: true, ownerNote: true, lastDecidedAt: '2026-12-02T11:00:00Z' } });
    const quiet = aJob({ id: 'j3', number: 'J-0003' });
    renderWithApp(
      <JobsTable page={{ items: [plain, strong, quiet], total: 3, page: 1, pageSize: 25 }} params={{ page: 1, pageSize: 25, q: '', sort: undefined, dir: 'asc' }} onChange={() => {}} />,
    );
    // The desktop table (the phone list repeats the same cells).
    const flags = within(screen.getByRole('table')).getAllByTestId('decisions-flag');
    expect(flags).toHaveLength(2);
    expect(flags[0]!.textContent).toBe('New decision from the owner');
    expect(flags[1]!.getAttribute('data-strength')).toBe('strong');
    expect(within(flags[1]!).getByText('Airworthiness item declined · The owner left a note')).toBeTruthy();
  });
});
