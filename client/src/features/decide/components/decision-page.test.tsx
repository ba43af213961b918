import {
  QUOTE_ITEM_ID,
  choiceBasisFrom,
  priceChoice,
  priceEstimate,
  type ApprovalSnapshot,
  type Choice,
  type DecisionPageDto,
  type EstimateLineInput,
  type VatRounding,
} from '@wingstage/shared';
import { act, fireEvent, render, screen, within } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import { ApiError } from '@/lib/api-client';
import { formatMoney } from '@/lib/format';
import { DecisionPage } from './decision-page';
import { runningTotal } from './running-total';

const PLUG = '2f0e7a1c-3b4d-4e5f-8a6b-7c8d9e0f1a2b';
const SPRING = '8a9b0c1d-2e3f-4a5b-9c6d-7e8f9a0b1c2d';
const HOSE = 'c3d4e5f6-a7b8-4c9d-8e0f-1a2b3c4d5e6f';
const COWL = '5e6f7a8b-9c0d-4e1f-8a2b-3c4d5e6f7a8b';

const FINDINGS: Record<string, Omit<ApprovalSnapshot['findings'][number], 'findingId' | 'photos' | 'lines' | 'gross'>> = {
  [PLUG]: {
    number: 'F-1',
    title: 'Spark plug gap over the wear limit',
    category: 'recommended' as const,
    location: 'Engine, cylinder 1',
    seen: 'Gap measured wide.',
    measuredValue: '0.9800',
    limit: { min: null, max: '0.9', unit: 'mm' as const, source: 'Example for the demo' },
  },
  [SPRING]: { number: 'F-2', title: 'Exhaust spring cracked', category: 'airworthiness' as const, location: 'Exhaust, rear cylinder', seen: 'Cracked at the hook.', measuredValue: null, limit: null },
  [HOSE]: { number: 'F-3', title: 'Fuel hose hardened', category: 'advisory' as const, location: 'Fuel line, left', seen: 'Hose stiff.', measuredValue: null, limit: null },
};

/**
 * A version-3 snapshot built the way the server builds one: the engine prices the estimate, the
 * basis comes from its result, and every stored figure is priceChoice with everything approved.
 */
function snapshotOf(p: { rounding?: VatRounding; committed: EstimateLineInput[]; findings: { id: string; lines: EstimateLineInput[] }[]; cowl?: boolean }): ApprovalSnapshot {
  const rounding = p.rounding ?? 'line-nearest';
  const pricing = { currency: 'GBP', vatRounding: rounding, vatRates: { standard: '20', reduced: '5', zero: '0' }, partsMarkupPercent: '20', subcontractMarkupPercent: '10' };
  const lines = [...p.committed, ...p.findings.flatMap((f) => f.lines)];
  const priced = priceEstimate({ lines, accessTasks: p.cowl ? [{ id: COWL, hours: '0.25', ratePerHour: '62.00', vatRate: 'standard' }] : [] }, pricing);
  const basis = choiceBasisFrom(priced, { quote: false, findingIds: p.findings.map((f) => f.id) }, pricing.vatRates, () => 'Cowling off');
  const all = priceChoice(basis, Object.fromEntries(basis.items.map((i) => [i.id, 'approve' as const])));
  const net = new Map(priced.lines.map((l) => [l.id, l.net]));
  return {
    version: 3,
    requestId: '0b1c2d3e-4f5a-4b6c-8d7e-9f0a1b2c3d4e',
    jobId: '1c2d3e4f-5a6b-4c7d-8e9f-0a1b2c3d4e5f',
    jobNumber: 'J-0042',
    jobTitle: 'Annual permit inspection',
    registration: 'Q-SALT',
    aircraftType: 'Three-axis high-wing microlight',
    ownerName: 'Hazel Brambury',
    workshopName: 'Brackenfold Light Aircraft Engineering',
    currency: 'GBP',
    rounding,
    message: 'Two things turned up.',
    sentAt: '2026-12-01T10:00:00Z',
    expiresAt: '2026-12-08T10:00:00Z',
    basis,
    quote: null,
    findings: p.findings.map((f) => ({
      findingId: f.id,
      ...FINDINGS[f.id]!,
      photos: [],
      lines: f.lines.map((l) => ({ description: `Work on ${FINDINGS[f.id]!.number}`, kind: l.kind, quantity: '1', net: net.get(l.id)!, vatRate: l.vatRate, accessTaskId: l.accessTaskId ?? null })),
      gross: all.items.find((i) => i.id === f.id)!.allApprovedGross,
    })),
    totals: {
      quoted: priced.quoted,
      agreedSoFar: all.agreedSoFar,
      ifAllApproved: all.ifAllApproved,
      approvingNow: all.approvingNow,
      openingUp: all.openingUp.map((o) => ({ id: o.id, name: o.name, gross: o.allApprovedGross, neededBy: o.neededBy })),
    },
  };
}

