import {
  priceEstimate,
  sumAmounts,
  VAT_ROUNDING_METHODS,
  type ApprovalSnapshot,
  type EstimateInput,
  type EstimateStage,
  type SnapshotLine,
  type Totals,
  type VatRounding,
  type WorkshopPricing,
} from '@wingstage/shared';
import { describe, expect, it } from 'vitest';
import { addsWithChoices, priceChoice, runningTotal, snapshotEngineInput, wholeEstimateInput, type Choices } from './running-total';

const PLUGS = '5b1d2c3e-4f50-4a61-8b72-9c83d4e5f607';
const HOSE = '6c2e3d4f-5061-4b72-9c83-ad94e5f60718';
const COWL = '7d3f4e50-6172-4c83-ad94-be05f6071829';

const t = (net: string, vat: string, gross: string): Totals => ({ net, vat, gross, byRate: [{ code: 'standard', rate: '20', net, vat }] });
const line = (description: string, kind: SnapshotLine['kind'], net: string, accessTaskId: string | null = null): SnapshotLine => ({
  description,
  kind,
  quantity: '1',
  net,
  vatRate: 'standard',
  accessTaskId,
});

/**
 * Two findings that both need the cowling off (1.5 h × £62.00 = £93.00 net, standard rate), VAT
 * worked per line to the nearest penny (line-nearest):
 *
 *   F-1 plugs:  labour 31.00 (needs the cowling off) + part 33.00
 *   F-2 hose:   labour 62.00 (needs the cowling off) + part 18.43
 *   cowling:    93.00
 *
 * Line VAT at 20 %: 31.00 → 6.20, 33.00 → 6.60, 62.00 → 12.40, 18.43 → 3.686 → 3.69, 93.00 → 18.60.
 */
function snapshot(accessPaid: string[] = [], over: Partial<ApprovalSnapshot> = {}): ApprovalSnapshot {
  const finding = (findingId: string, number: string, lines: SnapshotLine[], price: Totals): ApprovalSnapshot['findings'][number] => ({
    findingId,
    number,
    title: number,
    category: 'recommended',
    location: 'Engine bay',
    seen: 'Seen.',
    measuredValue: null,
    limit: null,
    photos: [],
    lines,
    price,
    accessCovered: [],
    accessSavingGross: '0.00',
  });
  return {
    requestId: '8e405f61-7283-4d94-be05-cf1607182930',
    jobId: '9f516072-8394-4ea5-8f16-d02718293041',
    jobNumber: 'J-0101',
    jobTitle: '100-hour engine service',
    registration: 'Q-BRKE',
    aircraftType: 'Two-seat flex-wing trike',
    ownerName: 'Elspeth Quarrie',
    workshopName: 'Brackenfold Light Aircraft Engineering',
    currency: 'GBP',
    rounding: 'line-nearest',
    message: '',
    sentAt: '2026-12-01T10:00:00Z',
    expiresAt: '2026-12-15T10:00:00Z',
    findings: [
      // Alone: 31.00 + 33.00 + 93.00 = 157.00; VAT 6.20 + 6.60 + 18.60 = 31.40; 188.40.
      finding(PLUGS, 'F-1', [line('Fit new plugs', 'labour', '31.00', COWL), line('Spark plugs', 'part', '33.00')], t('157.00', '31.40', '188.40')),
      // Alone: 62.00 + 18.43 + 93.00 = 173.43; VAT 12.40 + 3.69 + 18.60 = 34.69; 208.12.
      finding(HOSE, 'F-2', [line('Replace hose', 'labour', '62.00', COWL), line('Fuel hose', 'part', '18.43')], t('173.43', '34.69', '208.12')),
    ],
    pricingBasis: {
      vatRates: { standard: '20', reduced: '5', zero: '0' },
      accessTasks: [{ id: COWL, name: 'Cowling off', net: '93.00', vatRate: 'standard' }],
      accessPaid,
    },
    totals: {
      quoted: t('400.00', '80.00', '480.00'),
      approvedSoFar: t('400.00', '80.00', '480.00'),
      // Both: 31.00 + 33.00 + 62.00 + 18.43 + 93.00 = 237.43; VAT 6.20 + 6.60 + 12.40 + 3.69 + 18.60 = 47.49; 284.92.
      thisRequest: t('237.43', '47.49', '284.92'),
      undecidedElsewhere: t('10.00', '2.00', '12.00'),
    },
    ...over,
  };
}

