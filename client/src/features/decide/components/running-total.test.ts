import type { ApprovalSnapshot, SnapshotLine, Totals } from '@wingstage/shared';
import { describe, expect, it } from 'vitest';
import { addsWithChoices, priceChoice, runningTotal, snapshotEngineInput } from './running-total';

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
