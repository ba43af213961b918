import type { ApprovalSnapshot, DecisionPageDto, Totals } from '@wingstage/shared';
import { act, fireEvent, render, screen, within } from '@testing-library/react';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { ApiError } from '@/lib/api-client';
import { DecisionPage } from './decision-page';
import { runningTotal } from './running-total';

const totals = (net: string, vat: string, gross: string): Totals => ({ net, vat, gross, byRate: [{ code: 'standard', rate: '20', net, vat }] });

const PLUG = '2f0e7a1c-3b4d-4e5f-8a6b-7c8d9e0f1a2b';
const SPRING = '8a9b0c1d-2e3f-4a5b-9c6d-7e8f9a0b1c2d';
const HOSE = 'c3d4e5f6-a7b8-4c9d-8e0f-1a2b3c4d5e6f';

function snapshot(over: Partial<ApprovalSnapshot> = {}): ApprovalSnapshot {
  return {
    requestId: '0b1c2d3e-4f5a-4b6c-8d7e-9f0a1b2c3d4e',
    jobId: '1c2d3e4f-5a6b-4c7d-8e9f-0a1b2c3d4e5f',
    jobNumber: 'J-0042',
    jobTitle: 'Annual permit inspection',
    registration: 'Q-SALT',
    aircraftType: 'Three-axis high-wing microlight',
    ownerName: 'Hazel Brambury',
    workshopName: 'Brackenfold Light Aircraft Engineering',
    currency: 'GBP',
    rounding: 'line-nearest',
    message: 'Two things turned up.',
    sentAt: '2026-12-01T10:00:00Z',
    expiresAt: '2026-12-08T10:00:00Z',
    findings: [
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
        lines: [{ description: 'Fit new plugs', kind: 'labour', quantity: '0.5', net: '31.00' }],
        price: totals('63.64', '12.73', '76.37'),
        accessCovered: ['Cowling off'],
        accessSavingGross: '18.60',
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
        lines: [{ description: 'Replace spring', kind: 'labour', quantity: '0.5', net: '31.00' }],
        price: totals('31.00', '6.20', '37.20'),
        accessCovered: [],
        accessSavingGross: '0.00',
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
        lines: [],
        price: totals('10.01', '2.00', '12.01'),
        accessCovered: [],
        accessSavingGross: '0.00',
      },
    ],
    totals: {
      quoted: totals('463.44', '92.69', '556.13'),
      approvedSoFar: totals('463.44', '92.69', '556.13'),
      // Less than the three prices added up: shared opening-up is charged once across the request.
      thisRequest: totals('100.00', '20.00', '120.00'),
      undecidedElsewhere: totals('5.00', '1.00', '6.00'),
    },
    ...over,
  };
}

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
  decisions: null,
  decidedByName: null,
  decidedAt: null,
  ...over,
});

// These snapshots predate the pricing basis: the page adds up the findings' own prices.
describe('runningTotal for a snapshot without a pricing basis', () => {
  it('when nothing is chosen yet, then this request counts nothing and every price is undecided, plus the work awaiting a decision elsewhere', () => {
    const t = runningTotal(snapshot(), {});
    // The whole request undecided is the engine's request total (120.00, shared opening-up once) plus 6.00 elsewhere.
    expect(t).toMatchObject({ quoted: '556.13', approvedSoFar: '556.13', thisRequestAsChosen: '0.00', undecided: '126.00', newTotal: '556.13', sharesOpeningUp: true, exact: false, chosen: 0, of: 3 });
  });

  it('when some findings are approved and one declined, then the sums are exact to the penny from the snapshot figures', () => {
    const t = runningTotal(snapshot(), { [PLUG]: 'approve', [SPRING]: 'decline' });
    // 76.37 approved; 12.01 still open + 6.00 elsewhere; 556.13 + 76.37.
    expect(t).toMatchObject({ thisRequestAsChosen: '76.37', undecided: '18.01', newTotal: '632.50', chosen: 2 });
  });

  it("when every finding is approved, then the engine's own request total is used, so shared opening-up is not counted twice", () => {
    const t = runningTotal(snapshot(), { [PLUG]: 'approve', [SPRING]: 'approve', [HOSE]: 'approve' });
    expect(t.thisRequestAsChosen).toBe('120.00');
    expect(t.newTotal).toBe('676.13');
    expect(t.undecided).toBe('6.00');
  });

  it('when figures would drift as floats (0.1 + 0.2), then the decimal sum stays exact', () => {
    const s = snapshot();
    s.findings[0]!.price = totals('0.10', '0.00', '0.10');
    s.findings[1]!.price = totals('0.20', '0.00', '0.20');
    expect(runningTotal(s, { [PLUG]: 'approve', [SPRING]: 'approve' }).thisRequestAsChosen).toBe('0.30');
  });
});