const inspection: EstimateLineInput = { id: 'i1', stage: 'inspection', agreed: true, kind: 'labour', hours: '7.5', ratePerHour: '61.79', vatRate: 'standard' };
const fee = (id: string, findingId: string, amount: string, access = false): EstimateLineInput => ({
  id, stage: 'discovered', findingId, kind: 'fee', amount, vatRate: 'standard', accessTaskId: access ? COWL : null,
});

function snapshot(over: Partial<ApprovalSnapshot> = {}): ApprovalSnapshot {
  return {
    ...snapshotOf({
      committed: [inspection],
      findings: [
        { id: PLUG, lines: [fee('p', PLUG, '31.00', true)] },
        { id: SPRING, lines: [fee('s', SPRING, '31.00', true)] },
        { id: HOSE, lines: [fee('h', HOSE, '10.01')] },
      ],
      cowl: true,
    }),
    ...over,
  };
}

const HASH = 'a'.repeat(64);
const TOKEN = 'tok_en-123';
const page = (over: Partial<DecisionPageDto> = {}): DecisionPageDto => ({
  state: 'sent',
  closedReason: null,
  newerLinkSentAt: null,
  snapshot: snapshot(),
  snapshotHash: HASH,
  decisions: null,
  decidedByName: null,
  decidedAt: null,
  ...over,
});

const gbp = (a: string) => formatMoney(a, 'GBP');

describe('runningTotal reads priceChoice', () => {
  it('when nothing is chosen yet, then nothing is approved now and the whole request is still to decide', () => {
    const s = snapshot();
    const t = runningTotal(s, {});
    expect(t).toMatchObject({ approvedSoFar: s.totals.agreedSoFar.gross, thisRequestAsChosen: '0.00', newTotal: s.totals.agreedSoFar.gross, undecided: s.totals.approvingNow.gross, chosen: 0, of: 3 });
  });

  it('when some items are chosen, then every figure is priceChoice’s, and what is approved adds up to the new total', () => {
    const s = snapshot();
    const choice: Choice = { [PLUG]: 'approve', [SPRING]: 'decline' };
    const t = runningTotal(s, choice);
    const p = priceChoice(s.basis, choice);
    expect(t).toMatchObject({ thisRequestAsChosen: p.approvingNow.gross, newTotal: p.newTotal.gross, undecided: p.undecidedGross, chosen: 2 });
    expect(t.addsToTotal).toBe(t.thisRequestAsChosen);
  });

  it('when a kept choice names an item the request does not hold (the quote here), then it is ignored rather than refused', () => {
    expect(runningTotal(snapshot(), { [QUOTE_ITEM_ID]: 'approve' }).chosen).toBe(0);
  });
});

function choose(name: 'Approve' | 'Decline') {
  fireEvent.click(screen.getByRole('radio', { name: new RegExp(`^${name}`) }));
}

