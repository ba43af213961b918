import type { Page } from '@wingstage/shared';
import { zodResolver } from '@hookform/resolvers/zod';
import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { useForm } from 'react-hook-form';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import { renderWithApp } from '@/testing/render';
import { json } from '@/testing/http';
import { PickerField } from './picker-field';
import { PICKER_PAGE_SIZE, SearchPicker, type PickerSource } from './search-picker';

interface Owner {
  id: string;
  name: string;
  email: string;
}

// 45 invented owners, so a search can match more than one page of the picker.
const OWNERS: Owner[] = Array.from({ length: 45 }, (_, i) => ({
  id: `00000000-0000-4000-8000-${String(i + 1).padStart(12, '0')}`,
  name: i === 44 ? 'Quilla Brackenmoor' : `Owner ${String(i + 1).padStart(2, '0')} Tessaly`,
  email: `owner${i + 1}@example.test`,
}));

const source: PickerSource<Owner> = {
  search: (q) => {
    const params = { q: q || undefined, pageSize: PICKER_PAGE_SIZE, sort: 'name', dir: 'asc' as const };
    return { queryKey: ['owners', 'list', params], queryFn: ({ signal }) => api.get<Page<Owner>>('/customers', params, signal) };
  },
  byId: (id) => ({ queryKey: ['owners', 'detail', id], queryFn: ({ signal }) => api.get<Owner>(`/customers/${id}`, undefined, signal) }),
  id: (o) => o.id,
  label: (o) => o.name,
  detail: (o) => o.email,
};

/** Answers like the server: `q` matches names case-blind, a page of at most pageSize rows. */
function fakeServer(url: string): Response {
  const u = new URL(url, 'http://test.local');
  const one = /\/api\/customers\/([^/?]+)$/.exec(u.pathname);
  if (one) {
    const o = OWNERS.find((x) => x.id === one[1]);
    return o ? json(o) : json({ error: { code: 'not_found', message: 'Not found.' } }, 404);
  }
  const q = (u.searchParams.get('q') ?? '').toLowerCase();
  const size = Number(u.searchParams.get('pageSize') ?? 20);
  const hits = OWNERS.filter((o) => o.name.toLowerCase().includes(q));
  return json({ items: hits.slice(0, size), total: hits.length, page: 1, pageSize: size });
}

const searchedFor = (fetchMock: ReturnType<typeof vi.fn>) =>
  fetchMock.mock.calls.map(([url]) => new URL(String(url), 'http://test.local')).filter((u) => u.pathname === '/api/customers').map((u) => u.searchParams.get('q'));