describe('runningTotal priced by the engine (two findings sharing the cowling)', () => {
  it('when only the plugs are approved, then they carry the cowling once and the hose waits without it', () => {
    const r = runningTotal(snapshot(), { [PLUGS]: 'approve' });
    // Approving now: 31.00 + 33.00 + 93.00 = 157.00 net, VAT 31.40 → 188.40.
    // Undecided: hose 62.00 + 18.43 = 80.43 net, VAT 12.40 + 3.69 = 16.09 → 96.52; plus 12.00 elsewhere = 108.52.
    // New total: 480.00 + 188.40 = 668.40.
    expect(r).toMatchObject({ thisRequestAsChosen: '188.40', undecided: '108.52', newTotal: '668.40', exact: true, chosen: 1, of: 2 });
  });

  it('when only the hose is approved, then it carries the cowling once and the plugs wait without it', () => {
    const r = runningTotal(snapshot(), { [HOSE]: 'approve', [PLUGS]: undefined });
    // Approving now: 62.00 + 18.43 + 93.00 = 173.43 net, VAT 12.40 + 3.69 + 18.60 = 34.69 → 208.12.
    // Undecided: plugs 31.00 + 33.00 = 64.00 net, VAT 12.80 → 76.80; plus 12.00 = 88.80.
    // New total: 480.00 + 208.12 = 688.12.
    expect(r).toMatchObject({ thisRequestAsChosen: '208.12', undecided: '88.80', newTotal: '688.12', exact: true });
  });

  it('when both are approved, then the cowling is charged once: the request total, not 188.40 + 208.12 = 396.52', () => {
    const r = runningTotal(snapshot(), { [PLUGS]: 'approve', [HOSE]: 'approve' });
    // 237.43 net, VAT 47.49 → 284.92; undecided only the 12.00 elsewhere; 480.00 + 284.92 = 764.92.
    expect(r).toMatchObject({ thisRequestAsChosen: '284.92', undecided: '12.00', newTotal: '764.92', exact: true, chosen: 2 });
    expect(r.thisRequestAsChosen).toBe(snapshot().totals.thisRequest.gross);
  });

  it('when both are approved, then the saving against their own prices is the cowling once: 188.40 + 208.12 − 284.92 = 111.60', () => {
    expect(runningTotal(snapshot(), { [PLUGS]: 'approve', [HOSE]: 'approve' }).sharedSaving).toBe('111.60');
    // One alone saves nothing against its own price.
    expect(runningTotal(snapshot(), { [PLUGS]: 'approve' }).sharedSaving).toBeNull();
  });

  it('when the plugs are approved, then the hose adds only its own work: 96.52, not its own price of 208.12', () => {
    expect(addsWithChoices(snapshot(), { [PLUGS]: 'approve' }, HOSE)).toBe('96.52');
    expect(addsWithChoices(snapshot(), { [PLUGS]: 'decline' }, HOSE)).toBe('208.12');
    // Its own choice does not count against it.
    expect(addsWithChoices(snapshot(), { [PLUGS]: 'approve', [HOSE]: 'approve' }, HOSE)).toBe('96.52');
  });

  it('when one is declined and the other left open, then the open one carries the cowling again', () => {
    const r = runningTotal(snapshot(), { [PLUGS]: 'decline' });
    // Nothing approved; undecided: hose 80.43 + cowling 93.00 = 173.43 net, VAT 34.69 → 208.12; plus 12.00 = 220.12.
    expect(r).toMatchObject({ thisRequestAsChosen: '0.00', undecided: '220.12', newTotal: '480.00' });
  });

  it('when nothing is chosen, then the whole request is undecided at its own total', () => {
    // 284.92 + 12.00.
    expect(runningTotal(snapshot(), {})).toMatchObject({ thisRequestAsChosen: '0.00', undecided: '296.92', newTotal: '480.00', chosen: 0 });
  });

  it('when committed work already pays for the cowling, then no choice charges it', () => {
    const s = snapshot([COWL]);
    // Plugs: 64.00 net, VAT 12.80 → 76.80. Both: 144.43 net, VAT 6.20 + 6.60 + 12.40 + 3.69 = 28.89 → 173.32.
    expect(runningTotal(s, { [PLUGS]: 'approve' }).thisRequestAsChosen).toBe('76.80');
    expect(runningTotal(s, { [PLUGS]: 'approve', [HOSE]: 'approve' }).thisRequestAsChosen).toBe('173.32');
  });

  it("when nothing is chosen, then the engine's price of each finding on its own is the one frozen in the snapshot", () => {
    const s = snapshot();
    const priced = priceChoice(s, {})!;
    for (const f of s.findings) {
      expect(priced.findings.find((x) => x.findingId === f.findingId)?.price).toEqual(f.price);
    }
  });

  it('when a line is reduced-rate or discounted, then its frozen net and rate are what the engine prices', () => {
    const s = snapshot();
    s.findings[1]!.lines[1] = { ...s.findings[1]!.lines[1]!, vatRate: 'reduced', kind: 'subcontract', net: '18.43' };
    // Hose approved: standard 62.00 + 93.00 = 155.00 (VAT 12.40 + 18.60 = 31.00); reduced 18.43 × 5 % = 0.9215 → 0.92.
    // 173.43 net + 31.92 VAT = 205.35.
    const priced = priceChoice(s, { [HOSE]: 'approve' })!;
    expect(priced.stages.approved).toMatchObject({ net: '173.43', vat: '31.92', gross: '205.35' });
    expect(runningTotal(s, { [HOSE]: 'approve' }).thisRequestAsChosen).toBe('205.35');
  });

  it('when the workshop rounds VAT on the invoice total, then the choice is priced that way too', () => {
    const s = snapshot([], { rounding: 'invoice-down' });
    // Both: 237.43 × 20 % = 47.486 → down to 47.48; 284.91.
    expect(runningTotal(s, { [PLUGS]: 'approve', [HOSE]: 'approve' }).thisRequestAsChosen).toBe('284.91');
  });
});

