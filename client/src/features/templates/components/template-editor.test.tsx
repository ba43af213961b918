import type { PartDto, SupplierDto, TemplateDto, WorkshopDto } from '@wingstage/shared';
import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { ApiError } from '@/lib/api-client';
import { renderWithApp } from '@/testing/render';
import { json } from '@/testing/http';
import { EXAMPLE_LIMITS_CAUTION, TemplateEditor } from './template-editor';

const workshop = {
  labourRates: [{ code: 'standard', name: 'Workshop labour', ratePerHour: '62.00' }],
} as WorkshopDto;

const part = (n: number, description: string): PartDto => ({
  id: `7c7c7c7c-0000-4000-8000-${String(n).padStart(12, '0')}`,
  partNumber: `WS-${9000 + n}`,
  description,
  unitCost: '4.10',
  unitPrice: null,
  markupPercent: null,
  sellPrice: '4.92',
  vatRate: 'standard',
  supplierId: null,
  supplierName: null,
  leadTimeDays: 1,
  active: true,
  version: 1,
});
// More active parts than one list page holds: the 101st can only be reached by searching.
const PARTS = [...Array.from({ length: 100 }, (_, i) => part(i + 1, `Split pin, batch ${String(i + 1).padStart(3, '0')}`)), part(101, 'Carburettor float needle, Tolmere pattern')];
const SUPPLIERS: SupplierDto[] = [
  { id: '8d8d8d8d-0000-4000-8000-000000000001', name: 'Quillhaven Propeller Works', kind: 'propeller_shop', email: '', phone: '', notes: '', active: true, version: 1 },
  { id: '8d8d8d8d-0000-4000-8000-000000000002', name: 'Orrin Vale Magneto Shop', kind: 'engine_shop', email: '', phone: '', notes: '', active: true, version: 1 },
];

const labourLine = { kind: 'labour', description: 'Annual inspection', quantity: '6', labourRateCode: 'standard', partId: null, supplierId: null, amount: null, vatRate: 'standard', caution: '' } as const;

const template: TemplateDto = {
  id: '5a6b7c8d-9e0f-4a1b-8c2d-3e4f5a6b7c8d',
  name: 'Annual permit inspection',
  jobType: 'annual_permit_inspection',
  description: '',
  lines: [labourLine],
  checklist: [
    { section: 'Engine', text: 'Spark plug electrode gap', limit: { min: '0.6', max: '0.9', unit: 'mm', source: 'Example only' }, caution: '' },
    { section: 'Airframe', text: 'Wing attachment bolts', limit: null, caution: '' },
  ],
  active: true,
  version: 2,
};

/** The list endpoints as the server answers them: `q` searches, `ids=` fetches those records, `pageSize` caps the page. */
function list<T extends { id: string }>(rows: T[], u: URL, text: (r: T) => string) {
  const q = (u.searchParams.get('q') ?? '').toLowerCase();
  const ids = u.searchParams.get('ids')?.split(',');
  const hits = rows.filter((r) => (ids ? ids.includes(r.id) : true) && text(r).toLowerCase().includes(q));
  const size = Number(u.searchParams.get('pageSize') ?? 25);
  return json({ items: hits.slice(0, size), total: hits.length, page: 1, pageSize: size });
}