describe('DecisionPage', () => {
  it('shows one finding at a time with its category, measurement and its fixed price incl. VAT', () => {
    const s = snapshot();
    render(<DecisionPage token={TOKEN} page={page()} onSubmit={vi.fn()} />);
    expect(screen.getByText('Finding 1 of 3')).toBeTruthy();
    expect(screen.getAllByTestId('decide-finding')).toHaveLength(1);
    expect(screen.getByText('Recommended')).toBeTruthy();
    expect(screen.getByText('0.98 mm; the example limit is at most 0.9 mm')).toBeTruthy();
    expect(within(screen.getByTestId('decide-price')).getByText(`${gbp(s.findings[0]!.gross)} incl. VAT`)).toBeTruthy();
    // Inspection 7.5 h × £61.79 = £463.43 (463.425 rounded half up), VAT £92.69 → £556.12.
    expect(within(screen.getByTestId('running-total')).getByText('£556.12', { selector: '[data-total="quoted"]' })).toBeTruthy();
  });

  it('when an airworthiness finding is declined, then the page says plainly that the aircraft cannot be released with it open and that the inspector decides', () => {
    render(<DecisionPage token={TOKEN} page={page()} onSubmit={vi.fn()} />);
    fireEvent.click(screen.getByRole('button', { name: 'Next finding →' }));
    expect(screen.getByText('Finding 2 of 3')).toBeTruthy();
    expect(screen.queryByText(/cannot be released/)).toBeNull();
    choose('Decline');
    const warning = screen.getByRole('alert');
    expect(warning.textContent).toContain('Q-SALT cannot be released to fly while it is open');
    expect(warning.textContent).toContain('The inspector decides');
    // Declining advisory work carries no such warning.
    fireEvent.click(screen.getByRole('button', { name: 'Next finding →' }));
    choose('Decline');
    expect(screen.queryByText(/cannot be released/)).toBeNull();
  });

  it('when the owner reviews and confirms, then the hash, every decision by item with its note and the typed name are sent', async () => {
    const onSubmit = vi.fn().mockResolvedValue(undefined);
    render(<DecisionPage token={TOKEN} page={page()} onSubmit={onSubmit} />);
    choose('Approve');
    fireEvent.click(screen.getByRole('button', { name: 'Next finding →' }));
    choose('Decline');
    fireEvent.change(screen.getByLabelText('A note for the workshop (optional)'), { target: { value: 'Spring from our stores.' } });
    fireEvent.click(screen.getByRole('button', { name: 'Next finding →' }));
    // The review refuses to confirm while a finding has no decision, and says which.
    fireEvent.click(screen.getByRole('button', { name: 'Review your choices' }));
    expect((screen.getByRole('button', { name: 'Confirm decisions' }) as HTMLButtonElement).disabled).toBe(true);
    fireEvent.click(screen.getByRole('button', { name: 'Go to F-3' }));
    choose('Approve');
    fireEvent.click(screen.getByRole('button', { name: 'Review your choices' }));
    expect(screen.getAllByText('Approved')).toHaveLength(2);
    expect(screen.getAllByText('Declined')).toHaveLength(1);

    fireEvent.click(screen.getByRole('button', { name: 'Confirm decisions' }));
    expect(await screen.findByText('Type your name to confirm.')).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();

    fireEvent.change(screen.getByLabelText('Type your full name to confirm'), { target: { value: '  Hazel Brambury ' } });
    fireEvent.click(screen.getByRole('button', { name: 'Confirm decisions' }));
    await vi.waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0]![0]).toEqual({
      snapshotHash: HASH,
      typedName: 'Hazel Brambury',
      decisions: [
        { itemId: PLUG, decision: 'approve', note: '' },
        { itemId: SPRING, decision: 'decline', note: 'Spring from our stores.' },
        { itemId: HOSE, decision: 'approve', note: '' },
      ],
    });
  });

  it('when the server refuses because the workshop changed something, then the reason is shown with a way to reload', async () => {
    const onSubmit = vi.fn().mockRejectedValue(new ApiError({ code: 'conflict', status: 409, message: 'The workshop changed something on this request: reload the page to see the latest.' }));
    const onReload = vi.fn();
    const one = snapshotOf({ committed: [inspection], findings: [{ id: PLUG, lines: [fee('p', PLUG, '31.00')] }] });
    render(<DecisionPage token={TOKEN} page={page({ snapshot: one })} onSubmit={onSubmit} onReload={onReload} />);
    choose('Approve');
    fireEvent.click(screen.getByRole('button', { name: 'Review your choices' }));
    fireEvent.change(screen.getByLabelText('Type your full name to confirm'), { target: { value: 'Hazel Brambury' } });
    fireEvent.click(screen.getByRole('button', { name: 'Confirm decisions' }));
    expect(await screen.findByText('The workshop changed something on this request: reload the page to see the latest.')).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Reload this page' }));
    expect(onReload).toHaveBeenCalled();
  });

  it("when the request is closed, then the server's reason is shown in plain words and no choices are offered", () => {
    render(<DecisionPage token={TOKEN} page={page({ state: 'replaced', closedReason: 'The workshop changed a price after sending, so a newer request replaced this one. Look for it in your e-mail.' })} onSubmit={vi.fn()} />);
    expect(screen.getByText('A newer request replaced this one')).toBeTruthy();
    expect(screen.getByText('Replaced')).toBeTruthy();
    expect(screen.getByText(/a newer request replaced this one/)).toBeTruthy();
    expect(screen.queryByRole('radio')).toBeNull();
  });

  it('when the request is decided, then a receipt lists each decision, who made it and when, with the new total priceChoice gives', () => {
    const s = snapshot();
    render(
      <DecisionPage
        token={TOKEN}
        page={page({
          state: 'decided',
          closedReason: 'You decided this request on 1 Dec 2026.',
          decisions: [
            { itemId: PLUG, decision: 'approve', note: '' },
            { itemId: SPRING, decision: 'decline', note: 'Later.' },
            { itemId: HOSE, decision: 'decline', note: '' },
          ],
          decidedByName: 'Hazel Brambury',
          decidedAt: '2026-12-01T12:30:00Z',
        })}
        onSubmit={vi.fn()}
      />,
    );
    const receipt = screen.getByTestId('decision-receipt');
    expect(receipt.textContent).toContain('Thank you, Hazel Brambury.');
    expect(receipt.textContent).toContain('Your note: Later.');
    expect(receipt.textContent).toContain('Q-SALT cannot be released to fly while it is open');
    const newTotal = priceChoice(s.basis, { [PLUG]: 'approve', [SPRING]: 'decline', [HOSE]: 'decline' }).newTotal.gross;
    expect(within(receipt).getByText(gbp(newTotal), { selector: '[data-total="new-total"]' })).toBeTruthy();
  });
});

