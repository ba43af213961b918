import type { AircraftDto, Page } from '@wingstage/shared';
import { queryOptions } from '@tanstack/react-query';
import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { PickerSource } from '@/components/ui/search-picker';
import { api } from '@/lib/api-client';
import { renderWithApp } from '@/testing/render';
import { json } from '@/testing/http';
import { BookInForm } from './job-form';

const base: AircraftDto = {
  id: '7d0a4c62-2f7e-4b1a-9f3e-5c6d7e8f9a0b',
  customerId: '1a2b3c4d-5e6f-4a1b-8c2d-3e4f5a6b7c8d',
  customerName: 'Orla Fenwright',
  registration: 'Q-TEST',
  type: 'Two-seat flex-wing trike',
  serial: 'T-001',
  airframeHours: '100.0',
  engine: '80 hp flat-four',
  engineHours: '100.0',
  notes: '',
  openJobCount: 0,
  version: 1,
  createdAt: '2026-01-01T00:00:00.000Z',
};
const other: AircraftDto = { ...base, id: '2c3d4e5f-6a7b-4c8d-9e0f-1a2b3c4d5e6f', registration: 'Q-WREN', customerName: 'Bram Kettleworth' };
// The form takes its aircraft source from the route; this one asks the same endpoints.
const aircraft: PickerSource<AircraftDto> = {
  search: (q) => queryOptions({ queryKey: ['aircraft', 'search', q], queryFn: () => api.get<Page<AircraftDto>>('/aircraft', { q: q || undefined, pageSize: 20 }) }),
  byId: (id) => queryOptions({ queryKey: ['aircraft', 'one', id], queryFn: () => api.get<AircraftDto>(`/aircraft/${id}`) }),
  id: (a) => a.id,
  label: (a) => `${a.registration} — ${a.customerName}`,
};
const FLEET = [base, other];

