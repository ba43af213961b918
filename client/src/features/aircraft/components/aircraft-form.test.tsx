import type { AircraftDto } from '@wingstage/shared';
import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { PICKER_PAGE_SIZE, type PickerSource } from '@/components/ui/search-picker';
import { api } from '@/lib/api-client';
import { renderWithApp } from '@/testing/render';
import { json } from '@/testing/http';
import { AircraftForm } from './aircraft-form';

interface Owner {
  id: string;
  name: string;
}
const OWNERS: Owner[] = [
  { id: '4e4e4e4e-0000-4000-8000-000000000001', name: 'Orla Fenwright' },
  { id: '4e4e4e4e-0000-4000-8000-000000000002', name: 'Bram Kettleworth' },
];
// The same shape as the route's owner source: the customers list searched with q, and one owner by id.
const owners: PickerSource<Owner> = {
  search: (q) => {
    const params = { q: q || undefined, pageSize: PICKER_PAGE_SIZE, sort: 'name', dir: 'asc' as const };
    return { queryKey: ['customers', 'list', params], queryFn: ({ signal }) => api.get('/customers', params, signal) };
  },
  byId: (id) => ({ queryKey: ['customers', 'detail', id], queryFn: ({ signal }) => api.get<Owner>(`/customers/${id}`, undefined, signal) }),
  id: (o) => o.id,
  label: (o) => o.name,
};

const initial: AircraftDto = {
  id: '1f1f1f1f-0000-4000-8000-000000000001',
  customerId: OWNERS[0]!.id,
  customerName: OWNERS[0]!.name,
  registration: 'Q-TEST',
  type: 'Two-seat flex-wing trike',
  serial: 'T-001',
  airframeHours: '100.0',
  engine: '80 hp flat-four',
  engineHours: '100.0',
  notes: '',
  openJobCount: 0,
  version: 2,
  createdAt: '2026-01-01T00:00:00.000Z',
};

describe('AircraftForm owner', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => {
    vi.stubGlobal('fetch', fetchMock);
    fetchMock.mockImplementation(async (url) => {
      const u = new URL(String(url), 'http://test.local');
      const one = OWNERS.find((o) => u.pathname === `/api/customers/${o.id}`);
      if (one) return json(one);
      const q = (u.searchParams.get('q') ?? '').toLowerCase();
      const hits = OWNERS.filter((o) => o.name.toLowerCase().includes(q));
      return json({ items: hits, total: hits.length, page: 1, pageSize: PICKER_PAGE_SIZE });
    });
  });
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  it("opens with the aircraft's owner by name and saves another owner picked by search", async () => {
    const onSubmit = vi.fn().mockResolvedValue(undefined);
    renderWithApp(<AircraftForm initial={initial} owners={owners} submitLabel="Save changes" cancelTo="/aircraft" onSubmit={onSubmit} />);
    const box = screen.getByRole('combobox', { name: /^Owner/ }) as HTMLInputElement;
    await waitFor(() => expect(box.value).toBe('Orla Fenwright'));
    fireEvent.change(box, { target: { value: 'kettle' } });
    const list = screen.getByRole('listbox', { name: 'Owner' });
    await waitFor(() => expect(within(list).getAllByRole('option')).toHaveLength(1));
    fireEvent.click(within(list).getByRole('option', { name: 'Bram Kettleworth' }));
    fireEvent.click(screen.getByRole('button', { name: 'Save changes' }));
    await waitFor(() => expect(onSubmit).toHaveBeenCalled());
    expect(onSubmit.mock.calls[0]![0]).toMatchObject({ customerId: OWNERS[1]!.id, registration: 'Q-TEST' });
  });

  it('asks for the owner when none is chosen', async () => {
    const onSubmit = vi.fn();
    renderWithApp(<AircraftForm owners={owners} submitLabel="Add aircraft" cancelTo="/aircraft" onSubmit={onSubmit} />);
    fireEvent.click(screen.getByRole('button', { name: 'Add aircraft' }));
    expect((await screen.findAllByText('Choose the owner.')).length).toBeGreaterThan(0);
    expect(onSubmit).not.toHaveBeenCalled();
  });
});