describe('TemplateEditor', () => {
  const fetchMock = vi.fn<typeof fetch>();
  const requests = (path: string) => fetchMock.mock.calls.map(([url]) => new URL(String(url), 'http://test.local')).filter((u) => u.pathname === path);
  beforeEach(() => {
    vi.stubGlobal('fetch', fetchMock);
    fetchMock.mockImplementation(async (url) => {
      const u = new URL(String(url), 'http://test.local');
      if (u.pathname === '/api/parts') return list(PARTS, u, (p) => `${p.partNumber} ${p.description}`);
      if (u.pathname === '/api/suppliers') return list(SUPPLIERS, u, (s) => s.name);
      return json({ code: 'not_found', message: 'Not found.' }, 404);
    });
  });
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  it('shows the example-limits caution and saves the reordered checklist', async () => {
    const onSave = vi.fn().mockResolvedValue(undefined);
    renderWithApp(<TemplateEditor template={template} workshop={workshop} onSave={onSave} onReload={vi.fn()} />);
    expect(screen.getByText(EXAMPLE_LIMITS_CAUTION)).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Move checklist item 2 up' }));
    fireEvent.click(screen.getByRole('button', { name: 'Save template' }));
    await vi.waitFor(() => expect(onSave).toHaveBeenCalled());
    const saved = onSave.mock.calls[0]![0];
    expect(saved.checklist.map((c: { text: string }) => c.text)).toEqual(['Wing attachment bolts', 'Spark plug electrode gap']);
    expect(saved.checklist[1].limit).toEqual({ min: '0.6', max: '0.9', unit: 'mm', source: 'Example only' });
    // No line names a part or supplier, so nothing is looked up.
    expect(requests('/api/parts')).toHaveLength(0);
    expect(requests('/api/suppliers')).toHaveLength(0);
  });

  it('when someone else saved first, says so, keeps the edits and offers their version', async () => {
    const onReload = vi.fn();
    const onSave = vi.fn().mockRejectedValue(new ApiError({ code: 'stale_version', status: 409, message: 'Someone else changed this template.' }));
    renderWithApp(<TemplateEditor template={template} workshop={workshop} onSave={onSave} onReload={onReload} />);
    fireEvent.input(screen.getByLabelText(/^Name/), { target: { value: 'Annual permit inspection, trikes' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save template' }));
    expect(await screen.findByText('Not saved: someone else changed this template')).toBeTruthy();
    expect((screen.getByLabelText(/^Name/) as HTMLInputElement).value).toBe('Annual permit inspection, trikes');
    fireEvent.click(screen.getByRole('button', { name: 'Load their version' }));
    expect(onReload).toHaveBeenCalled();
  });

  it('opens saved part and sub-contract lines showing their names, looked up by id in one request per list', async () => {
    const saved: TemplateDto = {
      ...template,
      lines: [
        { ...labourLine, kind: 'part', description: 'Float needle', quantity: '1', labourRateCode: null, partId: PARTS[100]!.id },
        { ...labourLine, kind: 'part', description: 'Split pins', quantity: '4', labourRateCode: null, partId: PARTS[2]!.id },
        { ...labourLine, kind: 'part', description: 'Split pins, spare', quantity: '4', labourRateCode: null, partId: PARTS[2]!.id },
        { ...labourLine, kind: 'subcontract', description: 'Propeller overhaul', quantity: '1', labourRateCode: null, supplierId: SUPPLIERS[0]!.id, amount: '180.00' },
      ],
    };
    const onSave = vi.fn().mockResolvedValue(undefined);
    renderWithApp(<TemplateEditor template={saved} workshop={workshop} onSave={onSave} onReload={vi.fn()} />);
    const partBoxes = () => screen.getAllByRole('combobox', { name: 'Catalogue part' }) as HTMLInputElement[];
    await waitFor(() => expect(partBoxes().map((b) => b.value)).toEqual(['WS-9101 — Carburettor float needle, Tolmere pattern', 'WS-9003 — Split pin, batch 003', 'WS-9003 — Split pin, batch 003']), { timeout: 5000 });
    await waitFor(() => expect((screen.getByRole('combobox', { name: 'Supplier' }) as HTMLInputElement).value).toBe('Quillhaven Propeller Works'), { timeout: 5000 });

    const parts = requests('/api/parts');
    expect(parts).toHaveLength(1);
    expect(parts[0]!.searchParams.get('ids')!.split(',').sort()).toEqual([PARTS[2]!.id, PARTS[100]!.id].sort());
    const suppliers = requests('/api/suppliers');
    expect(suppliers).toHaveLength(1);
    expect(suppliers[0]!.searchParams.get('ids')).toBe(SUPPLIERS[0]!.id);

    // Saving unchanged keeps every id.
    fireEvent.click(screen.getByRole('button', { name: 'Save template' }));
    await waitFor(() => expect(onSave).toHaveBeenCalled());
    expect(onSave.mock.calls[0]![0].lines.map((l: { partId: string | null; supplierId: string | null }) => l.partId ?? l.supplierId)).toEqual([
      PARTS[100]!.id,
      PARTS[2]!.id,
      PARTS[2]!.id,
      SUPPLIERS[0]!.id,
    ]);
  });

  it('a new part line picks the 101st part, found only by searching, and takes its description', async () => {
    const onSave = vi.fn().mockResolvedValue(undefined);
    renderWithApp(<TemplateEditor template={template} workshop={workshop} onSave={onSave} onReload={vi.fn()} />);
    fireEvent.click(screen.getByRole('button', { name: 'Add part line' }));
    const box = screen.getByRole('combobox', { name: 'Catalogue part' }) as HTMLInputElement;
    expect(box.value).toBe('');

    fireEvent.change(box, { target: { value: 'float needle' } });
    const listbox = screen.getByRole('listbox', { name: 'Catalogue part' });
    await waitFor(() => expect(within(listbox).getAllByRole('option')).toHaveLength(1), { timeout: 5000 });
    fireEvent.click(within(listbox).getByRole('option', { name: /WS-9101/ }));
    expect(box.value).toBe('WS-9101 — Carburettor float needle, Tolmere pattern');
    const searched = requests('/api/parts').filter((u) => u.searchParams.get('q') === 'float needle');
    expect(searched.length).toBeGreaterThan(0);
    expect(searched.every((u) => u.searchParams.get('active') === 'true')).toBe(true);

    fireEvent.click(screen.getByRole('button', { name: 'Save template' }));
    await waitFor(() => expect(onSave).toHaveBeenCalled());
    const line = onSave.mock.calls[0]![0].lines[1];
    expect(line).toMatchObject({ kind: 'part', partId: PARTS[100]!.id, description: 'Carburettor float needle, Tolmere pattern' });
  });

  it('a sub-contract line chooses its supplier by search, and can leave it to choose later', async () => {
    const onSave = vi.fn().mockResolvedValue(undefined);
    renderWithApp(<TemplateEditor template={template} workshop={workshop} onSave={onSave} onReload={vi.fn()} />);
    fireEvent.click(screen.getByRole('button', { name: 'Add sub-contract line' }));
    fireEvent.click(screen.getByRole('button', { name: 'Add sub-contract line' }));
    const [first] = screen.getAllByRole('combobox', { name: 'Supplier' }) as HTMLInputElement[];
    fireEvent.change(first!, { target: { value: 'magneto' } });
    const listbox = screen.getAllByRole('listbox', { name: 'Supplier' })[0]!;
    await waitFor(() => expect(within(listbox).getAllByRole('option')).toHaveLength(1), { timeout: 5000 });
    fireEvent.click(within(listbox).getByRole('option', { name: /Orrin Vale Magneto Shop/ }));
    screen.getAllByLabelText(/^Description/).slice(1).forEach((d, i) => fireEvent.input(d, { target: { value: `Magneto check ${i + 1}` } }));

    fireEvent.click(screen.getByRole('button', { name: 'Save template' }));
    await waitFor(() => expect(onSave).toHaveBeenCalled());
    const lines = onSave.mock.calls[0]![0].lines;
    expect(lines[1]).toMatchObject({ kind: 'subcontract', supplierId: SUPPLIERS[1]!.id });
    expect(lines[2]).toMatchObject({ kind: 'subcontract', supplierId: null });
  });
});
