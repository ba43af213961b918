import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  Dec,
  MoneyError,
  QUOTE_ITEM_ID,
  VAT_ROUNDING_METHODS,
  choiceBasisFrom,
  priceChoice,
  priceEstimate,
  priceNets,
  sumAmounts,
  type AccessTaskInput,
  type Choice,
  type ChoiceBasis,
  type EstimateInput,
  type EstimateLineInput,
  type ItemChoice,
  type PricedChoice,
  type VatRateCode,
  type VatRounding,
  type WorkshopPricing,
} from '../src/index.js';

// UK rates [source: gov.uk "VAT rates"]: standard 20%, reduced 5%, zero 0%. Mark-ups are invented demo settings.
const pricingWith = (vatRounding: VatRounding): WorkshopPricing => ({
  currency: 'GBP',
  vatRounding,
  vatRates: { standard: '20', reduced: '5', zero: '0' },
  partsMarkupPercent: '20',
  subcontractMarkupPercent: '10',
});

const name = (id: string) => `Opening-up ${id}`;

/** Σ approved items' gross + Σ charged opening-up gross. */
function componentsOf(p: PricedChoice): string {
  return sumAmounts([...p.items.filter((i) => i.choice === 'approve').map((i) => i.gross), ...p.openingUp.filter((o) => o.charged).map((o) => o.gross)], p.currency);
}

describe('the engine counts only what the owner agreed', () => {
  it('when an inspection line is not agreed, then it is quoted and awaiting the owner but not committed', () => {
    const r = priceEstimate(
      {
        lines: [
          { id: 'a', stage: 'inspection', agreed: true, kind: 'fee', amount: '100.00', vatRate: 'standard' },
          { id: 'b', stage: 'inspection', agreed: false, kind: 'fee', amount: '50.00', vatRate: 'standard' },
          { id: 'c', stage: 'discovered', findingId: 'f1', kind: 'fee', amount: '10.00', vatRate: 'standard' },
        ],
      },
      pricingWith('invoice-nearest'),
    );
    // £100 net at 20% → £20 VAT, £120 gross [source: HMRC "Calculating VAT …"]; £50 → £60; £10 → £12.
    expect(r.quoted.gross).toBe('180.00');
    expect(r.committed.gross).toBe('120.00');
    expect(r.quoteAwaiting.gross).toBe('60.00');
    expect(r.undecided.gross).toBe('72.00');
    expect(r.ifAllApproved.gross).toBe('192.00');
    expect(r.lines.find((l) => l.id === 'b')!.agreed).toBe(false);
  });

  it('when agreed is left out, then the line counts as agreed (the meaning older callers rely on)', () => {
    const r = priceEstimate({ lines: [{ id: 'a', stage: 'inspection', kind: 'fee', amount: '100.00', vatRate: 'standard' }] }, pricingWith('invoice-nearest'));
    expect(r.committed.gross).toBe('120.00');
    expect(r.quoteAwaiting.gross).toBe('0.00');
  });

  it('when an access task is needed only by an unagreed inspection line and a discovered one, then it is charged once, awaiting, not committed', () => {
    const r = priceEstimate(
      {
        lines: [
          { id: 'a', stage: 'inspection', agreed: false, kind: 'fee', amount: '10.00', vatRate: 'standard', accessTaskId: 't' },
          { id: 'b', stage: 'discovered', findingId: 'f1', kind: 'fee', amount: '10.00', vatRate: 'standard', accessTaskId: 't' },
        ],
        accessTasks: [{ id: 't', hours: '1', ratePerHour: '30.00', vatRate: 'standard' }],
      },
      pricingWith('invoice-nearest'),
    );
    expect(r.committed.gross).toBe('0.00');
    expect(r.undecided.net).toBe('50.00');
    expect(r.quoteAwaiting.net).toBe('40.00');
    expect(r.accessTasks[0]!.committedPays).toBe(false);
  });

  it('when agreed is not a boolean, then the engine refuses it with the line named', () => {
    expect(() =>
      priceEstimate({ lines: [{ id: 'a', stage: 'inspection', agreed: 'yes' as unknown as boolean, kind: 'fee', amount: '1.00', vatRate: 'standard' }] }, pricingWith('invoice-nearest')),
    ).toThrow(MoneyError);
  });

  it('when lines already priced are run through priceNets, then every total equals priceEstimate on the original lines', () => {
    const input: EstimateInput = {
      lines: [
        { id: 'l1', stage: 'inspection', agreed: true, kind: 'labour', hours: '1.25', ratePerHour: '45.50', vatRate: 'standard', accessTaskId: 't' },
        { id: 'l2', stage: 'inspection', agreed: false, kind: 'part', quantity: '4', unitCost: '3.125', vatRate: 'reduced' },
        { id: 'l3', stage: 'discovered', findingId: 'f', kind: 'subcontract', cost: '99.99', vatRate: 'standard', discount: { percent: '12.5' }, accessTaskId: 't' },
        { id: 'l4', stage: 'approved', findingId: 'g', kind: 'fee', amount: '25.00', vatRate: 'zero' },
      ],
      accessTasks: [{ id: 't', hours: '0.75', ratePerHour: '52.00', vatRate: 'standard' }],
    };
    for (const rounding of VAT_ROUNDING_METHODS) {
      const a = priceEstimate(input, pricingWith(rounding));
      const b = priceNets(
        {
          lines: a.lines.map((l) => ({ id: l.id, stage: l.stage, agreed: l.agreed, kind: l.kind, net: l.net, vatRate: l.vatRate, findingId: l.findingId, accessTaskId: l.accessTaskId })),
          accessTasks: a.accessTasks.map((t) => ({ id: t.id, net: t.net, vatRate: t.vatRate })),
        },
        pricingWith(rounding),
      );
      expect({ ...b, lines: [], findings: [] }).toEqual({ ...a, lines: [], findings: [] });
    }
  });
});

