import * as shared from '@wingstage/shared';
import { estimateEngineInput, workshopPricingFrom, type EstimateDto, type EstimateLineDto, type SupplierDto, type WorkshopDto } from '@wingstage/shared';
import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { formatMoney } from '@/lib/format';
import { renderWithApp } from '@/testing/render';
import { json } from '@/testing/http';
import { EstimateBuilder } from './estimate-builder';
import { useEstimateDraft } from './use-estimate-draft';

// The builder must show the engine's own figures; wrapping the engine lets a test swap its answer.
vi.mock('@wingstage/shared', async (importOriginal) => {
  const real = await importOriginal<typeof import('@wingstage/shared')>();
  return { ...real, priceEstimate: vi.fn(real.priceEstimate) };
});

const workshop: WorkshopDto = {
  id: 'w',
  name: 'Test workshop',
  addressLines: '',
  postcode: '',
  vatNumber: 'GB999000173',
  currency: 'GBP',
  vatRates: { standard: '20', reduced: '5', zero: '0' },
  labourRates: [
    { code: 'standard', name: 'Workshop labour', ratePerHour: '62.00' },
    { code: 'sailcloth', name: 'Sail and fabric work', ratePerHour: '70.00' },
  ],
  settings: { vatRounding: 'invoice-nearest', partsMarkupPercent: '20', subcontractMarkupPercent: '10', approvalLinkDays: 14, chaseAfterHours: 48, contactPhone: '', contactEmail: '', depositPolicy: { kind: 'none' }, paymentTermsDays: 30 },
  version: 1,
};
const pricing = workshopPricingFrom(workshop);
const JOB = '0b4f2f7e-3c1a-4d8e-9b6a-1c2d3e4f5a6b';

function line(over: Partial<EstimateLineDto>): EstimateLineDto {
  return {
    id: crypto.randomUUID(),
    stage: 'inspection',
    kind: 'labour',
    description: 'Annual inspection',
    quantity: '6',
    labourRateCode: 'standard',
    ratePerHour: '62.00',
    partId: null,
    supplierId: null,
    unitCost: null,
    unitPrice: null,
    markupPercent: null,
    amount: null,
    vatRate: 'standard',
    findingId: null,
    accessTaskId: null,
    discountPercent: null,
    // Agreed, so the inspection scope counts as it did before quotes were agreed online.
    agreedAt: '2026-11-30T09:00:00Z',
    agreedHow: 'recorded_before',
    ...over,
  };
}

function estimateOf(lines: EstimateLineDto[], version = 3): EstimateDto {
  const real = vi.mocked(shared.priceEstimate);
  const priced = real(estimateEngineInput(lines, []), pricing);
  return {
    jobId: JOB,
    version,
    currency: 'GBP',
    lines,
    accessTasks: [],
    priced: shared.lineFiguresOf(priced),
    quote: { state: 'agreed', awaitingGross: priced.quoteAwaiting.gross, agreedBy: null, agreedAt: '2026-11-30T09:00:00Z', agreedHow: 'recorded_before', openRequestId: null },
  };
}

function Harness({ estimate, suppliers = [] }: { estimate: EstimateDto; suppliers?: SupplierDto[] }) {
  const draft = useEstimateDraft(JOB, estimate, pricing);
  return <EstimateBuilder draft={draft} workshop={workshop} suppliers={suppliers} findings={[]} editable />;
}

