import { priceChoice, QUOTE_ITEM_ID, STAFF_ONLY_WORDS, type ApprovalSnapshot, type ChoiceBasis, type ChoiceLine, type DecisionPageDto, type VatRounding } from '@wingstage/shared';
import { act, fireEvent, render, screen, within } from '@testing-library/react';
import { hydrateRoot } from 'react-dom/client';
import { renderToString } from 'react-dom/server';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { ApiError } from '@/lib/api-client';
import { DecisionPage, UnknownLink } from './decision-page';

const PLUG = '2f0e7a1c-3b4d-4e5f-8a6b-7c8d9e0f1a2b';
const SPRING = '8a9b0c1d-2e3f-4a5b-9c6d-7e8f9a0b1c2d';
const HOSE = 'c3d4e5f6-a7b8-4c9d-8e0f-1a2b3c4d5e6f';
const COWL = '5e6f7a8b-9c0d-4e1f-8a2b-3c4d5e6f7a8b';

const line = (kind: ChoiceLine['kind'], net: string, accessTaskId: string | null = null): ChoiceLine => ({ kind, net, vatRate: 'standard', accessTaskId });

const FINDINGS: ApprovalSnapshot['findings'] = [
  {
    findingId: PLUG,
    number: 'F-1',
    title: 'Spark plug gap over the wear limit',
    category: 'recommended',
    location: 'Engine, cylinder 1',
    seen: 'Gap measured wide.',
    measuredValue: '0.9800',
    limit: { min: null, max: '0.9', unit: 'mm', source: 'Example for the demo' },
    photos: [],
    lines: [{ description: 'Fit new plugs', quantity: '0.5', ...line('labour', '50.00', COWL) }],
    gross: '',
  },
  {
    findingId: SPRING,
    number: 'F-2',
    title: 'Exhaust spring cracked',
    category: 'airworthiness',
    location: 'Exhaust, rear cylinder',
    seen: 'Cracked at the hook.',
    measuredValue: null,
    limit: null,
    photos: [],
    lines: [{ description: 'Replace spring', quantity: '0.5', ...line('labour', '25.00', COWL) }],
    gross: '',
  },
  {
    findingId: HOSE,
    number: 'F-3',
    title: 'Fuel hose hardened',
    category: 'advisory',
    location: 'Fuel line, left',
    seen: 'Hose stiff.',
    measuredValue: null,
    limit: null,
    photos: [],
    lines: [{ description: 'New hose', quantity: '1', ...line('part', '10.00') }],
    gross: '',
  },
];

const QUOTE_LINES: NonNullable<ApprovalSnapshot['quote']>['lines'] = [
  { description: 'Annual permit inspection', quantity: '6', ...line('labour', '360.00') },
  { description: 'Oil filter', quantity: '1', ...line('part', '12.00') },
];

/**
 * A version 3 snapshot as the server freezes it: the basis, and the display prices and totals taken
 * from priceChoice with every item approved (as the server fills them). Round nets at 20% VAT, so
 * every figure below is checked by hand: agreed work £500 net → £600.00; F-1 £50 → £60.00; F-2 £25 →
 * £30.00; F-3 £10 → £12.00; the cowling £15 → £18.00; the quote £372 → £446.40.
 */