describe('priceChoice: named vectors', () => {
  // VAT Notice 700 §17.5 / §17.5.1 [derived]: £10.03 + £20.03 + £30.03 at 20% (exact VAT 12.018):
  // invoice total down → £12.01; to nearest → £12.02; each line to the nearest penny → £12.03;
  // each line down to 0.1p then the total down → £12.01.
  const vector: [VatRounding, string][] = [
    ['invoice-down', '12.01'],
    ['invoice-nearest', '12.02'],
    ['line-nearest', '12.03'],
    ['line-down-tenth', '12.01'],
  ];
  const input: EstimateInput = {
    lines: ['10.03', '20.03', '30.03'].map((amount, i): EstimateLineInput => ({ id: `l${i}`, stage: 'discovered', findingId: `f${i}`, kind: 'fee', amount, vatRate: 'standard' })),
  };
  it.each(vector)('when all three findings are approved under %s, then the VAT is %s and the three prices add up to what is approved', (rounding, vat) => {
    const basis = choiceBasisFrom(priceEstimate(input, pricingWith(rounding)), { quote: false, findingIds: ['f0', 'f1', 'f2'] }, pricingWith(rounding).vatRates, name);
    const p = priceChoice(basis, { f0: 'approve', f1: 'approve', f2: 'approve' });
    expect(p.newTotal.vat).toBe(vat);
    expect(p.approvingNow.gross).toBe(new Dec('60.09').plus(vat).toFixed(2));
    expect(componentsOf(p)).toBe(p.approvingNow.gross);
    expect(p.items.map((i) => i.gross)).toEqual(p.items.map((i) => i.allApprovedGross));
  });

  it('when invoice-down rounding leaves a penny over, then it goes to the largest remainder (12.03 / 24.03 / 36.04) [derived: Fowler "Money" allocation]', () => {
    const basis = choiceBasisFrom(priceEstimate(input, pricingWith('invoice-down')), { quote: false, findingIds: ['f0', 'f1', 'f2'] }, pricingWith('invoice-down').vatRates, name);
    // Own prices, each rounded down alone: 12.03, 24.03, 36.03 (sum 72.09) against 72.10 for the three together.
    expect(priceChoice(basis, { f0: 'approve', f1: 'approve', f2: 'approve' }).items.map((i) => i.gross)).toEqual(['12.03', '24.03', '36.04']);
  });

  it('when two findings share opening-up, then it is its own line, charged once, and the parts add up', () => {
    const shared: EstimateInput = {
      lines: [
        { id: 'a', stage: 'discovered', findingId: 'f1', kind: 'fee', amount: '50.00', vatRate: 'standard', accessTaskId: 'gearbox' },
        { id: 'b', stage: 'discovered', findingId: 'f2', kind: 'fee', amount: '30.00', vatRate: 'standard', accessTaskId: 'gearbox' },
      ],
      accessTasks: [{ id: 'gearbox', hours: '2', ratePerHour: '40.00', vatRate: 'standard' }],
    };
    const basis = choiceBasisFrom(priceEstimate(shared, pricingWith('invoice-nearest')), { quote: false, findingIds: ['f1', 'f2'] }, pricingWith('invoice-nearest').vatRates, name);
    const one = priceChoice(basis, { f1: 'approve', f2: 'decline' });
    // £50 + £80 opening-up = £130 net, £156 gross; the declined finding adds nothing.
    expect(one.approvingNow.gross).toBe('156.00');
    expect(one.items[0]!.gross).toBe('60.00');
    expect(one.openingUp[0]).toMatchObject({ id: 'gearbox', name: 'Opening-up gearbox', charged: true, gross: '96.00', neededBy: ['f1', 'f2'] });
    const both = priceChoice(basis, { f1: 'approve', f2: 'approve' });
    expect(both.approvingNow.gross).toBe('192.00');
    expect(componentsOf(both)).toBe('192.00');
    const neither = priceChoice(basis, { f1: 'decline', f2: 'decline' });
    expect(neither.approvingNow.gross).toBe('0.00');
    expect(neither.openingUp[0]!.charged).toBe(false);
    expect(priceChoice(basis, { f1: 'approve' }).undecidedGross).toBe('36.00');
  });

  it('when the opening-up is already paid by agreed work, then it is not in the request at all', () => {
    const covered: EstimateInput = {
      lines: [
        { id: 'a', stage: 'inspection', agreed: true, kind: 'fee', amount: '10.00', vatRate: 'standard', accessTaskId: 'cowl' },
        { id: 'b', stage: 'discovered', findingId: 'f1', kind: 'fee', amount: '30.00', vatRate: 'standard', accessTaskId: 'cowl' },
      ],
      accessTasks: [{ id: 'cowl', hours: '1', ratePerHour: '40.00', vatRate: 'standard' }],
    };
    const basis = choiceBasisFrom(priceEstimate(covered, pricingWith('invoice-nearest')), { quote: false, findingIds: ['f1'] }, pricingWith('invoice-nearest').vatRates, name);
    expect(basis.accessTasks).toEqual([]);
    const p = priceChoice(basis, { f1: 'approve' });
    expect(p.agreedSoFar.gross).toBe('60.00');
    expect(p.approvingNow.gross).toBe('36.00');
    expect(p.newTotal.gross).toBe('96.00');
  });

  it('when a choice names an item the request does not hold, then it is refused', () => {
    const basis = choiceBasisFrom(priceEstimate(input, pricingWith('invoice-nearest')), { quote: false, findingIds: ['f0'] }, pricingWith('invoice-nearest').vatRates, name);
    expect(() => priceChoice(basis, { nope: 'approve' })).toThrow(MoneyError);
  });
});

