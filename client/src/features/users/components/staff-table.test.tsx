import type { UserDto } from '@wingstage/shared';
import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { renderWithApp } from '@/testing/render';
import { StaffTable } from './staff-table';

const sam: UserDto = {
  id: '4d5e6f7a-8b9c-4d0e-8f1a-2b3c4d5e6f7a',
  email: 'sam@brackenfold.example',
  name: 'Sam Ollerby',
  role: 'engineer',
  active: true,
  customerId: null,
  invited: false,
  createdAt: '2026-01-01T00:00:00Z',
};
const json = (body: unknown, status = 200) => new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });

describe('StaffTable: changing a role', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => vi.stubGlobal('fetch', fetchMock));
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  it('when a new role is picked, then nothing changes until it is confirmed, and "Keep" puts the old role back', async () => {
    fetchMock.mockResolvedValue(json({ ...sam, role: 'manager' }));
    renderWithApp(<StaffTable page={{ items: [sam], total: 1, page: 1, pageSize: 20 }} params={{ q: '', page: 1, pageSize: 20, dir: 'asc' } as never} onChange={vi.fn()} selfId="someone-else" />);
    const select = screen.getAllByLabelText('Role for Sam Ollerby')[0] as HTMLSelectElement;
    fireEvent.change(select, { target: { value: 'manager' } });
    const ask = screen.getAllByRole('group', { name: 'Confirm the new role for Sam Ollerby' })[0]!;
    expect(ask.textContent).toContain('Make Sam Ollerby manager instead of engineer?');
    expect(fetchMock).not.toHaveBeenCalled();
    fireEvent.click(within(ask).getByRole('button', { name: 'Keep engineer' }));
    expect(select.value).toBe('engineer');
    expect(fetchMock).not.toHaveBeenCalled();

    fireEvent.change(select, { target: { value: 'manager' } });
    fireEvent.click(within(screen.getAllByRole('group', { name: 'Confirm the new role for Sam Ollerby' })[0]!).getByRole('button', { name: 'Change role' }));
    await waitFor(() => expect(fetchMock).toHaveBeenCalled());
    expect(JSON.parse(String(fetchMock.mock.calls[0]![1]?.body))).toEqual({ role: 'manager' });
  });
});