function build({ findings = 3, quote = false, rounding = 'line-nearest' as VatRounding, committed = [line('fee', '500.00')] } = {}): ApprovalSnapshot {
  const fs = FINDINGS.slice(0, findings).map((f) => ({ ...f, lines: f.lines.map((l) => ({ ...l })) }));
  const items: ChoiceBasis['items'] = [
    ...(quote ? [{ id: QUOTE_ITEM_ID, kind: 'quote' as const, lines: QUOTE_LINES.map(({ kind, net, vatRate, accessTaskId }) => ({ kind, net, vatRate, accessTaskId })) }] : []),
    ...fs.map((f) => ({ id: f.findingId, kind: 'finding' as const, lines: f.lines.map(({ kind, net, vatRate, accessTaskId }) => ({ kind, net, vatRate, accessTaskId })) })),
  ];
  const needsCowl = items.some((i) => i.lines.some((l) => l.accessTaskId === COWL));
  const basis: ChoiceBasis = {
    currency: 'GBP',
    rounding,
    vatRates: { standard: '20', reduced: '5', zero: '0' },
    committed: { lines: committed, accessTasks: [] },
    items,
    accessTasks: needsCowl ? [{ id: COWL, name: 'Cowling off', net: '15.00', vatRate: 'standard' }] : [],
  };
  const all = priceChoice(basis, Object.fromEntries(items.map((i) => [i.id, 'approve' as const])));
  const fixed = (id: string) => all.items.find((i) => i.id === id)!.allApprovedGross;
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
    workshopPhone: '01632 960418',
    workshopEmail: 'office@brackenfold.example',
    currency: 'GBP',
    rounding,
    message: 'Two things turned up.',
    sentAt: '2026-12-01T10:00:00Z',
    expiresAt: '2026-12-08T10:00:00Z',
    basis,
    quote: quote ? { lines: QUOTE_LINES, gross: fixed(QUOTE_ITEM_ID), changeOf: 'first' } : null,
    findings: fs.map((f) => ({ ...f, gross: fixed(f.findingId) })),
    totals: {
      quoted: all.agreedSoFar,
      agreedSoFar: all.agreedSoFar,
      ifAllApproved: all.ifAllApproved,
      approvingNow: all.approvingNow,
      openingUp: all.openingUp.map((o) => ({ id: o.id, name: o.name, gross: o.allApprovedGross, neededBy: o.neededBy })),
    },
  };
}

const snapshot = (over: Partial<ApprovalSnapshot> = {}): ApprovalSnapshot => ({ ...build(), ...over });

// Each test starts with nothing kept on the device (jsdom's localStorage lives for the whole file).
beforeEach(() => localStorage.clear());

const HASH = 'a'.repeat(64);
const TOKEN = 'tok_en-123';
const page = (over: Partial<DecisionPageDto> = {}): DecisionPageDto => ({
  state: 'sent',
  closedReason: null,
  newerLinkSentAt: null,
  snapshot: snapshot(),
  snapshotHash: HASH,
  expiresAt: '2026-12-08T10:00:00Z',
  decisions: null,
  decidedByName: null,
  decidedAt: null,
  ...over,
});

function choose(name: 'Approve' | 'Accept' | 'Decline') {
  fireEvent.click(screen.getByRole('radio', { name: new RegExp(`^${name}`) }));
}

const total = (which: string) => within(screen.getByTestId('running-total')).getByText(/./, { selector: `[data-total="${which}"]` }).textContent;