// ─── The property ────────────────────────────────────────────────────────────

const CODES: VatRateCode[] = ['standard', 'reduced', 'zero'];
const pennies = (min: number, max: number) => fc.integer({ min, max }).map((n) => new Dec(n).dividedBy(100).toFixed(2));

const lineShape = fc.record({
  kind: fc.constantFrom('labour', 'part', 'fee'),
  a: pennies(1, 40_000),
  hours: fc.integer({ min: 1, max: 40 }).map((q) => new Dec(q).dividedBy(4).toString()),
  code: fc.constantFrom(...CODES),
  access: fc.integer({ min: -1, max: 2 }),
  discount: fc.option(fc.integer({ min: 1, max: 30 }).map(String), { nil: undefined }),
});
type Shape = typeof lineShape extends fc.Arbitrary<infer T> ? T : never;

function lineOf(s: Shape, head: Pick<EstimateLineInput, 'id' | 'stage' | 'agreed' | 'findingId'>, tasks: number): EstimateLineInput {
  const common = { ...head, vatRate: s.code, accessTaskId: s.access >= 0 && s.access < tasks ? `t${s.access}` : null, discount: s.discount ? { percent: s.discount } : null };
  if (s.kind === 'labour') return { ...common, kind: 'labour', hours: s.hours, ratePerHour: s.a };
  if (s.kind === 'part') return { ...common, kind: 'part', quantity: s.hours, unitCost: s.a };
  return { ...common, kind: 'fee', amount: s.a };
}