describe('EstimateBuilder', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(async () => {
    vi.stubGlobal('fetch', fetchMock);
    const real = await vi.importActual<typeof import('@wingstage/shared')>('@wingstage/shared');
    vi.mocked(shared.priceEstimate).mockImplementation(real.priceEstimate);
  });
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  it('shows the totals the shared engine gives for the lines on screen, and follows edits before saving', async () => {
    const labour = line({});
    const fee = line({ kind: 'fee', description: 'Permit paperwork', quantity: '1', labourRateCode: null, ratePerHour: null, amount: '45.00' });
    const found = line({ stage: 'discovered', description: 'New plugs', quantity: '0.5', findingId: null });
    const estimate = estimateOf([labour, fee, found]);
    renderWithApp(<Harness estimate={estimate} />);

    const expected = estimate.priced;
    expect(screen.getByTestId('stage-head-inspection').textContent).toBe(
      `${formatMoney(expected.stages.inspection.net, 'GBP', { vat: 'excl' })} · ${formatMoney(expected.stages.inspection.gross, 'GBP', { vat: 'incl' })}`,
    );
    expect(screen.getByTestId('total-quoted-gross').textContent).toBe(formatMoney(expected.quoted.gross, 'GBP', { vat: 'incl' }));
    expect(screen.getByTestId('total-committed-gross').textContent).toBe(formatMoney(expected.committed.gross, 'GBP', { vat: 'incl' }));

    // Change the labour hours: the figures are the engine's answer for the edited lines.
    const hours = within(screen.getByRole('region', { name: 'Inspection scope' })).getAllByLabelText('Hours')[0]!;
    fireEvent.change(hours, { target: { value: '7.5' } });
    const edited = shared.priceEstimate(estimateEngineInput([{ ...labour, quantity: '7.5' }, fee, found], []), pricing);
    expect(screen.getByTestId('total-quoted-gross').textContent).toBe(formatMoney(edited.quoted.gross, 'GBP', { vat: 'incl' }));
    expect(edited.quoted.gross).not.toBe(expected.quoted.gross);
    expect(screen.getByText('Unsaved changes')).toBeTruthy();
  });

  it('lays out whatever the engine returns rather than adding lines up itself', () => {
    const estimate = estimateOf([line({})]);
    const real = shared.pricedEstimateOf(estimate);
    vi.mocked(shared.priceEstimate).mockImplementation(() => ({ ...real, quoted: { ...real.quoted, gross: '1234.56' } }));
    renderWithApp(<Harness estimate={estimate} />);
    expect(screen.getByTestId('total-quoted-gross').textContent).toBe('£1,234.56 incl. VAT');
    expect(shared.priceEstimate).toHaveBeenCalled();
  });

  it('pauses the totals, with the reason, while a figure is not a number', () => {
    const estimate = estimateOf([line({})]);
    renderWithApp(<Harness estimate={estimate} />);
    fireEvent.change(screen.getAllByLabelText('Hours')[0]!, { target: { value: '7,5' } });
    expect(screen.getByText(/Totals paused until every figure is a number/)).toBeTruthy();
  });

  it('when a figure is negative, then the paused totals name the line and say it cannot be negative, without the engine\'s field paths', () => {
    const estimate = estimateOf([line({})]);
    renderWithApp(<Harness estimate={estimate} />);
    fireEvent.change(screen.getAllByLabelText('Hours')[0]!, { target: { value: '-3' } });
    const paused = screen.getByText(/Totals paused until every figure is a number/);
    expect(paused.textContent).toContain('"Annual inspection": Quantity cannot be negative.');
    expect(paused.textContent).not.toMatch(/lines\[|must not be negative|decimals/);
  });

  it('when a figure is far beyond a light-aircraft job, then saving asks first, names it, and sends confirmLarge only after "They are right"', async () => {
    const part = line({ kind: 'part', description: 'Split pins', quantity: '1', labourRateCode: null, ratePerHour: null, unitCost: '0.40' });
    const estimate = estimateOf([part]);
    fetchMock.mockResolvedValue(json(estimateOf([{ ...part, quantity: '1000000' }], 4)));
    renderWithApp(<Harness estimate={estimate} />);
    fireEvent.change(within(screen.getByRole('region', { name: 'Inspection scope' })).getAllByLabelText(/Quantity/)[0]!, { target: { value: '1000000' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save estimate' }));
    const ask = await screen.findByTestId('confirm-large');
    expect(ask.textContent).toContain('"Split pins": 1000000 is more than 500 items.');
    expect(fetchMock).not.toHaveBeenCalled();
    fireEvent.click(within(ask).getByRole('button', { name: 'They are right: save' }));
    await waitFor(() => expect(fetchMock).toHaveBeenCalled());
    expect(JSON.parse(String(fetchMock.mock.calls[0]![1]?.body))).toMatchObject({ version: 3, confirmLarge: true });
  });

  it('when someone else saved first, says so, shows their version and keeps the unsaved lines', async () => {
    const mine = line({ description: 'Annual inspection' });
    const estimate = estimateOf([mine], 3);
    const theirs = estimateOf([line({ description: 'Their new scope line', quantity: '2' })], 4);
    fetchMock.mockImplementation(async (url, init) => {
      if (init?.method === 'PUT') return json({ error: { code: 'stale_version', message: 'Someone else changed this estimate.', fields: { version: '4' } } }, 409);
      if (String(url).endsWith('/estimate')) return json(theirs);
      return json({});
    });
    renderWithApp(<Harness estimate={estimate} />);
    fireEvent.change(screen.getAllByLabelText('Description')[0]!, { target: { value: 'Annual inspection with extra checks' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save estimate' }));

    expect(await screen.findByText('Not saved: someone else changed this estimate')).toBeTruthy();
    const [, init] = fetchMock.mock.calls.find(([, i]) => i?.method === 'PUT')!;
    expect(JSON.parse(String(init?.body)).version).toBe(3);
    await waitFor(() => expect(screen.getByText(/Their version: quoted/)).toBeTruthy());
    expect(screen.getByText(/nothing has been lost/)).toBeTruthy();
    expect(screen.getByText('4', { selector: 'strong' })).toBeTruthy();
    // The manager's own edit is still on screen, not replaced by theirs.
    expect((screen.getAllByLabelText('Description')[0] as HTMLInputElement).value).toBe('Annual inspection with extra checks');
    expect(screen.queryByDisplayValue('Their new scope line')).toBeNull();

    fireEvent.click(screen.getByRole('button', { name: 'Show their version (drop my changes)' }));
    expect(screen.getByDisplayValue('Their new scope line')).toBeTruthy();
    expect(screen.getByRole('heading', { name: /Estimate/ }).textContent).toContain('version 4');
  });

  it("'+ Part…' searches the active catalogue on the server and adds the picked part as a priced line", async () => {
    const plug = {
      id: '9c9c9c9c-0000-4000-8000-000000000105',
      partNumber: 'WS-1305',
      description: 'Gasket set, rocker cover',
      unitCost: '14.50',
      unitPrice: null,
      markupPercent: null,
      sellPrice: '17.40',
      vatRate: 'standard',
      supplierId: null,
      supplierName: null,
      leadTimeDays: 0,
      active: true,
      version: 1,
    };
    fetchMock.mockImplementation(async (url) => {
      const u = new URL(String(url), 'http://test.local');
      const q = u.searchParams.get('q');
      return json(q === 'rocker' ? { items: [plug], total: 1, page: 1, pageSize: 20 } : { items: [], total: 0, page: 1, pageSize: 20 });
    });
    renderWithApp(<Harness estimate={estimateOf([line({})])} />);
    const scope = within(screen.getByRole('region', { name: 'Inspection scope' }));
    const box = scope.getByRole('combobox', { name: 'Add a catalogue part to inspection scope' }) as HTMLInputElement;
    fireEvent.change(box, { target: { value: 'rocker' } });
    fireEvent.click(await scope.findByRole('option', { name: /WS-1305 — Gasket set, rocker cover/ }));

    const partsUrl = fetchMock.mock.calls.map(([u]) => new URL(String(u), 'http://test.local')).find((u) => u.searchParams.get('q') === 'rocker')!;
    expect(partsUrl.pathname).toBe('/api/parts');
    expect(partsUrl.searchParams.get('active')).toBe('true');
    expect(scope.getByDisplayValue('WS-1305 Gasket set, rocker cover')).toBeTruthy();
    expect(scope.getByDisplayValue('14.50')).toBeTruthy();
    // Ready for the next part, and the change waits to be saved.
    expect(box.value).toBe('');
    expect(screen.getByText('Unsaved changes')).toBeTruthy();
  });

  it('still adds a part that is not in the catalogue', () => {
    renderWithApp(<Harness estimate={estimateOf([line({})])} />);
    const scope = within(screen.getByRole('region', { name: 'Inspection scope' }));
    const before = scope.getAllByLabelText('Description').length;
    fireEvent.click(scope.getByRole('button', { name: '+ Part not in the catalogue' }));
    expect(scope.getAllByLabelText('Description')).toHaveLength(before + 1);
  });

  it("a sub-contract line shows its supplier's name and changes to one found by searching the server", async () => {
    const mk = (n: number, name: string): SupplierDto => ({ id: `3f3f3f3f-0000-4000-8000-${String(n).padStart(12, '0')}`, name, kind: 'propeller_shop', email: '', phone: '', notes: '', active: true, version: 1 });
    const propShop = mk(1, 'Larkspur Propeller Works');
    const farShop = mk(140, 'Tidewell Fabric Loft');
    const sub = line({ kind: 'subcontract', description: 'Propeller overhaul', quantity: '1', labourRateCode: null, ratePerHour: null, amount: '300.00', supplierId: propShop.id });
    fetchMock.mockImplementation(async (url, init) => {
      if (init?.method === 'PUT') return json(estimateOf([{ ...sub, supplierId: farShop.id }], 4));
      const q = new URL(String(url), 'http://test.local').searchParams.get('q');
      return json(q === 'tidewell' ? { items: [farShop], total: 1, page: 1, pageSize: 20 } : { items: [], total: 0, page: 1, pageSize: 20 });
    });
    renderWithApp(<Harness estimate={estimateOf([sub])} suppliers={[propShop]} />);
    const box = screen.getByRole('combobox', { name: 'Supplier' }) as HTMLInputElement;
    expect(box.value).toBe('Larkspur Propeller Works');
    fireEvent.change(box, { target: { value: 'tidewell' } });
    fireEvent.click(await screen.findByRole('option', { name: /Tidewell Fabric Loft/ }));
    expect(box.value).toBe('Tidewell Fabric Loft');
    expect(screen.getByText('Unsaved changes')).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Save estimate' }));
    await waitFor(() => expect(fetchMock.mock.calls.some(([, i]) => i?.method === 'PUT')).toBe(true));
    const [, init] = fetchMock.mock.calls.find(([, i]) => i?.method === 'PUT')!;
    expect(JSON.parse(String(init?.body)).lines[0]).toMatchObject({ kind: 'subcontract', supplierId: farShop.id });
  });
});