function choose(name: 'Approve' | 'Decline') {
  fireEvent.click(screen.getByRole('radio', { name: new RegExp(`^${name}`) }));
}

describe('DecisionPage', () => {
  it('shows one finding at a time with its category, measurement, price incl. VAT and the access saving in words', () => {
    render(<DecisionPage token={TOKEN} page={page()} onSubmit={vi.fn()} />);
    expect(screen.getByText('Finding 1 of 3')).toBeTruthy();
    expect(screen.getAllByTestId('decide-finding')).toHaveLength(1);
    expect(screen.getByText('Recommended')).toBeTruthy();
    expect(screen.getByText('0.98 mm; the example limit is at most 0.9 mm')).toBeTruthy();
    expect(within(screen.getByTestId('decide-price')).getByText('£76.37 incl. VAT')).toBeTruthy();
    expect(within(screen.getByTestId('decide-price')).getByText('£63.64 excl. VAT')).toBeTruthy();
    expect(screen.getByText(/“Cowling off”.*saves you £18\.60 incl\. VAT/)).toBeTruthy();
    expect(within(screen.getByTestId('running-total')).getByText('£556.13', { selector: '[data-total="quoted"]' })).toBeTruthy();
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

  it('when the owner reviews and confirms, then the hash, every decision with its note and the typed name are sent', async () => {
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
        { findingId: PLUG, decision: 'approve', note: '' },
        { findingId: SPRING, decision: 'decline', note: 'Spring from our stores.' },
        { findingId: HOSE, decision: 'approve', note: '' },
      ],
    });
  });

  it('when the server refuses because the workshop changed something, then the reason is shown with a way to reload', async () => {
    const onSubmit = vi.fn().mockRejectedValue(new ApiError({ code: 'conflict', status: 409, message: 'The workshop changed something on this request: reload the page to see the latest.' }));
    const onReload = vi.fn();
    render(<DecisionPage token={TOKEN} page={page({ snapshot: snapshot({ findings: snapshot().findings.slice(0, 1) }) })} onSubmit={onSubmit} onReload={onReload} />);
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

  it('when the request is decided, then a receipt lists each decision, who made it and when', () => {
    render(
      <DecisionPage
        token={TOKEN}
        page={page({
          state: 'decided',
          closedReason: 'You decided this request on 1 Dec 2026.',
          decisions: [
            { findingId: PLUG, decision: 'approve', note: '' },
            { findingId: SPRING, decision: 'decline', note: 'Later.' },
            { findingId: HOSE, decision: 'decline', note: '' },
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
    expect(within(receipt).getByText('£632.50', { selector: '[data-total="new-total"]' })).toBeTruthy();
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

describe('DecisionPage running total with a pricing basis', () => {
  it('when one of two findings sharing opening-up is approved, then the bar shows the engine figure and no "may come out lower" note', () => {
    const COWL = '5e6f7a8b-9c0d-4e1f-8a2b-3c4d5e6f7a8b';
    const base = snapshot();
    const s: ApprovalSnapshot = {
      ...base,
      findings: [
        { ...base.findings[0]!, lines: [{ description: 'Fit new plugs', kind: 'labour', quantity: '0.5', net: '31.00', vatRate: 'standard', accessTaskId: COWL }], price: totals('46.50', '9.30', '55.80') },
        { ...base.findings[1]!, lines: [{ description: 'Replace spring', kind: 'labour', quantity: '0.5', net: '31.00', vatRate: 'standard', accessTaskId: COWL }], price: totals('46.50', '9.30', '55.80') },
      ],
      pricingBasis: { vatRates: { standard: '20', reduced: '5', zero: '0' }, accessTasks: [{ id: COWL, name: 'Cowling off', net: '15.50', vatRate: 'standard' }], accessPaid: [] },
      // 31.00 + 31.00 + 15.50 = 77.50; VAT 15.50; 93.00.
      totals: { ...base.totals, thisRequest: totals('77.50', '15.50', '93.00') },
    };
    render(<DecisionPage token={TOKEN} page={page({ snapshot: s })} onSubmit={vi.fn()} />);
    choose('Approve');
    const bar = screen.getByTestId('running-total');
    // F-1 with the cowling: 55.80. Still open: F-2 without it, 31.00 + 6.20 = 37.20, plus 6.00 elsewhere.
    expect(within(bar).getByText('£55.80', { selector: '[data-total="this-request"]' })).toBeTruthy();
    expect(within(bar).getByText('£43.20', { selector: '[data-total="undecided"]' })).toBeTruthy();
    expect(within(bar).getByText('£611.93', { selector: '[data-total="new-total"]' })).toBeTruthy();
    expect(bar.textContent).not.toContain('may come out lower');
    // F-2 with F-1 approved adds only its own work, and says why.
    fireEvent.click(screen.getByRole('button', { name: 'Next finding →' }));
    expect(screen.getByTestId('decide-adds').textContent).toContain('this adds £37.20 incl. VAT');
    choose('Approve');
    fireEvent.click(screen.getByRole('button', { name: 'Review your choices' }));
    // 55.80 + 55.80 − 93.00.
    expect(screen.getByTestId('decide-shared-saving').textContent).toMatch(/together they come to £93\.00 incl\. VAT, which is £18\.60 less/);
  });

  it('when an older snapshot is decided part-way with shared opening-up, then the note says the figures may come out lower', () => {
    render(<DecisionPage token={TOKEN} page={page()} onSubmit={vi.fn()} />);
    choose('Approve');
    expect(screen.getByTestId('running-total').textContent).toContain('may come out lower');
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
  it('when VAT is rounded down on the invoice total, then the bar adds up to the whole-bill figure and says why approving adds a penny more', () => {
    const base = snapshot();
    // Inspection £10.03 (VAT 2.006 → 2.00), F-1 £20.03 (4.006 → 4.00); the whole bill £30.06 (6.012 → 6.01) = £36.07 [derived from VAT Notice 700 §17.5].
    const s: ApprovalSnapshot = {
      ...base,
      rounding: 'invoice-down',
      findings: [{ ...base.findings[0]!, lines: [{ description: 'Fit new plugs', kind: 'fee', quantity: '1', net: '20.03', vatRate: 'standard', accessTaskId: null }], price: totals('20.03', '4.00', '24.03') }],
      pricingBasis: {
        vatRates: { standard: '20', reduced: '5', zero: '0' },
        accessTasks: [],
        accessPaid: [],
        committed: { lines: [{ stage: 'inspection', kind: 'labour', net: '10.03', vatRate: 'standard', accessTaskId: null }], accessTasks: [] },
      },
      totals: { quoted: totals('10.03', '2.00', '12.03'), approvedSoFar: totals('10.03', '2.00', '12.03'), thisRequest: totals('20.03', '4.00', '24.03'), undecidedElsewhere: totals('0.00', '0.00', '0.00') },
    };
    render(<DecisionPage token={TOKEN} page={page({ snapshot: s })} onSubmit={vi.fn()} />);
    const bar = screen.getByTestId('running-total');
    expect(screen.queryByTestId('decide-vat-whole-bill')).toBeNull();
    choose('Approve');
    expect(within(bar).getByText('£12.03', { selector: '[data-total="approved-so-far"]' })).toBeTruthy();
    expect(within(bar).getByText('£24.04', { selector: '[data-total="this-request"]' })).toBeTruthy();
    expect(within(bar).getByText('£36.07', { selector: '[data-total="new-total"]' })).toBeTruthy();
    expect(screen.getByTestId('decide-vat-whole-bill').textContent).toBe(
      'VAT is worked out on the whole bill, so what you are approving adds £24.04 to it, not the £24.03 it comes to on its own.',
    );
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
    render(<DecisionPage token={TOKEN} page={page({ snapshot: snapshot({ findings: snapshot().findings.slice(0, 1) }) })} onSubmit={onSubmit} />);
    choose('Approve');
    expect(localStorage.getItem(DRAFT_KEY)).not.toBeNull();
    fireEvent.click(screen.getByRole('button', { name: 'Review your choices' }));
    fireEvent.change(screen.getByLabelText('Type your full name to confirm'), { target: { value: 'Hazel Brambury' } });
    fireEvent.click(screen.getByRole('button', { name: 'Confirm decisions' }));
    await vi.waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    await vi.waitFor(() => expect(localStorage.getItem(DRAFT_KEY)).toBeNull());
  });

  it('when the confirmation is refused, then the kept choices stay on the device', async () => {
    const onSubmit = vi.fn().mockRejectedValue(new ApiError({ code: 'conflict', status: 409, message: 'The workshop changed something on this request: reload the page to see the latest.' }));
    render(<DecisionPage token={TOKEN} page={page({ snapshot: snapshot({ findings: snapshot().findings.slice(0, 1) }) })} onSubmit={onSubmit} />);
    choose('Approve');
    fireEvent.click(screen.getByRole('button', { name: 'Review your choices' }));
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
          decisions: snapshot().findings.map((f) => ({ findingId: f.findingId, decision: 'approve' as const, note: '' })),
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
    fireEvent.click(screen.getByRole('button', { name: 'Review your choices' }));
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