const PHOTOS = [
  { id: '3a4b5c6d-7e8f-4a9b-8c0d-1e2f3a4b5c6d', width: 2048, height: 1536 },
  { id: '4b5c6d7e-8f9a-4b0c-9d1e-2f3a4b5c6d7e', width: 1152, height: 2048 },
];

describe('DecisionPage photos', () => {
  const withPhotos = () => {
    const s = snapshot();
    s.findings[0]!.photos = PHOTOS;
    return page({ snapshot: s });
  };

  it('shows each photo of the finding at full column width through the link, sized up front, the first straight away and the rest lazily', () => {
    render(<DecisionPage token={TOKEN} page={withPhotos()} onSubmit={vi.fn()} />);
    const imgs = within(screen.getByTestId('decide-photos')).getAllByRole('img') as HTMLImageElement[];
    expect(imgs).toHaveLength(2);
    expect(imgs[0]!.getAttribute('src')).toBe(`/api/decide/${TOKEN}/photos/${PHOTOS[0]!.id}?size=full`);
    expect(imgs[1]!.getAttribute('src')).toBe(`/api/decide/${TOKEN}/photos/${PHOTOS[1]!.id}?size=full`);
    expect(imgs.map((i) => i.alt)).toEqual(['Photo 1 of F-1: Spark plug gap over the wear limit', 'Photo 2 of F-1: Spark plug gap over the wear limit']);
    expect(imgs.map((i) => [i.getAttribute('width'), i.getAttribute('height')])).toEqual([
      ['2048', '1536'],
      ['1152', '2048'],
    ]);
    expect(imgs.map((i) => i.getAttribute('loading'))).toEqual(['eager', 'lazy']);
    expect(imgs[0]!.className).toContain('w-full');
  });

  it('when a photo is tapped, then it opens full screen; Escape or Close shuts it and focus returns to the photo', () => {
    render(<DecisionPage token={TOKEN} page={withPhotos()} onSubmit={vi.fn()} />);
    const opener = screen.getByRole('button', { name: /^Photo 2 of F-1/ });
    fireEvent.click(opener);
    const viewer = screen.getByRole('dialog', { name: 'Photo 2 of F-1: Spark plug gap over the wear limit' });
    expect(viewer.getAttribute('aria-modal')).toBe('true');
    expect(within(viewer).getByRole('img').getAttribute('src')).toBe(`/api/decide/${TOKEN}/photos/${PHOTOS[1]!.id}?size=full`);
    expect(within(viewer).getByText('F-1 · photo 2 of 2')).toBeTruthy();
    const close = within(viewer).getByRole('button', { name: 'Close' });
    expect(document.activeElement).toBe(close);
    expect(document.body.style.overflow).toBe('hidden');

    // The next photo, by button and by arrow key, wrapping round.
    fireEvent.click(within(viewer).getByRole('button', { name: 'Next photo →' }));
    expect(screen.getByRole('dialog').getAttribute('aria-label')).toBe('Photo 1 of F-1: Spark plug gap over the wear limit');
    fireEvent.keyDown(screen.getByRole('dialog'), { key: 'ArrowLeft' });
    expect(screen.getByRole('dialog').getAttribute('aria-label')).toBe('Photo 2 of F-1: Spark plug gap over the wear limit');

    act(() => {
      fireEvent.keyDown(screen.getByRole('dialog'), { key: 'Escape' });
    });
    expect(screen.queryByRole('dialog')).toBeNull();
    expect(document.activeElement).toBe(opener);
    expect(document.body.style.overflow).toBe('');

    fireEvent.click(screen.getByRole('button', { name: /^Photo 1 of F-1/ }));
    fireEvent.click(within(screen.getByRole('dialog')).getByRole('button', { name: 'Close' }));
    expect(screen.queryByRole('dialog')).toBeNull();
  });

  it('when a finding has no photos, or an older snapshot has no photos field, then the page shows none and still works', () => {
    const s = snapshot();
    delete (s.findings[0] as Partial<(typeof s.findings)[number]>).photos;
    render(<DecisionPage token={TOKEN} page={page({ snapshot: s })} onSubmit={vi.fn()} />);
    expect(screen.getByText('Finding 1 of 3')).toBeTruthy();
    expect(screen.queryByTestId('decide-photos')).toBeNull();
    fireEvent.click(screen.getByRole('button', { name: 'Next finding →' }));
    expect(screen.queryByTestId('decide-photos')).toBeNull();
  });
});