describe('DecisionPage', () => {
  it('shows one finding at a time with its category, measurement, its price without opening-up, and the opening-up it needs as its own figure', () => {
    render(<DecisionPage token={TOKEN} page={page()} onSubmit={vi.fn()} />);
    expect(screen.getByText('Finding 1 of 3')).toBeTruthy();
    expect(screen.getByRole('heading', { level: 1 }).textContent).toBe('Work found on Q-SALT');
    expect(screen.getByText('Waiting for your decision')).toBeTruthy();
    expect(screen.getAllByTestId('decide-finding')).toHaveLength(1);
    expect(screen.getByText('Recommended')).toBeTruthy();
    expect(screen.getByText('0.98 mm; the example limit is at most 0.9 mm')).toBeTruthy();
    const price = screen.getByTestId('decide-price');
    // £50 net + 20% VAT = £60.00; the cowling £15 + 20% = £18.00, shown apart.
    expect(within(price).getByText('£60.00 incl. VAT')).toBeTruthy();
    expect(within(price).getByTestId('decide-needs-opening-up').textContent).toMatch(/“Cowling off”\): £18\.00 incl\. VAT, shown on its own line and charged once, however many/);
    expect(total('agreed-so-far')).toBe('£600.00');
    expect(total('approving-now')).toBe('£0.00');
    // Everything if approved: 60 + 30 + 12 + 18.
    expect(total('undecided')).toBe('£120.00');
    // Nothing chosen yet: no new total to show.
    expect(total('new-total')).toBe('Shown once you choose');
    choose('Decline');
    expect(total('new-total')).toBe('£600.00');
  });

  it('when an airworthiness finding is declined, then the page says Wingstage will not mark it ready for release and that flying is the inspector’s decision, never that the software decides', () => {
    render(<DecisionPage token={TOKEN} page={page()} onSubmit={vi.fn()} />);
    fireEvent.click(screen.getByRole('button', { name: 'Next finding →' }));
    expect(screen.getByText('Finding 2 of 3')).toBeTruthy();
    expect(screen.queryByText(/ready for release/)).toBeNull();
    choose('Decline');
    const warning = screen.getByTestId('declined-airworthiness');
    expect(warning.textContent).toContain('This is an airworthiness item');
    expect(warning.textContent).toContain('While it is open, we will not mark Q-SALT ready for release in Wingstage.');
    expect(warning.textContent).toContain("Whether the aircraft may fly is the inspector's decision under the authority's rules");
    expect(warning.textContent).not.toMatch(/cannot be (released|left open)/);
    // It is the airworthiness mark, not an error: no alert role.
    expect(screen.queryByRole('alert')).toBeNull();
    // Declining advisory work carries no such warning.
    fireEvent.click(screen.getByRole('button', { name: 'Next finding →' }));
    choose('Decline');
    expect(screen.queryByText(/ready for release/)).toBeNull();
  });

  it('when the owner reviews and confirms, then the hash, every item’s decision with its note and the typed name are sent', async () => {
    const onSubmit = vi.fn().mockResolvedValue(undefined);
    render(<DecisionPage token={TOKEN} page={page()} onSubmit={onSubmit} />);
    choose('Approve');
    fireEvent.click(screen.getByRole('button', { name: 'Next finding →' }));
    choose('Decline');
    fireEvent.change(screen.getByLabelText('A note for the workshop (optional)'), { target: { value: 'Spring from our stores.' } });
    fireEvent.click(screen.getByRole('button', { name: 'Next finding →' }));
    // The review refuses to confirm while an item has no decision, and says which.
    fireEvent.click(screen.getByRole('button', { name: 'Check your choices' }));
    expect((screen.getByRole('button', { name: 'Confirm decisions' }) as HTMLButtonElement).disabled).toBe(true);
    fireEvent.click(screen.getByRole('button', { name: 'Go to F-3' }));
    choose('Approve');
    // Reached from the review, the finding's one button goes straight back to it.
    fireEvent.click(screen.getByRole('button', { name: 'Back to your choices' }));
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
    render(<DecisionPage token={TOKEN} page={page({ snapshot: build({ findings: 1 }) })} onSubmit={onSubmit} onReload={onReload} />);
    choose('Approve');
    fireEvent.click(screen.getByRole('button', { name: 'Check your choices' }));
    fireEvent.change(screen.getByLabelText('Type your full name to confirm'), { target: { value: 'Hazel Brambury' } });
    fireEvent.click(screen.getByRole('button', { name: 'Confirm decisions' }));
    expect(await screen.findByText('The workshop changed something on this request: reload the page to see the latest.')).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Reload this page' }));
    expect(onReload).toHaveBeenCalled();
  });

  it("when the request is closed, then the server's reason is shown in plain words and no choices are offered", () => {
    render(<DecisionPage token={TOKEN} page={page({ state: 'replaced', closedReason: 'The workshop changed a price after sending, so a newer request replaced this one. Look for it in your e-mail.' })} onSubmit={vi.fn()} />);
    expect(screen.getByText('A newer request replaced this one')).toBeTruthy();
    // The owner's own word for the state, never the staff badge's "Replaced".
    expect(screen.getByText('A newer link was sent')).toBeTruthy();
    expect(screen.queryByText('Replaced')).toBeNull();
    expect(screen.getByText(/a newer request replaced this one/)).toBeTruthy();
    expect(screen.queryByRole('radio')).toBeNull();
  });

  it('when the request is decided, then the receipt lists each decision, the opening-up once, and figures that add up to the new total', () => {
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
    expect(receipt.textContent).toContain('While it is open, we will not mark Q-SALT ready for release in Wingstage.');
    expect(screen.getByTestId('receipt-contact').textContent).toBe('To change a decision, contact Brackenfold Light Aircraft Engineering: 01632 960418, office@brackenfold.example.');
    expect(receipt.querySelector('[data-receipt="F-1"]')!.textContent).toContain('£60.00 incl. VAT');
    expect(receipt.querySelector('[data-receipt="F-3"]')!.textContent).toContain('£12.00 incl. VAT, not included');
    const opening = receipt.querySelectorAll('[data-opening-up]');
    expect(opening).toHaveLength(1);
    expect(opening[0]!.textContent).toContain('Opening-up work shared by F-1 and F-2');
    expect(opening[0]!.textContent).toContain('£18.00 incl. VAT');
    // 60.00 + 18.00 = 78.00; 600.00 + 78.00 = 678.00.
    expect(within(receipt).getByTestId('choice-rows-total').textContent).toBe('You approved, incl. VAT£78.00');
    expect(within(receipt).getByText('£678.00', { selector: '[data-total="new-total"]' })).toBeTruthy();
  });
});

