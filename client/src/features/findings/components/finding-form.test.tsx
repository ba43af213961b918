import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { renderWithApp } from '@/testing/render';
import { json } from '@/testing/http';
import { FindingForm } from './finding-form';

const workshop = { labourRates: [{ code: 'standard', name: 'Standard', ratePerHour: '60.00' }] };
const part = (n: number, description: string) => ({
  id: `8d8d8d8d-0000-4000-8000-${String(n).padStart(12, '0')}`,
  partNumber: `WS-${1000 + n}`,
  description,
  unitCost: '5.00',
  unitPrice: null,
  markupPercent: null,
  sellPrice: '6.00',
  vatRate: 'standard',
  supplierId: null,
  supplierName: null,
  leadTimeDays: 0,
  active: true,
  version: 1,
});
// A catalogue larger than the old list's 100-row ceiling; the last part is found by its name.
const CATALOGUE = [...Array.from({ length: 104 }, (_, i) => part(i + 1, `Washer, plain, size ${i + 1}`)), part(105, 'Exhaust spring, stainless')];

function fillRequired() {
  fireEvent.change(screen.getByRole('textbox', { name: 'Title' }), { target: { value: 'Cracked exhaust spring' } });
  fireEvent.change(screen.getByRole('textbox', { name: 'Where on the aircraft' }), { target: { value: 'Exhaust, rear cylinder' } });
  fireEvent.click(screen.getByRole('radio', { name: /Airworthiness/ }));
  fireEvent.change(screen.getByRole('textbox', { name: 'What was seen' }), { target: { value: 'Spring cracked through at the hook.' } });
}

describe('FindingForm remedy parts', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => {
    vi.stubGlobal('fetch', fetchMock);
    fetchMock.mockImplementation(async (url) => {
      const u = new URL(String(url), 'http://test.local');
      const q = (u.searchParams.get('q') ?? '').toLowerCase();
      const hits = CATALOGUE.filter((p) => `${p.partNumber} ${p.description}`.toLowerCase().includes(q));
      const size = Number(u.searchParams.get('pageSize'));
      return json({ items: hits.slice(0, size), total: hits.length, page: 1, pageSize: size });
    });
  });
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  it('adds a remedy part found by searching the server and sends its id with the quantity', async () => {
    const onSubmit = vi.fn().mockResolvedValue(undefined);
    renderWithApp(<FindingForm workshop={workshop} onSubmit={onSubmit} onCancel={() => {}} />);
    fillRequired();
    fireEvent.click(screen.getByRole('button', { name: '+ Part from the catalogue' }));
    const box = screen.getByRole('combobox', { name: 'Part 1' });
    fireEvent.change(box, { target: { value: 'exhaust spring' } });
    const list = screen.getByRole('listbox', { name: 'Part 1' });
    await waitFor(() => expect(within(list).getAllByRole('option')).toHaveLength(1));
    fireEvent.keyDown(box, { key: 'ArrowDown' });
    fireEvent.keyDown(box, { key: 'Enter' });
    expect((box as HTMLInputElement).value).toBe('WS-1105 — Exhaust spring, stainless');
    fireEvent.change(screen.getByRole('textbox', { name: 'Qty' }), { target: { value: '2' } });

    fireEvent.click(screen.getByRole('button', { name: 'Raise finding' }));
    await waitFor(() => expect(onSubmit).toHaveBeenCalled());
    expect(onSubmit.mock.calls[0]![0].remedy.parts).toEqual([{ partId: CATALOGUE[104]!.id, quantity: '2' }]);
  });

  it('a remedy part row left empty says so and keeps the form', async () => {
    const onSubmit = vi.fn().mockResolvedValue(undefined);
    renderWithApp(<FindingForm workshop={workshop} onSubmit={onSubmit} onCancel={() => {}} />);
    fillRequired();
    fireEvent.click(screen.getByRole('button', { name: '+ Part from the catalogue' }));
    fireEvent.click(screen.getByRole('button', { name: 'Raise finding' }));
    expect((await screen.findAllByText('Choose a part from the catalogue.')).length).toBeGreaterThan(0);
    expect(screen.getByRole('combobox', { name: 'Part 1' }).getAttribute('aria-invalid')).toBe('true');
    expect(onSubmit).not.toHaveBeenCalled();
    expect((screen.getByRole('textbox', { name: 'Title' }) as HTMLInputElement).value).toBe('Cracked exhaust spring');
  });
});