describe('runningTotal for an older snapshot without a pricing basis', () => {
  const old = (): ApprovalSnapshot => {
    const s = snapshot();
    delete s.pricingBasis;
    for (const f of s.findings) f.lines = f.lines.map(({ description, kind, quantity, net }) => ({ description, kind, quantity, net }));
    return s;
  };

  it('then it has no engine input and falls back to adding the findings’ own prices, saying so', () => {
    expect(snapshotEngineInput(old(), {})).toBeNull();
    const r = runningTotal(old(), { [PLUGS]: 'approve' });
    // Own price of the plugs, 188.40; undecided: hose's own price 208.12 + 12.00.
    expect(r).toMatchObject({ thisRequestAsChosen: '188.40', undecided: '220.12', exact: false, sharesOpeningUp: true });
    // The whole request still uses the snapshot's request total.
    expect(runningTotal(old(), { [PLUGS]: 'approve', [HOSE]: 'approve' }).thisRequestAsChosen).toBe('284.92');
  });
});

describe('new total: the whole estimate after the choice, VAT worked as the estimate works it', () => {
  const ONLY = '0a1b2c3d-4e5f-4a60-8b71-c82d93ea4f05';

  /**
   * One finding asked about, one inspection line committed, the workshop rounding VAT on the invoice
   * total. VAT Notice 700 §17.5 lets a business work VAT on the invoice total and round that total
   * down to a whole penny (invoice-down), or to the nearest penny, half up, as HMRC manual VATREC12030
   * reads "nearest" (invoice-nearest) [derived from §17.5, as shared/test/pricing-vat.test.ts]:
   *
   *   committed:  inspection £10.03       VAT 2.006 → down 2.00, nearest 2.01
   *   request:    finding    £20.03       VAT 4.006 → down 4.00, nearest 4.01
   *   whole bill: £30.06                  VAT 6.012 → down 6.01, nearest 6.01
   *
   *   invoice-down:    parts 12.03 + 24.03 = 36.06; whole 30.06 + 6.01 = 36.07 (a penny more)
   *   invoice-nearest: parts 12.04 + 24.04 = 36.08; whole 30.06 + 6.01 = 36.07 (a penny less)
   */
  function pennySnapshot(rounding: 'invoice-down' | 'invoice-nearest', withCommitted = true): ApprovalSnapshot {
    const s = snapshot([], { rounding });
    const parts = rounding === 'invoice-down' ? { so: t('10.03', '2.00', '12.03'), req: t('20.03', '4.00', '24.03') } : { so: t('10.03', '2.01', '12.04'), req: t('20.03', '4.01', '24.04') };
    s.findings = [{ ...s.findings[0]!, findingId: ONLY, number: 'F-1', lines: [line('Re-seat the fairing', 'labour', '20.03')], price: parts.req }];
    s.pricingBasis = {
      vatRates: { standard: '20', reduced: '5', zero: '0' },
      accessTasks: [],
      accessPaid: [],
      ...(withCommitted ? { committed: { lines: [{ stage: 'inspection' as const, kind: 'fee' as const, net: '10.03', vatRate: 'standard' as const, accessTaskId: null }], accessTasks: [] } } : {}),
    };
    s.totals = { quoted: parts.so, approvedSoFar: parts.so, thisRequest: parts.req, undecidedElsewhere: t('0.00', '0.00', '0.00') };
    return s;
  }

  it('when VAT is rounded down on the invoice total, then approving gives 36.07 (the whole bill), not 12.03 + 24.03 = 36.06', () => {
    const r = runningTotal(pennySnapshot('invoice-down'), { [ONLY]: 'approve' });
    expect(r).toMatchObject({ approvedSoFar: '12.03', thisRequestAsChosen: '24.03', newTotal: '36.07', addsToTotal: '24.04', wholeInvoice: true });
  });

  it('when VAT is rounded to the nearest penny on the invoice total, then approving gives 36.07, not 12.04 + 24.04 = 36.08', () => {
    const r = runningTotal(pennySnapshot('invoice-nearest'), { [ONLY]: 'approve' });
    expect(r).toMatchObject({ approvedSoFar: '12.04', thisRequestAsChosen: '24.04', newTotal: '36.07', addsToTotal: '24.03', wholeInvoice: true });
  });

  it('when the finding is declined or left open, then the new total is what is already committed', () => {
    for (const choice of ['decline', undefined] as const) {
      expect(runningTotal(pennySnapshot('invoice-down'), { [ONLY]: choice })).toMatchObject({ newTotal: '12.03', addsToTotal: '0.00' });
    }
  });

  it('when the snapshot was sent without the committed work, then it adds the two parts as before', () => {
    const s = pennySnapshot('invoice-down', false);
    expect(wholeEstimateInput(s, {})).toBeNull();
    expect(runningTotal(s, { [ONLY]: 'approve' })).toMatchObject({ newTotal: '36.06', addsToTotal: '24.03', wholeInvoice: false, exact: true });
  });

  /*
   * The same job priced as the estimate itself holds it (hours × rate, unit cost × mark-up, a
   * percentage discount, access tasks by hours) for every choice of two findings and every rounding
   * method: the page's new total must be the estimate's committed total after deciding.
   */
  const PROP = '1b2c3d4e-5f60-4a71-8b82-c93da4eb5f16';
  const OLD = '2c3d4e5f-6071-4b82-9c93-da4eb5fc6027';
  function realEstimate(choices: Choices): EstimateInput {
    const stage = (id: string): EstimateStage => (choices[id] === 'approve' ? 'approved' : choices[id] === 'decline' ? 'declined' : 'discovered');
    return {
      lines: [
        { id: 'i1', stage: 'inspection', kind: 'labour', hours: '2', ratePerHour: '62.00', vatRate: 'standard' },
        { id: 'i2', stage: 'inspection', kind: 'part', quantity: '3', unitCost: '2.345', vatRate: 'standard' },
        { id: 'i3', stage: 'inspection', kind: 'fee', amount: '17.35', vatRate: 'reduced' },
        { id: 'i4', stage: 'inspection', kind: 'labour', hours: '0.5', ratePerHour: '62.00', vatRate: 'standard', accessTaskId: PROP },
        { id: 'a1', stage: 'approved', findingId: OLD, kind: 'labour', hours: '0.3', ratePerHour: '62.00', vatRate: 'standard', discount: { percent: '10' } },
        { id: 'p1', stage: stage(PLUGS), findingId: PLUGS, kind: 'labour', hours: '0.5', ratePerHour: '62.00', vatRate: 'standard', accessTaskId: COWL },
        { id: 'p2', stage: stage(PLUGS), findingId: PLUGS, kind: 'part', quantity: '4', unitCost: '6.88', vatRate: 'standard' },
        { id: 'p3', stage: stage(PLUGS), findingId: PLUGS, kind: 'labour', hours: '0.25', ratePerHour: '62.00', vatRate: 'standard', accessTaskId: PROP },
        { id: 'h1', stage: stage(HOSE), findingId: HOSE, kind: 'labour', hours: '1', ratePerHour: '62.00', vatRate: 'standard', accessTaskId: COWL, discount: { percent: '10' } },
        { id: 'h2', stage: stage(HOSE), findingId: HOSE, kind: 'subcontract', cost: '40.00', markupPercent: '10', vatRate: 'reduced' },
      ],
      accessTasks: [
        { id: COWL, hours: '1.5', ratePerHour: '62.00', vatRate: 'standard' },
        { id: PROP, hours: '0.75', ratePerHour: '62.00', vatRate: 'standard' },
      ],
    };
  }
  const pricingFor = (vatRounding: VatRounding): WorkshopPricing => ({
    currency: 'GBP',
    vatRounding,
    vatRates: { standard: '20', reduced: '5', zero: '0' },
    partsMarkupPercent: '20',
    subcontractMarkupPercent: '15',
  });

  /** The snapshot as the server freezes it: nets after mark-up and discount; totals from the engine. */
  function frozen(rounding: VatRounding): ApprovalSnapshot {
    const before = priceEstimate(realEstimate({}), pricingFor(rounding));
    const s = snapshot([PROP], { rounding: rounding });
    // 4 × 6.88 = 27.52 + 20 % = 33.024 → 33.02; 62.00 less 10 % = 55.80; 40.00 + 10 % = 44.00 (reduced).
    s.findings[0]!.lines = [line('Fit plugs', 'labour', '31.00', COWL), line('Spark plugs', 'part', '33.02'), line('Check the prop flange', 'labour', '15.50', PROP)];
    s.findings[1]!.lines = [line('Replace hose', 'labour', '55.80', COWL), { ...line('Hose made up', 'subcontract', '44.00'), vatRate: 'reduced' }];
    for (const f of s.findings) f.price = before.findings.find((x) => x.findingId === f.findingId)!.price;
    s.pricingBasis = {
      vatRates: { standard: '20', reduced: '5', zero: '0' },
      accessTasks: [
        { id: COWL, name: 'Cowling off', net: '93.00', vatRate: 'standard' },
        { id: PROP, name: 'Propeller off', net: '46.50', vatRate: 'standard' },
      ],
      accessPaid: [PROP],
      committed: {
        // 2 × 62.00 = 124.00; 3 × 2.345 = 7.035 + 20 % = 8.442 → 8.44; 17.35 reduced; 0.5 × 62.00 = 31.00; 0.3 × 62.00 = 18.60 less 10 % = 16.74.
        lines: [
          { stage: 'inspection', kind: 'labour', net: '124.00', vatRate: 'standard', accessTaskId: null },
          { stage: 'inspection', kind: 'part', net: '8.44', vatRate: 'standard', accessTaskId: null },
          { stage: 'inspection', kind: 'fee', net: '17.35', vatRate: 'reduced', accessTaskId: null },
          { stage: 'inspection', kind: 'labour', net: '31.00', vatRate: 'standard', accessTaskId: PROP },
          { stage: 'approved', kind: 'labour', net: '16.74', vatRate: 'standard', accessTaskId: null },
        ],
        accessTasks: [{ id: PROP, net: '46.50', vatRate: 'standard' }],
      },
    };
    s.totals = { ...s.totals, quoted: before.quoted, approvedSoFar: before.committed, thisRequest: before.undecided, undecidedElsewhere: t('0.00', '0.00', '0.00') };
    return s;
  }

  const OPTIONS = ['approve', 'decline', undefined] as const;
  const CHOICES: Choices[] = OPTIONS.flatMap((p) => OPTIONS.map((h) => ({ [PLUGS]: p, [HOSE]: h })));

  it.each(VAT_ROUNDING_METHODS)("under %s, for each of the 9 choices, then the new total is the estimate's committed total after deciding", (rounding) => {
    const s = frozen(rounding);
    for (const choice of CHOICES) {
      const after = priceEstimate(realEstimate(choice), pricingFor(rounding)).committed.gross;
      const r = runningTotal(s, choice);
      expect({ choice, newTotal: r.newTotal }).toEqual({ choice, newTotal: after });
      expect(sumAmounts([r.approvedSoFar, r.addsToTotal], 'GBP')).toBe(after);
    }
  });

  it('then for some choice and rounding the two parts added would have missed it by a penny, which the whole-bill figure does not', () => {
    const misses = VAT_ROUNDING_METHODS.flatMap((rounding) =>
      CHOICES.filter((choice) => {
        const r = runningTotal(frozen(rounding), choice);
        return sumAmounts([r.approvedSoFar, r.thisRequestAsChosen], 'GBP') !== r.newTotal;
      }).map((choice) => ({ rounding, choice })),
    );
    expect(misses.length).toBeGreaterThan(0);
    // Only a method that rounds a total can differ: VAT per line to the nearest penny adds up the same however the lines are grouped.
    expect(misses.some((m) => m.rounding === 'line-nearest')).toBe(false);
  });
});