describe('DecisionPage running total from priceChoice', () => {
  it('when one of two findings sharing opening-up is approved, then the opening-up is counted once and the figures add up', () => {
    render(<DecisionPage token={TOKEN} page={page()} onSubmit={vi.fn()} />);
    choose('Approve');
    // F-1 £60.00 + the cowling £18.00.
    expect(total('approving-now')).toBe('£78.00');
    // Still open if approved: F-2 £30.00 (the cowling is already counted) + F-3 £12.00.
    expect(total('undecided')).toBe('£42.00');
    expect(total('new-total')).toBe('£678.00');
    // F-2, with F-1 approved, adds only its own work, and says why.
    fireEvent.click(screen.getByRole('button', { name: 'Next finding →' }));
    expect(within(screen.getByTestId('decide-price')).getByText('£30.00 incl. VAT')).toBeTruthy();
    expect(screen.getByTestId('decide-needs-opening-up').textContent).toContain('already counted once for other work you approved');
    choose('Approve');
    fireEvent.click(screen.getByRole('button', { name: 'Next finding →' }));
    choose('Decline');
    fireEvent.click(screen.getByRole('button', { name: 'Check your choices' }));
    expect(document.querySelector('[data-review="F-1"]')!.textContent).toContain('£60.00 incl. VAT');
    expect(document.querySelector('[data-review="F-2"]')!.textContent).toContain('£30.00 incl. VAT');
    expect(document.querySelectorAll('[data-opening-up]')).toHaveLength(1);
    // 60 + 30 + 18 = 108, the same figure the bar shows: no footnote needed.
    expect(screen.getByTestId('choice-rows-total').textContent).toBe('You are approving, incl. VAT£108.00');
    expect(total('approving-now')).toBe('£108.00');
  });

  it('when VAT is rounded down on the invoice total, then what the finding adds is the whole-bill difference and the rows still add up to it', () => {
    // Agreed £10.03 (VAT 2.006 → 2.00, £12.03), F-1 £20.03; the whole bill £30.06 (VAT 6.012 → 6.01) = £36.07,
    // so approving F-1 adds £24.04 [derived from VAT Notice 700 §17.5].
    const s = build({ findings: 1, rounding: 'invoice-down', committed: [line('labour', '10.03')] });
    s.basis.items[0]!.lines = [line('fee', '20.03')];
    s.basis.accessTasks = [];
    render(<DecisionPage token={TOKEN} page={page({ snapshot: s })} onSubmit={vi.fn()} />);
    expect(total('agreed-so-far')).toBe('£12.03');
    choose('Approve');
    expect(total('approving-now')).toBe('£24.04');
    expect(total('new-total')).toBe('£36.07');
    fireEvent.click(screen.getByRole('button', { name: 'Check your choices' }));
    expect(document.querySelector('[data-review="F-1"]')!.textContent).toContain('£24.04 incl. VAT');
    expect(screen.getByTestId('choice-rows-total').textContent).toContain('£24.04');
  });
});