describe('BookInForm', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => {
    vi.stubGlobal('fetch', fetchMock);
    fetchMock.mockImplementation(async (url) => {
      const u = new URL(String(url), 'http://test.local');
      const one = FLEET.find((a) => u.pathname === `/api/aircraft/${a.id}`);
      if (one) return json(one);
      const q = (u.searchParams.get('q') ?? '').toLowerCase();
      const hits = FLEET.filter((a) => `${a.registration} ${a.customerName}`.toLowerCase().includes(q));
      return json({ items: hits, total: hits.length, page: 1, pageSize: 20 });
    });
  });
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  it('opens with the aircraft it was started from, and picks another by searching the server', async () => {
    const onSubmit = vi.fn().mockResolvedValue(undefined);
    renderWithApp(<BookInForm aircraft={aircraft} defaultAircraftId={base.id} cancelTo="/jobs" onSubmit={onSubmit} />);
    const box = screen.getByRole('combobox', { name: /^Aircraft/ }) as HTMLInputElement;
    await waitFor(() => expect(box.value).toBe('Q-TEST — Orla Fenwright'));

    fireEvent.change(box, { target: { value: 'kettle' } });
    const list = screen.getByRole('listbox', { name: 'Aircraft' });
    await waitFor(() => expect(within(list).getAllByRole('option')).toHaveLength(1));
    fireEvent.click(within(list).getByRole('option', { name: /Q-WREN — Bram Kettleworth/ }));
    expect(fetchMock.mock.calls.some(([url]) => String(url).includes('/api/aircraft?') && String(url).includes('q=kettle'))).toBe(true);
    fireEvent.click(screen.getByRole('button', { name: 'Book in' }));
    await waitFor(() => expect(onSubmit).toHaveBeenCalled());
    expect(onSubmit.mock.calls[0]![0]).toMatchObject({ aircraftId: other.id });
  });

  it('asks for the aircraft when none is chosen', async () => {
    const onSubmit = vi.fn().mockResolvedValue(undefined);
    renderWithApp(<BookInForm aircraft={aircraft} cancelTo="/jobs" onSubmit={onSubmit} />);
    fireEvent.click(screen.getByRole('button', { name: 'Book in' }));
    expect((await screen.findAllByText('Choose the aircraft.')).length).toBeGreaterThan(0);
    expect(screen.getByRole('combobox', { name: /^Aircraft/ }).getAttribute('aria-invalid')).toBe('true');
    expect(onSubmit).not.toHaveBeenCalled();
  });

  it('uses the kind of work as the title until a title is typed', () => {
    renderWithApp(<BookInForm aircraft={aircraft} cancelTo="/jobs" onSubmit={vi.fn()} />);
    const title = screen.getByLabelText(/^Title/) as HTMLInputElement;
    expect(title.value).toBe('Annual permit inspection');
    fireEvent.change(screen.getByLabelText(/^Kind of work/), { target: { value: 'gearbox_inspection' } });
    expect(title.value).toBe('Gearbox inspection');
    fireEvent.input(title, { target: { value: 'Gearbox and clutch check' } });
    fireEvent.change(screen.getByLabelText(/^Kind of work/), { target: { value: 'repair' } });
    expect(title.value).toBe('Gearbox and clutch check');
  });

  it('a template sets the kind of work and the title, and is sent with the booking', async () => {
    const templates = [
      { id: '3e4f5a6b-7c8d-4e9f-8a1b-2c3d4e5f6a7b', name: '100-hour engine service (trike)', jobType: 'engine_service_100h' as const, lineCount: 4, checklistCount: 8, active: true },
    ];
    const onSubmit = vi.fn().mockResolvedValue(undefined);
    renderWithApp(<BookInForm aircraft={aircraft} defaultAircraftId={base.id} cancelTo="/jobs" onSubmit={onSubmit} templates={templates} />);
    fireEvent.change(screen.getByLabelText(/^Start from a template/), { target: { value: templates[0]!.id } });
    expect((screen.getByLabelText(/^Kind of work/) as HTMLSelectElement).value).toBe('engine_service_100h');
    expect((screen.getByLabelText(/^Title/) as HTMLInputElement).value).toBe('100-hour engine service (trike)');
    fireEvent.click(screen.getByRole('button', { name: 'Book in' }));
    await waitFor(() => expect(onSubmit).toHaveBeenCalled());
    expect(onSubmit.mock.calls[0]![0]).toMatchObject({ templateId: templates[0]!.id, type: 'engine_service_100h', title: '100-hour engine service (trike)' });
  });

  it("refuses a due date before booking in, with the shared schema's message, and sends null for no due date", async () => {
    const onSubmit = vi.fn().mockResolvedValue(undefined);
    renderWithApp(<BookInForm aircraft={aircraft} defaultAircraftId={base.id} cancelTo="/jobs" onSubmit={onSubmit} />);
    fireEvent.input(screen.getByLabelText(/^Booked in on/), { target: { value: '2026-12-10' } });
    fireEvent.input(screen.getByLabelText(/^Due back/), { target: { value: '2026-12-01' } });
    fireEvent.click(screen.getByRole('button', { name: 'Book in' }));
    expect((await screen.findAllByText('The due date cannot be before booking in.')).length).toBeGreaterThan(0);
    expect(onSubmit).not.toHaveBeenCalled();

    fireEvent.input(screen.getByLabelText(/^Due back/), { target: { value: '' } });
    fireEvent.click(screen.getByRole('button', { name: 'Book in' }));
    await waitFor(() => expect(onSubmit).toHaveBeenCalledOnce());
    expect(onSubmit.mock.calls[0]![0]).toMatchObject({ aircraftId: base.id, bookedInOn: '2026-12-10', dueOn: null, type: 'annual_permit_inspection' });
  });

  it('when the title was left empty and a template then fills it, then the "Title is required" message goes away', async () => {
    const templates = [
      { id: '3e4f5a6b-7c8d-4e9f-8a1b-2c3d4e5f6a7b', name: 'Gearbox inspection', jobType: 'gearbox_inspection' as const, lineCount: 3, checklistCount: 3, active: true },
    ];
    renderWithApp(<BookInForm aircraft={aircraft} defaultAircraftId={base.id} cancelTo="/jobs" onSubmit={vi.fn()} templates={templates} />);
    const title = screen.getByLabelText(/^Title/) as HTMLInputElement;
    fireEvent.input(title, { target: { value: '' } });
    fireEvent.click(screen.getByRole('button', { name: 'Book in' }));
    expect((await screen.findAllByText('Title is required.')).length).toBeGreaterThan(0);
    fireEvent.change(screen.getByLabelText(/^Start from a template/), { target: { value: templates[0]!.id } });
    expect(title.value).toBe('Gearbox inspection');
    await waitFor(() => expect(screen.queryAllByText('Title is required.')).toHaveLength(0));
  });
});