const scenario = fc.record({
  tasks: fc.array(fc.record({ hours: fc.integer({ min: 1, max: 12 }).map((q) => new Dec(q).dividedBy(4).toString()), rate: pennies(1000, 9000), code: fc.constantFrom(...CODES) }), { maxLength: 3 }),
  agreed: fc.array(lineShape, { maxLength: 3 }),
  approved: fc.array(lineShape, { maxLength: 2 }),
  quote: fc.array(lineShape, { maxLength: 3 }),
  findings: fc.array(fc.array(lineShape, { minLength: 1, maxLength: 3 }), { maxLength: 6 }),
  outside: fc.array(lineShape, { maxLength: 2 }),
});

function assignments(ids: string[], values: readonly (ItemChoice | undefined)[]): Choice[] {
  let out: Choice[] = [{}];
  for (const id of ids) out = out.flatMap((c) => values.map((v) => ({ ...c, [id]: v })));
  return out;
}

/** The estimate after the decision is recorded: approved lines move to approved (the quote becomes agreed), declined to declined. */
function afterDecision(input: EstimateInput, choice: Choice): EstimateInput {
  return {
    ...input,
    lines: input.lines.map((l) => {
      if (l.stage === 'inspection' && l.agreed === false) return choice[QUOTE_ITEM_ID] === 'approve' ? { ...l, agreed: true } : l;
      if (l.stage === 'discovered' && l.findingId && l.findingId in choice) {
        const c = choice[l.findingId];
        return c === 'approve' ? { ...l, stage: 'approved' } : c === 'decline' ? { ...l, stage: 'declined' } : l;
      }
      return l;
    }),
  };
}

describe('priceChoice: the property', () => {
  it('when any request of 1–6 items with shared opening-up is decided in any way, under every rounding method, then the figures add up and equal the estimate after the decision', () => {
    fc.assert(
      fc.property(scenario, (sc) => {
        const tasks: AccessTaskInput[] = sc.tasks.map((t, i) => ({ id: `t${i}`, hours: t.hours, ratePerHour: t.rate, vatRate: t.code }));
        const n = tasks.length;
        const lines: EstimateLineInput[] = [
          ...sc.agreed.map((s, i) => lineOf(s, { id: `a${i}`, stage: 'inspection', agreed: true }, n)),
          ...sc.approved.map((s, i) => lineOf(s, { id: `p${i}`, stage: 'approved', findingId: 'earlier' }, n)),
          ...sc.quote.map((s, i) => lineOf(s, { id: `q${i}`, stage: 'inspection', agreed: false }, n)),
          ...sc.findings.flatMap((f, k) => f.map((s, i) => lineOf(s, { id: `f${k}-${i}`, stage: 'discovered', findingId: `f${k}` }, n))),
          ...sc.outside.map((s, i) => lineOf(s, { id: `o${i}`, stage: 'discovered', findingId: 'outside' }, n)),
        ];
        const input: EstimateInput = { lines, accessTasks: tasks };
        const includeQuote = sc.quote.length > 0;
        const findingIds = sc.findings.map((_, k) => `f${k}`).slice(0, includeQuote ? 5 : 6);
        const ids = [...(includeQuote ? [QUOTE_ITEM_ID] : []), ...findingIds];
        fc.pre(ids.length >= 1);
        // Every full decision (2^n), and every mix with items left open when the request is small.
        const choices = assignments(ids, ids.length <= 3 ? ['approve', 'decline', undefined] : ['approve', 'decline']);
        for (const rounding of VAT_ROUNDING_METHODS) {
          const pricing = pricingWith(rounding);
          const before = priceEstimate(input, pricing);
          const basis: ChoiceBasis = choiceBasisFrom(before, { quote: includeQuote, findingIds }, pricing.vatRates, name);
          for (const choice of choices) {
            const p = priceChoice(basis, choice);
            expect(componentsOf(p)).toBe(p.approvingNow.gross);
            expect(sumAmounts([p.agreedSoFar.gross, p.approvingNow.gross], 'GBP')).toBe(p.newTotal.gross);
            expect(p.agreedSoFar).toEqual(before.committed);
            expect(p.newTotal).toEqual(priceEstimate(afterDecision(input, choice), pricing).committed);
          }
          const all = priceChoice(basis, Object.fromEntries(ids.map((id) => [id, 'approve'])));
          expect(sumAmounts([...all.items.map((i) => i.allApprovedGross), ...all.openingUp.map((o) => o.allApprovedGross)], 'GBP')).toBe(all.approvingNow.gross);
          expect(all.newTotal).toEqual(all.ifAllApproved);
        }
      }),
      { numRuns: 20 },
    );
    // Each run prices up to 4 × 64 choices and the estimate after each: slow on a shared machine.
  }, 240_000);
});
