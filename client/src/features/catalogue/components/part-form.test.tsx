import { workshopPricingFrom, type PartDto, type SupplierDto } from '@wingstage/shared';
import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { renderWithApp } from '@/testing/render';
import { json } from '@/testing/http';
import { PartForm } from './part-form';

const pricing = workshopPricingFrom({
  currency: 'GBP',
  vatRates: { standard: '20', reduced: '5', zero: '0' },
  settings: { vatRounding: 'invoice-nearest', partsMarkupPercent: '20', subcontractMarkupPercent: '10', approvalLinkDays: 14, chaseAfterHours: 48, contactPhone: '', contactEmail: '', depositPolicy: { kind: 'none' }, paymentTermsDays: 30 },
});

const supplier = (n: number, name: string, active = true): SupplierDto => ({
  id: `5a5a5a5a-0000-4000-8000-${String(n).padStart(12, '0')}`,
  name,
  kind: 'parts',
  email: '',
  phone: '',
  notes: '',
  active,
  version: 1,
} as SupplierDto);
// More suppliers than one list page held, so the last one can only be reached by searching.
const SUPPLIERS = [...Array.from({ length: 110 }, (_, i) => supplier(i + 1, `Supplier ${String(i + 1).padStart(3, '0')} Harrowdale`)), supplier(111, 'Zennor Fittings Yard')];

const part: PartDto = {
  id: '6b6b6b6b-0000-4000-8000-000000000001',
  partNumber: 'WS-7001',
  description: 'Exhaust spring, stainless',
  unitCost: '3.20',
  unitPrice: null,
  markupPercent: null,
  sellPrice: '3.84',
  vatRate: 'standard',
  supplierId: SUPPLIERS[2]!.id,
  supplierName: SUPPLIERS[2]!.name,
  leadTimeDays: 2,
  active: true,
  version: 4,
};

describe('PartForm supplier', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => {
    vi.stubGlobal('fetch', fetchMock);
    document.cookie = 'ws_csrf=tok-1';
    fetchMock.mockImplementation(async (url, init) => {
      const u = new URL(String(url), 'http://test.local');
      if (init?.method === 'PATCH') return json({ ...part, ...JSON.parse(String(init.body)) });
      const q = (u.searchParams.get('q') ?? '').toLowerCase();
      const hits = SUPPLIERS.filter((s) => s.name.toLowerCase().includes(q));
      const size = Number(u.searchParams.get('pageSize'));
      return json({ items: hits.slice(0, size), total: hits.length, page: 1, pageSize: size });
    });
  });
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  it("opens with the part's supplier by name, and saves a supplier found by searching past the first hundred", async () => {
    const onDone = vi.fn();
    renderWithApp(<PartForm part={part} pricing={pricing} onDone={onDone} />);
    const box = screen.getByRole('combobox', { name: 'Supplier' }) as HTMLInputElement;
    expect(box.value).toBe('Supplier 003 Harrowdale');

    fireEvent.change(box, { target: { value: 'zennor' } });
    const list = screen.getByRole('listbox', { name: 'Supplier' });
    await waitFor(() => expect(within(list).getAllByRole('option')).toHaveLength(1));
    fireEvent.click(within(list).getByRole('option', { name: /Zennor Fittings Yard/ }));
    fireEvent.click(screen.getByRole('button', { name: /Save/ }));
    await waitFor(() => expect(onDone).toHaveBeenCalled());
    const patch = fetchMock.mock.calls.find(([, i]) => i?.method === 'PATCH')!;
    expect(JSON.parse(String(patch[1]!.body))).toMatchObject({ supplierId: SUPPLIERS[110]!.id, version: 4 });
  });

  it('clears the supplier to none', async () => {
    const onDone = vi.fn();
    renderWithApp(<PartForm part={part} pricing={pricing} onDone={onDone} />);
    fireEvent.click(screen.getByRole('button', { name: 'Clear supplier' }));
    expect((screen.getByRole('combobox', { name: 'Supplier' }) as HTMLInputElement).value).toBe('');
    fireEvent.click(screen.getByRole('button', { name: /Save/ }));
    await waitFor(() => expect(onDone).toHaveBeenCalled());
    const patch = fetchMock.mock.calls.find(([, i]) => i?.method === 'PATCH')!;
    expect(JSON.parse(String(patch[1]!.body)).supplierId).toBeNull();
  });
});