describe('DecisionPage running total with shared opening-up', () => {
  it('when one of two findings sharing opening-up is approved, then the bar shows priceChoice’s figures and no footnote', () => {
    const s = snapshot();
    render(<DecisionPage token={TOKEN} page={page({ snapshot: s })} onSubmit={vi.fn()} />);
    choose('Approve');
    const bar = screen.getByTestId('running-total');
    const p = priceChoice(s.basis, { [PLUG]: 'approve' });
    // F-1 £31.00 with the cowling £15.50 (0.25 h × £62.00): £46.50 net, £55.80 incl. VAT at 20%.
    expect(p.approvingNow.gross).toBe('55.80');
    expect(within(bar).getByText('£55.80', { selector: '[data-total="this-request"]' })).toBeTruthy();
    expect(within(bar).getByText(gbp(p.undecidedGross), { selector: '[data-total="undecided"]' })).toBeTruthy();
    expect(within(bar).getByText(gbp(p.newTotal.gross), { selector: '[data-total="new-total"]' })).toBeTruthy();
    expect(bar.textContent).not.toContain('may come out lower');
    // F-2's price is its own work (£31.00 + £6.20): opening-up is its own line, so nothing needs explaining.
    fireEvent.click(screen.getByRole('button', { name: 'Next finding →' }));
    expect(within(screen.getByTestId('decide-price')).getByText('£37.20 incl. VAT')).toBeTruthy();
    expect(screen.queryByTestId('decide-adds')).toBeNull();
  });
});

describe('DecisionPage opened with an older link of a re-sent request', () => {
  it('then it shows the request closed, says a newer link was sent, and offers no choices, photos or receipt', () => {
    const s = snapshot();
    s.findings[0]!.photos = PHOTOS;
    render(
      <DecisionPage
        token={TOKEN}
        page={page({
          snapshot: s,
          closedReason: 'A newer link was sent to you on 2 Dec: use the link in the newest e-mail.',
          newerLinkSentAt: '2026-12-02T09:00:00Z',
        })}
        onSubmit={vi.fn()}
      />,
    );
    const closed = screen.getByTestId('decision-closed');
    expect(closed.getAttribute('data-superseded')).toBe('true');
    expect(within(closed).getByText('A newer link was sent to you')).toBeTruthy();
    expect(within(closed).getByText('A newer link was sent to you on 2 Dec: use the link in the newest e-mail.')).toBeTruthy();
    expect(within(closed).getByText('This request:')).toBeTruthy();
    expect(screen.queryByRole('radio')).toBeNull();
    expect(screen.queryByRole('img')).toBeNull();
    expect(screen.queryByTestId('running-total')).toBeNull();
  });
});

describe('DecisionPage new total with the committed work in the snapshot', () => {
  it('when VAT is rounded down on the invoice total, then the bar adds up to the whole-bill figure with no footnote', () => {
    // Inspection £10.03 (VAT 2.006 → 2.00), F-1 £20.03 (4.006 → 4.00); the whole bill £30.06 (6.012 → 6.01) = £36.07 [derived from VAT Notice 700 §17.5].
    const s = snapshotOf({
      rounding: 'invoice-down',
      committed: [{ id: 'i', stage: 'inspection', agreed: true, kind: 'fee', amount: '10.03', vatRate: 'standard' }],
      findings: [{ id: PLUG, lines: [fee('p', PLUG, '20.03')] }],
    });
    render(<DecisionPage token={TOKEN} page={page({ snapshot: s })} onSubmit={vi.fn()} />);
    const bar = screen.getByTestId('running-total');
    choose('Approve');
    expect(within(bar).getByText('£12.03', { selector: '[data-total="approved-so-far"]' })).toBeTruthy();
    expect(within(bar).getByText('£24.04', { selector: '[data-total="this-request"]' })).toBeTruthy();
    expect(within(bar).getByText('£36.07', { selector: '[data-total="new-total"]' })).toBeTruthy();
    // The item's price is its share of what is approved, so the figures add up and need no note.
    expect(screen.queryByTestId('decide-vat-whole-bill')).toBeNull();
  });
});