describe('SearchPicker', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => {
    vi.stubGlobal('fetch', fetchMock);
    fetchMock.mockImplementation(async (url) => fakeServer(String(url)));
  });
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  it('searches the server with what was typed, once typing pauses, and lists the matches', async () => {
    const onChange = vi.fn();
    renderWithApp(<SearchPicker label="Owner" source={source} value={null} onChange={onChange} />);
    const box = screen.getByRole('combobox', { name: /Owner/ });
    expect(box.getAttribute('aria-expanded')).toBe('false');

    fireEvent.focus(box);
    fireEvent.change(box, { target: { value: 'B' } });
    fireEvent.change(box, { target: { value: 'Brack' } });
    const list = await screen.findByRole('listbox', { name: 'Owner' });
    await waitFor(() => expect(within(list).getAllByRole('option')).toHaveLength(1));
    expect(within(list).getByRole('option').textContent).toContain('Quilla Brackenmoor');
    expect(within(list).getByRole('option').textContent).toContain('owner45@example.test');
    // The pause between keys means only the settled text went to the server, not every keystroke.
    expect(searchedFor(fetchMock)).toContain('Brack');
    expect(searchedFor(fetchMock)).not.toContain('B');
    expect(fetchMock.mock.calls.some(([url]) => String(url).includes(`pageSize=${PICKER_PAGE_SIZE}`))).toBe(true);
  });

  it('picks with the keyboard: down to highlight, enter to choose, escape to close without choosing', async () => {
    const onChange = vi.fn();
    renderWithApp(<SearchPicker label="Owner" source={source} value={null} onChange={onChange} />);
    const box = screen.getByRole('combobox', { name: /Owner/ });
    fireEvent.focus(box);
    fireEvent.change(box, { target: { value: 'Tessaly' } });
    await waitFor(() => expect(screen.getAllByRole('option')).toHaveLength(PICKER_PAGE_SIZE));

    fireEvent.keyDown(box, { key: 'ArrowDown' });
    fireEvent.keyDown(box, { key: 'ArrowDown' });
    fireEvent.keyDown(box, { key: 'ArrowUp' });
    fireEvent.keyDown(box, { key: 'ArrowDown' });
    const active = box.getAttribute('aria-activedescendant');
    expect(active).toBeTruthy();
    expect(document.getElementById(active!)?.textContent).toContain('Owner 02 Tessaly');
    fireEvent.keyDown(box, { key: 'Enter' });
    expect(onChange).toHaveBeenCalledWith(OWNERS[1]!.id, OWNERS[1]);
    expect((box as HTMLInputElement).value).toBe('Owner 02 Tessaly');
    expect(box.getAttribute('aria-expanded')).toBe('false');

    // Escape closes the list and keeps the choice already made.
    fireEvent.change(box, { target: { value: 'Quilla' } });
    await waitFor(() => expect(screen.getAllByRole('option')).toHaveLength(1));
    fireEvent.keyDown(box, { key: 'Escape' });
    expect(box.getAttribute('aria-expanded')).toBe('false');
    expect(onChange).toHaveBeenCalledTimes(1);
  });

  it('says when only the first rows are shown, and when nothing matches', async () => {
    renderWithApp(<SearchPicker label="Owner" source={source} value={null} onChange={vi.fn()} />);
    const box = screen.getByRole('combobox', { name: /Owner/ });
    fireEvent.click(screen.getByRole('button', { name: 'Show the list of owner' }));
    expect(await screen.findByRole('status')).toBeTruthy();
    await waitFor(() => expect(screen.getByRole('status').textContent).toBe(`Showing the first ${PICKER_PAGE_SIZE} — type more to narrow`));

    fireEvent.change(box, { target: { value: 'zzz-nobody' } });
    await waitFor(() => expect(screen.getByRole('status').textContent).toBe('No matches'));
    expect(screen.queryAllByRole('option')).toHaveLength(0);
  });

  it('shows the label of the value the form opens with, looked up by id', async () => {
    renderWithApp(<SearchPicker label="Owner" source={source} value={OWNERS[44]!.id} onChange={vi.fn()} />);
    const box = screen.getByRole('combobox', { name: /Owner/ }) as HTMLInputElement;
    await waitFor(() => expect(box.value).toBe('Quilla Brackenmoor'));
    expect(fetchMock.mock.calls.some(([url]) => String(url).endsWith(`/api/customers/${OWNERS[44]!.id}`))).toBe(true);
    // Nothing is searched until the list is opened.
    expect(searchedFor(fetchMock)).toHaveLength(0);
  });

  it('uses a record the caller already holds for the label, without a request', () => {
    renderWithApp(<SearchPicker label="Owner" source={source} value={OWNERS[3]!.id} selected={OWNERS[3]} onChange={vi.fn()} />);
    expect((screen.getByRole('combobox', { name: /Owner/ }) as HTMLInputElement).value).toBe('Owner 04 Tessaly');
    expect(fetchMock).not.toHaveBeenCalled();
  });

  it('in a form, shows the schema error on the control and clears it once a record is picked', async () => {
    const schema = z.object({ ownerId: z.string().uuid('Choose the owner.') });
    const onSubmit = vi.fn();
    function Form() {
      const { control, handleSubmit } = useForm<z.infer<typeof schema>>({ resolver: zodResolver(schema), defaultValues: { ownerId: '' } });
      return (
        <form onSubmit={handleSubmit(onSubmit)} noValidate>
          <PickerField control={control} name="ownerId" label="Owner" required source={source} />
          <button type="submit">Save</button>
        </form>
      );
    }
    renderWithApp(<Form />);
    fireEvent.click(screen.getByRole('button', { name: 'Save' }));
    const box = screen.getByRole('combobox', { name: /Owner/ });
    expect((await screen.findByRole('alert')).textContent).toContain('Choose the owner.');
    await waitFor(() => expect(box.getAttribute('aria-invalid')).toBe('true'));
    expect(box.getAttribute('aria-describedby')).toContain('-error');
    expect(onSubmit).not.toHaveBeenCalled();

    fireEvent.change(box, { target: { value: 'Quilla' } });
    fireEvent.click(await screen.findByRole('option', { name: /Quilla Brackenmoor/ }));
    fireEvent.click(screen.getByRole('button', { name: 'Save' }));
    await waitFor(() => expect(onSubmit).toHaveBeenCalled());
    expect(onSubmit.mock.calls[0]![0]).toEqual({ ownerId: OWNERS[44]!.id });
    expect(screen.queryByRole('alert')).toBeNull();
  });

  it('as an add control, reports each pick and empties itself for the next', async () => {
    const onChange = vi.fn();
    renderWithApp(<SearchPicker label="Add an owner" source={source} value={null} onChange={onChange} clearAfterPick />);
    const box = screen.getByRole('combobox', { name: /Add an owner/ }) as HTMLInputElement;
    fireEvent.change(box, { target: { value: 'Quilla' } });
    fireEvent.click(await screen.findByRole('option', { name: /Quilla Brackenmoor/ }));
    expect(onChange).toHaveBeenCalledWith(OWNERS[44]!.id, OWNERS[44]);
    expect(box.value).toBe('');
  });
});