describe('DecisionPage with the quote in the request', () => {
  it('when the request holds the quote, then it comes first with its lines and price, and accepting it counts it', () => {
    render(<DecisionPage token={TOKEN} page={page({ snapshot: build({ quote: true, findings: 1, committed: [] }) })} onSubmit={vi.fn()} />);
    expect(screen.getByRole('heading', { level: 1 }).textContent).toBe('Our quote and work found on Q-SALT');
    expect(screen.getByText('1 of 2 · The quote')).toBeTruthy();
    const lines = screen.getByTestId('decide-quote-lines');
    expect(within(lines).getByText('Annual permit inspection')).toBeTruthy();
    expect(within(lines).getByText('6 h')).toBeTruthy();
    // £372.00 net + 20% = £446.40.
    expect(within(screen.getByTestId('decide-price')).getByText('£446.40 incl. VAT')).toBeTruthy();
    expect(total('agreed-so-far')).toBe('£0.00');
    // Before the owner has chosen anything there is no new total: never "£0.00" beside a quote of £446.40.
    expect(total('new-total')).toBe('Shown once you choose');
    expect(screen.getByTestId('running-total').textContent).not.toContain('New total, incl. VAT £0.00');
    choose('Accept');
    expect(total('approving-now')).toBe('£446.40');
    expect(total('new-total')).toBe('£446.40');
    fireEvent.click(screen.getByRole('button', { name: 'On to what we found →' }));
    expect(screen.getByText('2 of 2 · Finding F-1')).toBeTruthy();
    choose('Approve');
    // 446.40 + 60.00 + 18.00.
    expect(total('new-total')).toBe('£524.40');
  });

  it('when the owner declines the quote, then the page says the work waits for them, and the quote is sent as item "quote"', async () => {
    const onSubmit = vi.fn().mockResolvedValue(undefined);
    render(<DecisionPage token={TOKEN} page={page({ snapshot: build({ quote: true, findings: 0, committed: [] }) })} onSubmit={onSubmit} />);
    expect(screen.getByRole('heading', { level: 1 }).textContent).toBe('Our quote for Q-SALT');
    choose('Decline');
    expect(screen.getByText(/We will not start the quoted work without your agreement/)).toBeTruthy();
    expect(total('approving-now')).toBe('£0.00');
    fireEvent.change(screen.getByLabelText('A note for the workshop (optional)'), { target: { value: 'Please ring me.' } });
    fireEvent.click(screen.getByRole('button', { name: 'Check your choices' }));
    expect(document.querySelector('[data-review="quote"]')!.textContent).toContain('£446.40 incl. VAT, not included');
    fireEvent.change(screen.getByLabelText('Type your full name to confirm'), { target: { value: 'Hazel Brambury' } });
    fireEvent.click(screen.getByRole('button', { name: 'Confirm decisions' }));
    await vi.waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0]![0].decisions).toEqual([{ itemId: 'quote', decision: 'decline', note: 'Please ring me.' }]);
  });

  it('when "Change the quote" is used on the review, then only the quote opens and the button goes back to the review', () => {
    render(<DecisionPage token={TOKEN} page={page({ snapshot: build({ quote: true, findings: 1, committed: [] }) })} onSubmit={vi.fn()} />);
    choose('Accept');
    fireEvent.click(screen.getByRole('button', { name: 'On to what we found →' }));
    choose('Approve');
    fireEvent.click(screen.getByRole('button', { name: 'Check your choices' }));
    fireEvent.click(screen.getByRole('button', { name: 'Change the quote' }));
    expect(screen.getByText('1 of 2 · The quote')).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Back to your choices' }));
    expect(screen.getByRole('heading', { name: 'Check your choices' })).toBeTruthy();
    expect(document.querySelector('[data-review="quote"]')!.textContent).toContain('Accepted');
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

describe('DecisionPage sent as the server’s first view', () => {
  it('when the markup arrives before React owns it, then its choices cannot be ticked; once hydrated they can, and a choice counts and is kept', async () => {
    const tree = <DecisionPage token={TOKEN} page={page()} onSubmit={vi.fn()} />;
    const html = renderToString(tree);
    const host = document.createElement('div');
    host.innerHTML = html;
    document.body.append(host);
    const approve = host.querySelector<HTMLInputElement>('input[type="radio"][value="approve"]')!;
    // A tick on the server's markup would show on screen but never reach the page: it is held off.
    expect(approve.matches(':disabled')).toBe(true);
    const problems: unknown[] = [];
    await act(async () => {
      hydrateRoot(host, tree, { onRecoverableError: (e) => problems.push(e) });
    });
    expect(problems).toEqual([]);
    // React kept the server's elements (no fresh render) and let them go.
    expect(host.querySelector('input[type="radio"][value="approve"]')).toBe(approve);
    expect(approve.matches(':disabled')).toBe(false);
    fireEvent.click(approve);
    expect(within(host).getByText(/./, { selector: '[data-total="approving-now"]' }).textContent).toBe('£78.00');
    expect(localStorage.getItem(`wingstage.decision-draft.${snapshot().requestId}`)).toContain('"approve"');
    host.remove();
  });
});

describe('DecisionPage keeps the owner’s choices on the device until they confirm', () => {
  const DRAFT_KEY = `wingstage.decision-draft.${snapshot().requestId}`;

  it('when the page is reloaded half-way through, then the choices, the note and the place come back, and nothing is sent by itself', () => {
    const onSubmit = vi.fn();
    const first = render(<DecisionPage token={TOKEN} page={page()} onSubmit={onSubmit} />);
    choose('Approve');
    fireEvent.click(screen.getByRole('button', { name: 'Next finding →' }));
    choose('Decline');
    fireEvent.change(screen.getByLabelText('A note for the workshop (optional)'), { target: { value: 'Please ring me.' } });
    first.unmount();

    render(<DecisionPage token={TOKEN} page={page()} onSubmit={onSubmit} />);
    expect(screen.getByText('Finding 2 of 3')).toBeTruthy();
    expect(screen.getByTestId('draft-restored').textContent).toContain('Nothing is sent until you confirm');
    expect((screen.getByRole('radio', { name: /^Decline/ }) as HTMLInputElement).checked).toBe(true);
    expect((screen.getByLabelText('A note for the workshop (optional)') as HTMLTextAreaElement).value).toBe('Please ring me.');
    fireEvent.click(screen.getByRole('button', { name: '← Back' }));
    expect((screen.getByRole('radio', { name: /^Approve/ }) as HTMLInputElement).checked).toBe(true);
    expect(onSubmit).not.toHaveBeenCalled();
  });

  it('when the owner confirms, then the kept choices are cleared from the device', async () => {
    const onSubmit = vi.fn().mockResolvedValue(undefined);
    render(<DecisionPage token={TOKEN} page={page({ snapshot: build({ findings: 1 }) })} onSubmit={onSubmit} />);
    choose('Approve');
    expect(localStorage.getItem(DRAFT_KEY)).not.toBeNull();
    fireEvent.click(screen.getByRole('button', { name: 'Check your choices' }));
    fireEvent.change(screen.getByLabelText('Type your full name to confirm'), { target: { value: 'Hazel Brambury' } });
    fireEvent.click(screen.getByRole('button', { name: 'Confirm decisions' }));
    await vi.waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    await vi.waitFor(() => expect(localStorage.getItem(DRAFT_KEY)).toBeNull());
  });

  it('when the confirmation is refused, then the kept choices stay on the device', async () => {
    const onSubmit = vi.fn().mockRejectedValue(new ApiError({ code: 'conflict', status: 409, message: 'The workshop changed something on this request: reload the page to see the latest.' }));
    render(<DecisionPage token={TOKEN} page={page({ snapshot: build({ findings: 1 }) })} onSubmit={onSubmit} />);
    choose('Approve');
    fireEvent.click(screen.getByRole('button', { name: 'Check your choices' }));
    fireEvent.change(screen.getByLabelText('Type your full name to confirm'), { target: { value: 'Hazel Brambury' } });
    fireEvent.click(screen.getByRole('button', { name: 'Confirm decisions' }));
    expect(await screen.findByText(/The workshop changed something/)).toBeTruthy();
    expect(localStorage.getItem(DRAFT_KEY)).not.toBeNull();
  });

  it('when the request now has a different hash, then the kept choices are cleared with a plain message and the page starts afresh', () => {
    const first = render(<DecisionPage token={TOKEN} page={page()} onSubmit={vi.fn()} />);
    choose('Approve');
    first.unmount();
    render(<DecisionPage token={TOKEN} page={page({ snapshotHash: 'b'.repeat(64) })} onSubmit={vi.fn()} />);
    expect(screen.getByTestId('draft-discarded').textContent).toContain('The workshop changed this request after you started');
    expect(screen.getByText('Finding 1 of 3')).toBeTruthy();
    expect((screen.getByRole('radio', { name: /^Approve/ }) as HTMLInputElement).checked).toBe(false);
    expect(screen.queryByTestId('draft-restored')).toBeNull();
    expect(localStorage.getItem(DRAFT_KEY)).toBeNull();
  });

  it('when the request was replaced meanwhile, then the closed page says the unconfirmed choices were cleared and nothing was sent', () => {
    const first = render(<DecisionPage token={TOKEN} page={page()} onSubmit={vi.fn()} />);
    choose('Decline');
    first.unmount();
    render(<DecisionPage token={TOKEN} page={page({ state: 'replaced', closedReason: 'A newer request replaced this one.' })} onSubmit={vi.fn()} />);
    expect(within(screen.getByTestId('decision-closed')).getByTestId('draft-discarded').textContent).toContain('Nothing was sent');
    expect(localStorage.getItem(DRAFT_KEY)).toBeNull();
  });

  it('when the request was decided on another device, then the receipt shows what was recorded and says the draft here was cleared', () => {
    const first = render(<DecisionPage token={TOKEN} page={page()} onSubmit={vi.fn()} />);
    choose('Decline');
    first.unmount();
    render(
      <DecisionPage
        token={TOKEN}
        page={page({
          state: 'decided',
          closedReason: 'You decided this request on 1 Dec 2026.',
          decisions: snapshot().findings.map((f) => ({ itemId: f.findingId, decision: 'approve' as const, note: '' })),
          decidedByName: 'Hazel Brambury',
          decidedAt: '2026-12-01T12:30:00Z',
        })}
        onSubmit={vi.fn()}
      />,
    );
    expect(within(screen.getByTestId('decision-receipt')).getByTestId('draft-discarded').textContent).toContain('These decisions were already recorded');
    expect(localStorage.getItem(DRAFT_KEY)).toBeNull();
  });

  it('when the kept draft names a finding this request does not hold, then it is cleared and never used', () => {
    localStorage.setItem(
      DRAFT_KEY,
      JSON.stringify({ v: 1, snapshotHash: HASH, choices: { 'd4e5f6a7-b8c9-4d0e-8f1a-2b3c4d5e6f7a': 'approve' }, notes: {}, step: 1, savedAt: new Date().toISOString() }),
    );
    render(<DecisionPage token={TOKEN} page={page()} onSubmit={vi.fn()} />);
    expect(screen.getByTestId('draft-discarded').textContent).toContain('did not match this request');
    expect(screen.getByText('Finding 1 of 3')).toBeTruthy();
  });

  it('when "Change" is used on the review, then the one finding opens and its button goes straight back to the review', () => {
    render(<DecisionPage token={TOKEN} page={page()} onSubmit={vi.fn()} />);
    choose('Approve');
    fireEvent.click(screen.getByRole('button', { name: 'Next finding →' }));
    choose('Approve');
    fireEvent.click(screen.getByRole('button', { name: 'Next finding →' }));
    choose('Approve');
    fireEvent.click(screen.getByRole('button', { name: 'Check your choices' }));
    fireEvent.click(screen.getByRole('button', { name: 'Change F-1' }));
    expect(screen.getByText('Finding 1 of 3')).toBeTruthy();
    expect(screen.queryByRole('button', { name: '← Back' })).toBeNull();
    choose('Decline');
    fireEvent.click(screen.getByRole('button', { name: 'Back to your choices' }));
    expect(screen.getByRole('heading', { name: 'Check your choices' })).toBeTruthy();
    expect(within(screen.getByText('F-1', { selector: '[data-review] span' }).closest('li')!).getByText('Declined')).toBeTruthy();
    // Walking on normally afterwards still goes finding by finding.
    fireEvent.click(screen.getByRole('button', { name: 'Change F-2' }));
    fireEvent.click(screen.getByRole('button', { name: 'Back to your choices' }));
    expect(screen.getByRole('heading', { name: 'Check your choices' })).toBeTruthy();
  });
});

describe('DecisionPage in the owner’s words', () => {
  it('when the link was re-sent, then the page shows the request’s current expiry, not the first send’s', () => {
    render(<DecisionPage token={TOKEN} page={page({ expiresAt: '2026-12-15T10:00:00Z' })} onSubmit={vi.fn()} />);
    const until = screen.getByText(/^This link works until/).textContent!;
    expect(until).toContain('15');
    expect(until).not.toContain('8 Dec');
  });

  it('when the running total is shown, then it uses the one name for the agreed total and the owner’s name for the undecided one', () => {
    render(<DecisionPage token={TOKEN} page={page()} onSubmit={vi.fn()} />);
    const bar = screen.getByTestId('running-total');
    expect(bar.textContent).toContain('Agreed so far');
    expect(bar.textContent).toContain('Waiting for your decision, if approved');
    expect(bar.textContent).not.toContain('Not yet decided');
    expect(bar.textContent).not.toContain('Approved so far');
  });

  it('when the typed name is missing, then its error carries the error mark, not the airworthiness mark', () => {
    render(<DecisionPage token={TOKEN} page={page({ snapshot: snapshot({ ...build({ findings: 1 }) }) })} onSubmit={vi.fn()} />);
    choose('Approve');
    fireEvent.click(screen.getByRole('button', { name: 'Check your choices' }));
    fireEvent.click(screen.getByRole('button', { name: 'Confirm decisions' }));
    const error = screen.getByRole('alert');
    expect(error.textContent).toBe('Type your name to confirm.');
    expect(error.className).toContain('text-fault');
    expect(error.className).not.toContain('ember');
  });

  it('when the workshop revoked the link, then the page says "revoked", in the owner’s words, with the workshop’s phone and e-mail', () => {
    render(<DecisionPage token={TOKEN} page={page({ state: 'revoked', closedReason: null })} onSubmit={vi.fn()} />);
    const closed = screen.getByTestId('decision-closed');
    expect(within(closed).getByText('The workshop revoked this link')).toBeTruthy();
    expect(within(closed).getByText('Revoked by the workshop')).toBeTruthy();
    expect(closed.textContent).toContain('Please contact Brackenfold Light Aircraft Engineering: 01632 960418, office@brackenfold.example.');
    expect(closed.textContent).not.toMatch(/withdr[ae]w/);
  });

  it('when an older request carries no workshop contact, then the page names the workshop alone', () => {
    const { workshopPhone: _p, workshopEmail: _e, ...old } = snapshot();
    render(<DecisionPage token={TOKEN} page={page({ state: 'expired', closedReason: null, snapshot: old })} onSubmit={vi.fn()} />);
    expect(screen.getByTestId('decision-closed').textContent).toContain('Please contact Brackenfold Light Aircraft Engineering.');
  });

  it('when a link was never issued, then the heading does not say it once worked', () => {
    render(<UnknownLink />);
    expect(screen.getByRole('heading').textContent).toBe('This link does not open a request');
  });

  it('when the owner walks a quote and findings request, then no step, the review, the receipt or any closed state shows a staff-only word', () => {
    const seen: string[] = [];
    const s = snapshot({ ...build({ quote: true }) });
    const { unmount } = render(<DecisionPage token={TOKEN} page={page({ snapshot: s })} onSubmit={vi.fn()} />);
    seen.push(document.body.textContent!);
    choose('Accept');
    fireEvent.click(screen.getByRole('button', { name: 'On to what we found →' }));
    // F-1 approved, then the airworthiness F-2 and the advisory F-3 declined: each step before and after choosing.
    (['Approve', 'Decline', 'Decline'] as const).forEach((d, i) => {
      seen.push(document.body.textContent!);
      choose(d);
      seen.push(document.body.textContent!);
      fireEvent.click(screen.getByRole('button', { name: i === 2 ? 'Check your choices' : 'Next finding →' }));
    });
    expect(screen.getByRole('heading', { name: 'Check your choices' })).toBeTruthy();
    seen.push(document.body.textContent!);
    unmount();
    const decided = { decidedByName: 'Hazel Brambury', decidedAt: '2026-12-01T12:30:00Z' };
    const decisions = [
      { itemId: QUOTE_ITEM_ID, decision: 'approve' as const, note: '' },
      ...s.findings.map((f, i) => ({ itemId: f.findingId, decision: i === 0 ? ('approve' as const) : ('decline' as const), note: '' })),
    ];
    const closedPages: Partial<DecisionPageDto>[] = [
      { state: 'decided', decisions, ...decided, closedReason: 'This request was already decided.' },
      { state: 'decided', closedReason: 'A newer link was sent to you on 2 Dec, and the request has since been decided.', newerLinkSentAt: '2026-12-02T09:00:00Z' },
      { state: 'expired', closedReason: null },
      { state: 'revoked', closedReason: null },
      { state: 'replaced', closedReason: null },
    ];
    for (const over of closedPages) {
      const r = render(<DecisionPage token={TOKEN} page={page({ snapshot: s, ...over })} onSubmit={vi.fn()} storage={null} />);
      expect(screen.queryByRole('radio')).toBeNull();
      seen.push(document.body.textContent!);
      r.unmount();
    }
    // The introduction, three findings before and after choosing, the review, the receipt and four closed pages.
    expect(seen).toHaveLength(13);
    for (const text of seen) for (const word of STAFF_ONLY_WORDS) expect(text, word).not.toContain(word);
  });
});
