import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  Dec,
  MoneyError,
  VAT_ROUNDING_METHODS,
  minorUnits,
  priceEstimate,
  priceFinding,
  workshopPricingFrom,
  type EstimateInput,
  type EstimateLineInput,
  type EstimateStage,
  type PricedEstimate,
  type WorkshopPricing,
} from '../src/index.js';

// UK rates [source: gov.uk "VAT rates"]: standard 20%, reduced 5%, zero 0%. Mark-ups are invented demo settings.
const pricing: WorkshopPricing = {
  currency: 'GBP',
  vatRounding: 'invoice-nearest',
  vatRates: { standard: '20', reduced: '5', zero: '0' },
  partsMarkupPercent: '20',
  subcontractMarkupPercent: '10',
};

function codeOf(fn: () => unknown): string {
  try {
    fn();
  } catch (e) {
    return e instanceof MoneyError ? `${e.code} @ ${e.path ?? ''}` : `not a MoneyError: ${String(e)}`;
  }
  return 'nothing thrown';
}

describe('line amounts', () => {
  it('prices labour, parts (mark-up or fixed price), sub-contract work, fees and discounts', () => {
    const r = priceEstimate(
      {
        lines: [
          { id: 'l1', stage: 'inspection', kind: 'labour', hours: '1.25', ratePerHour: '45.50', vatRate: 'standard' }, // 56.875 → 56.88
          { id: 'l2', stage: 'inspection', kind: 'part', quantity: '4', unitCost: '3.125', vatRate: 'standard' }, // 12.50 × 1.2 = 15.00
          { id: 'l3', stage: 'inspection', kind: 'part', quantity: '2', unitCost: '10.00', markupPercent: '35', vatRate: 'standard' }, // 27.00
          { id: 'l4', stage: 'inspection', kind: 'part', quantity: '3', unitCost: '1.00', unitPrice: '2.40', vatRate: 'standard' }, // fixed: 7.20
          { id: 'l5', stage: 'inspection', kind: 'subcontract', cost: '180.00', vatRate: 'standard' }, // 198.00
          { id: 'l6', stage: 'inspection', kind: 'fee', amount: '25.00', vatRate: 'exempt' },
          { id: 'l7', stage: 'inspection', kind: 'labour', hours: '2', ratePerHour: '50.00', vatRate: 'standard', discount: { percent: '12.5' } },
          { id: 'l8', stage: 'inspection', kind: 'subcontract', cost: '99.99', markupPercent: '0', vatRate: 'reduced', discount: { amount: '9.99' } },
        ],
      },
      pricing,
    );
    const by = Object.fromEntries(r.lines.map((l) => [l.id, l]));
    expect(by.l1).toMatchObject({ listNet: '56.88', discount: '0.00', net: '56.88', cost: null, vat: null, vatPercent: '20' });
    expect(by.l2).toMatchObject({ net: '15.00', cost: '12.50' });
    expect(by.l3).toMatchObject({ net: '27.00', cost: '20.00' });
    expect(by.l4).toMatchObject({ net: '7.20', cost: '3.00' });
    expect(by.l5).toMatchObject({ net: '198.00', cost: '180.00' });
    expect(by.l6).toMatchObject({ net: '25.00', vatRate: 'exempt', vatPercent: '0' });
    expect(by.l7).toMatchObject({ listNet: '100.00', discount: '12.50', net: '87.50' });
    expect(by.l8).toMatchObject({ listNet: '99.99', discount: '9.99', net: '90.00' });
    // 20%: 56.88+15+27+7.20+198+87.50 = 391.58 → 78.316; 5%: 90 → 4.50; exempt 25 → 0. Total 82.816 → 82.82.
    expect(r.quoted).toEqual({
      net: '506.58',
      vat: '82.82',
      gross: '589.40',
      byRate: [
        { code: 'standard', rate: '20', net: '391.58', vat: '78.32' },
        { code: 'reduced', rate: '5', net: '90.00', vat: '4.50' },
        { code: 'exempt', rate: '0', net: '25.00', vat: '0.00' },
      ],
    });
    expect(r.rounding).toBe('invoice-nearest');
  });

  it('shows each line VAT when lines are rounded to the nearest penny, and only then', () => {
    const line: EstimateLineInput = { id: 'a', stage: 'inspection', kind: 'fee', amount: '10.03', vatRate: 'standard' };
    expect(priceEstimate({ lines: [line] }, { ...pricing, vatRounding: 'line-nearest' }).lines[0]!.vat).toBe('2.01');
    // line-down-tenth works each line to 0.1p (2.006) as a step only; the total is what is shown.
    const tenth = priceEstimate({ lines: [line] }, { ...pricing, vatRounding: 'line-down-tenth' });
    expect(tenth.lines[0]!.vat).toBeNull();
    expect(tenth.quoted.vat).toBe('2.00');
    expect(priceEstimate({ lines: [line] }, pricing).lines[0]!.vat).toBeNull();
  });

  it('reads its settings from a workshop record', () => {
    const p = workshopPricingFrom({
      currency: 'GBP',
      vatRates: { standard: '20', reduced: '5', zero: '0' },
      settings: { vatRounding: 'line-nearest', partsMarkupPercent: '15', subcontractMarkupPercent: '5', approvalLinkDays: 14, chaseAfterHours: 48, contactPhone: '', contactEmail: '', depositPolicy: { kind: 'none' }, paymentTermsDays: 30 },
    });
    expect(p).toEqual({ ...pricing, vatRounding: 'line-nearest', partsMarkupPercent: '15', subcontractMarkupPercent: '5' });
  });

  it('throws a typed error that names the field for bad input', () => {
    const base = { id: 'x', stage: 'inspection', vatRate: 'standard' } as const;
    const price = (line: unknown) => priceEstimate({ lines: [line as EstimateLineInput] }, pricing);
    expect(codeOf(() => price({ ...base, kind: 'part', quantity: '-1', unitCost: '2.00' }))).toBe('negative_amount @ lines[0].quantity');
    expect(codeOf(() => price({ ...base, kind: 'labour', hours: '-0.5', ratePerHour: '40.00' }))).toBe('negative_amount @ lines[0].hours');
    expect(codeOf(() => price({ ...base, kind: 'labour', hours: '1', ratePerHour: '40.005' }))).toBe('too_many_decimals @ lines[0].ratePerHour');
    expect(codeOf(() => price({ ...base, kind: 'fee', amount: 12.5 }))).toBe('invalid_amount @ lines[0].amount');
    expect(codeOf(() => price({ ...base, kind: 'fee', amount: 'abc' }))).toBe('invalid_amount @ lines[0].amount');
    expect(codeOf(() => price({ ...base, kind: 'part', quantity: '1' }))).toBe('invalid_input @ lines[0]');
    expect(codeOf(() => price({ ...base, kind: 'gift', amount: '1.00' }))).toBe('invalid_input @ lines[0].kind');
    expect(codeOf(() => price({ ...base, stage: 'maybe', kind: 'fee', amount: '1.00' }))).toBe('invalid_input @ lines[0].stage');
    expect(codeOf(() => price({ ...base, vatRate: 'luxury', kind: 'fee', amount: '1.00' }))).toBe('invalid_input @ lines[0].vatRate');
    expect(codeOf(() => price({ ...base, kind: 'fee', amount: '1.00', discount: { amount: '1.01' } }))).toBe('out_of_range @ lines[0].discount.amount');
    expect(codeOf(() => price({ ...base, kind: 'fee', amount: '1.00', discount: { percent: '101' } }))).toBe('out_of_range @ lines[0].discount.percent');
    expect(codeOf(() => price({ ...base, kind: 'fee', amount: '1.00', accessTaskId: 'nope' }))).toBe('invalid_input @ lines[0].accessTaskId');
    expect(
      codeOf(() =>
        priceEstimate(
          {
            lines: [
              { ...base, kind: 'fee', amount: '1.00' },
              { ...base, kind: 'fee', amount: '2.00' },
            ],
          },
          pricing,
        ),
      ),
    ).toBe('invalid_input @ lines[1].id');
    expect(codeOf(() => priceEstimate({ lines: [] }, { ...pricing, currency: 'XYZ' }))).toMatch(/^unknown_currency/);
    expect(codeOf(() => priceEstimate({ lines: [] }, { ...pricing, vatRounding: 'up' as never }))).toMatch(/^invalid_input/);
  });
});

describe('stages and shared access labour — a worked example', () => {
  // Worked by hand [invented figures, arithmetic only]:
  //   access "gearbox-off": 2.5 h × £60.00 = £150.00, standard rate.
  //   inspection: labour 3 h × £60 = £180.00; fee £25.00                          → £205.00
  //   finding F1 (approved): part 1 × £40.00 + 20% = £48.00; labour 1 h = £60.00; needs gearbox-off
  //   finding F2 (approved): part 2 × £12.50 + 20% = £30.00; labour 0.5 h = £30.00; needs gearbox-off
  //   finding F3 (discovered): labour 1.5 h = £90.00; needs gearbox-off
  //   finding F4 (declined): sub-contract £200.00 + 10% = £220.00
  // gearbox-off is paid once, in approved work (F1 and F2 share it): saving (2 − 1) × £150 = £150 net, £180 incl. VAT.
  //   approved = 48 + 60 + 30 + 30 + 150 = £318.00, VAT £63.60
  //   committed (invoice) = 205 + 318 = £523.00, VAT £104.60, gross £627.60
  //   undecided = F3's £90.00 (its access is already paid for), VAT £18.00
  const input: EstimateInput = {
    accessTasks: [{ id: 'gearbox-off', hours: '2.5', ratePerHour: '60.00', vatRate: 'standard' }],
    lines: [
      { id: 'i1', stage: 'inspection', kind: 'labour', hours: '3', ratePerHour: '60.00', vatRate: 'standard' },
      { id: 'i2', stage: 'inspection', kind: 'fee', amount: '25.00', vatRate: 'standard' },
      { id: 'f1a', stage: 'approved', kind: 'part', quantity: '1', unitCost: '40.00', vatRate: 'standard', findingId: 'F1', accessTaskId: 'gearbox-off' },
      { id: 'f1b', stage: 'approved', kind: 'labour', hours: '1', ratePerHour: '60.00', vatRate: 'standard', findingId: 'F1', accessTaskId: 'gearbox-off' },
      { id: 'f2a', stage: 'approved', kind: 'part', quantity: '2', unitCost: '12.50', vatRate: 'standard', findingId: 'F2', accessTaskId: 'gearbox-off' },
      { id: 'f2b', stage: 'approved', kind: 'labour', hours: '0.5', ratePerHour: '60.00', vatRate: 'standard', findingId: 'F2', accessTaskId: 'gearbox-off' },
      { id: 'f3a', stage: 'discovered', kind: 'labour', hours: '1.5', ratePerHour: '60.00', vatRate: 'standard', findingId: 'F3', accessTaskId: 'gearbox-off' },
      { id: 'f4a', stage: 'declined', kind: 'subcontract', cost: '200.00', vatRate: 'standard', findingId: 'F4' },
    ],
  };
  const std = (net: string, vat: string) => [{ code: 'standard', rate: '20', net, vat }];

  it('totals each stage, the quote, the committed total and what is undecided', () => {
    const r = priceEstimate(input, pricing);
    expect(r.stages.inspection).toEqual({ net: '205.00', vat: '41.00', gross: '246.00', byRate: std('205.00', '41.00') });
    expect(r.stages.approved).toEqual({ net: '318.00', vat: '63.60', gross: '381.60', byRate: std('318.00', '63.60') });
    expect(r.stages.discovered).toEqual({ net: '90.00', vat: '18.00', gross: '108.00', byRate: std('90.00', '18.00') });
    expect(r.stages.declined).toEqual({ net: '220.00', vat: '44.00', gross: '264.00', byRate: std('220.00', '44.00') });
    expect(r.quoted).toEqual(r.stages.inspection);
    expect(r.committed).toEqual({ net: '523.00', vat: '104.60', gross: '627.60', byRate: std('523.00', '104.60') });
    expect(r.change).toEqual({ net: '318.00', vat: '63.60', gross: '381.60' });
    expect(r.undecided).toMatchObject({ net: '90.00', gross: '108.00', findings: 1 });
    expect(r.ifAllApproved).toMatchObject({ net: '613.00', vat: '122.60', gross: '735.60' });
  });

  it('charges the access labour once and reports the saving', () => {
    const r = priceEstimate(input, pricing);
    expect(r.accessTasks).toEqual([
      {
        id: 'gearbox-off',
        net: '150.00',
        vatRate: 'standard',
        vatPercent: '20',
        chargedIn: 'approved',
        committedPays: true,
        committedRemedies: 2,
        saving: '150.00',
        savingGross: '180.00',
        remediesIfAllApproved: 3,
        savingIfAllApproved: '300.00',
      },
    ]);
    expect(r.accessSaving).toEqual({ net: '150.00', gross: '180.00' });
  });

  it("prices each finding for the owner's decision page", () => {
    const r = priceEstimate(input, pricing);
    const f = Object.fromEntries(r.findings.map((x) => [x.findingId, x]));
    expect(r.findings.map((x) => x.findingId)).toEqual(['F1', 'F2', 'F3', 'F4']);
    // F3's access is already paid for by F1 and F2, so its price is its own work: £90 + VAT = £108.
    expect(f.F3).toMatchObject({ stage: 'discovered', accessCharged: [], accessCovered: ['gearbox-off'] });
    expect(f.F3!.price).toMatchObject({ net: '90.00', vat: '18.00', gross: '108.00' });
    expect(f.F1!.work.gross).toBe('129.60');
    expect(f.F4).toMatchObject({ stage: 'declined', accessCharged: [], accessCovered: [] });
    expect(f.F4!.price.gross).toBe('264.00');
    expect(priceFinding(input, pricing, 'F3')).toEqual(f.F3);
    expect(codeOf(() => priceFinding(input, pricing, 'F9'))).toBe('invalid_input @ findingId');
  });

  it('when nothing committed uses the access task, each undecided finding carries it, and the undecided total carries it once', () => {
    const allOpen: EstimateInput = {
      ...input,
      lines: input.lines.map((l) => (l.stage === 'approved' ? { ...l, stage: 'discovered' as const } : l)),
    };
    const r = priceEstimate(allOpen, pricing);
    const f = Object.fromEntries(r.findings.map((x) => [x.findingId, x]));
    // F1 alone: £108 work + £150 access = £258 net, £309.60 incl. VAT.
    expect(f.F1!.price).toMatchObject({ net: '258.00', gross: '309.60' });
    expect(f.F1!.accessCharged).toEqual(['gearbox-off']);
    // Undecided: 108 + 60 + 90 + 150 (once) = £408.00.
    expect(r.undecided).toMatchObject({ net: '408.00', vat: '81.60', gross: '489.60', findings: 3 });
    expect(r.accessTasks[0]).toMatchObject({ chargedIn: 'discovered', committedRemedies: 0, saving: '0.00', savingIfAllApproved: '300.00' });
    expect(r.committed.net).toBe('205.00');
  });

  it('when the inspection scope opens up the same area, findings get the access free', () => {
    const scoped: EstimateInput = {
      ...input,
      lines: [...input.lines, { id: 'i3', stage: 'inspection', kind: 'labour', hours: '0.5', ratePerHour: '60.00', vatRate: 'standard', accessTaskId: 'gearbox-off' }],
    };
    const r = priceEstimate(scoped, pricing);
    expect(r.accessTasks[0]).toMatchObject({ chargedIn: 'inspection', committedRemedies: 3, saving: '300.00' });
    expect(r.stages.inspection.net).toBe('385.00'); // 205 + 30 + 150
    expect(r.stages.approved.net).toBe('168.00'); // access no longer here
    expect(r.committed.net).toBe('553.00');
  });

  it('leaves an access task no line uses uncharged', () => {
    const r = priceEstimate({ ...input, accessTasks: [...input.accessTasks!, { id: 'wing-off', hours: '4', ratePerHour: '60.00', vatRate: 'standard' }] }, pricing);
    expect(r.accessTasks[1]).toMatchObject({ id: 'wing-off', chargedIn: null, saving: '0.00' });
    expect(r.committed.net).toBe('523.00');
  });
});

// ---- properties ----

const CURRENCIES = ['GBP', 'JPY', 'KWD'] as const;
const STAGES: EstimateStage[] = ['inspection', 'discovered', 'approved', 'declined'];

function amountArb(cur: string, maxMinor = 5_000_000) {
  const dp = minorUnits(cur);
  return fc.integer({ min: 0, max: maxMinor }).map((n) => new Dec(n).dividedBy(new Dec(10).pow(dp)).toFixed(dp));
}
const qtyArb = fc.integer({ min: 0, max: 4000 }).map((n) => new Dec(n).dividedBy(100).toString()); // 0 … 40, 2 dp
const pctArb = fc.integer({ min: 0, max: 20000 }).map((n) => new Dec(n).dividedBy(100).toString()); // 0 … 200%

function lineArb(cur: string, accessIds: string[]): fc.Arbitrary<Omit<EstimateLineInput, 'id'>> {
  const common = fc.record({
    stage: fc.constantFrom(...STAGES),
    vatRate: fc.constantFrom('standard', 'reduced', 'zero', 'exempt', 'outside') as fc.Arbitrary<EstimateLineInput['vatRate']>,
    findingId: fc.option(fc.constantFrom('F1', 'F2', 'F3', 'F4', 'F5'), { nil: undefined }),
    accessTaskId: accessIds.length ? fc.option(fc.constantFrom(...accessIds), { nil: undefined }) : fc.constant(undefined),
    discount: fc.option(fc.record({ percent: fc.integer({ min: 0, max: 100 }).map(String) }), { nil: undefined }),
  });
  const kind = fc.oneof(
    fc.record({ kind: fc.constant('labour' as const), hours: qtyArb, ratePerHour: amountArb(cur, 20000) }),
    fc.record({ kind: fc.constant('part' as const), quantity: qtyArb, unitCost: amountArb(cur), markupPercent: fc.option(pctArb, { nil: undefined }) }),
    fc.record({ kind: fc.constant('part' as const), quantity: qtyArb, unitPrice: amountArb(cur) }),
    fc.record({ kind: fc.constant('subcontract' as const), cost: amountArb(cur), markupPercent: fc.option(pctArb, { nil: undefined }) }),
    fc.record({ kind: fc.constant('fee' as const), amount: amountArb(cur) }),
  );
  return fc.tuple(common, kind).map(([c, k]) => ({ ...c, ...k }) as Omit<EstimateLineInput, 'id'>);
}

const caseArb = fc.constantFrom(...CURRENCIES).chain((cur) =>
  fc
    .record({
      accessTasks: fc.uniqueArray(
        fc.record({ id: fc.constantFrom('A1', 'A2', 'A3'), hours: qtyArb, ratePerHour: amountArb(cur, 20000), vatRate: fc.constantFrom('standard', 'reduced') as fc.Arbitrary<'standard' | 'reduced'> }),
        { selector: (t) => t.id, maxLength: 3 },
      ),
      rounding: fc.constantFrom(...VAT_ROUNDING_METHODS),
      seed: fc.nat(),
    })
    .chain(({ accessTasks, rounding, seed }) =>
      fc.array(lineArb(cur, accessTasks.map((t) => t.id)), { maxLength: 30 }).map((lines) => ({
        cur,
        rounding,
        seed,
        input: { accessTasks, lines: lines.map((l, i) => ({ ...l, id: `L${i}` }) as EstimateLineInput) },
      })),
    ),
);

function pricingFor(cur: string, rounding: WorkshopPricing['vatRounding']): WorkshopPricing {
  return { ...pricing, currency: cur, vatRounding: rounding };
}

function amountsIn(r: PricedEstimate): string[] {
  const t = (x: { net: string; vat: string; gross: string; byRate?: { net: string; vat: string }[] }) => [x.net, x.vat, x.gross, ...(x.byRate ?? []).flatMap((g) => [g.net, g.vat])];
  return [
    ...r.lines.flatMap((l) => [l.listNet, l.discount, l.net, ...(l.cost ? [l.cost] : []), ...(l.vat ? [l.vat] : [])]),
    ...r.accessTasks.flatMap((a) => [a.net, a.saving, a.savingGross, a.savingIfAllApproved]),
    ...STAGES.flatMap((s) => t(r.stages[s])),
    ...t(r.quoted),
    ...t(r.committed),
    ...t(r.change),
    ...t(r.undecided),
    ...t(r.ifAllApproved),
    r.accessSaving.net,
    r.accessSaving.gross,
    ...r.findings.flatMap((f) => [...t(f.work), ...t(f.price)]),
  ];
}

describe('priceEstimate — properties', () => {
  it('never returns an amount with more decimals than the currency', () => {
    fc.assert(
      fc.property(caseArb, ({ cur, rounding, input }) => {
        const dp = minorUnits(cur);
        const shape = dp === 0 ? /^-?\d+$/ : new RegExp(`^-?\\d+\\.\\d{${dp}}$`);
        for (const a of amountsIn(priceEstimate(input, pricingFor(cur, rounding)))) expect(a).toMatch(shape);
      }),
      { numRuns: 150 },
    );
  });

  it('adds its parts up to its totals', () => {
    fc.assert(
      fc.property(caseArb, ({ cur, rounding, input }) => {
        const dp = minorUnits(cur);
        const r = priceEstimate(input, pricingFor(cur, rounding));
        const sum = (xs: string[]) => xs.reduce((a, x) => a.plus(x), new Dec(0)).toFixed(dp);
        for (const s of STAGES) {
          const lineNets = r.lines.filter((l) => l.stage === s).map((l) => l.net);
          const accessNets = r.accessTasks.filter((a) => a.chargedIn === s).map((a) => a.net);
          expect(sum([...lineNets, ...accessNets])).toBe(r.stages[s].net);
          expect(sum(r.stages[s].byRate.map((g) => g.net))).toBe(r.stages[s].net);
          expect(sum(r.stages[s].byRate.map((g) => g.vat))).toBe(r.stages[s].vat);
          expect(sum([r.stages[s].net, r.stages[s].vat])).toBe(r.stages[s].gross);
        }
        for (const l of r.lines) expect(sum([l.net, l.discount])).toBe(l.listNet);
        expect(sum([r.stages.inspection.net, r.stages.approved.net])).toBe(r.committed.net);
        expect(sum([r.committed.net, r.stages.discovered.net])).toBe(r.ifAllApproved.net);
        expect(sum([r.committed.gross, `-${r.quoted.gross}`])).toBe(r.change.gross);
        expect(sum(r.accessTasks.map((a) => a.saving))).toBe(r.accessSaving.net);
        for (const f of r.findings) expect(new Dec(f.price.net).greaterThanOrEqualTo(f.work.net)).toBe(true);
      }),
      { numRuns: 150 },
    );
  });

  it('does not depend on line order or access-task order', () => {
    fc.assert(
      fc.property(caseArb, ({ cur, rounding, input, seed }) => {
        const p = pricingFor(cur, rounding);
        const shuffle = <T,>(xs: T[]) =>
          xs
            .map((x, i) => ({ x, k: (i * 2654435761 + seed) % 4294967296 }))
            .sort((a, b) => a.k - b.k)
            .map((e) => e.x);
        const a = priceEstimate(input, p);
        const b = priceEstimate({ accessTasks: shuffle(input.accessTasks ?? []), lines: shuffle(input.lines) }, p);
        const byId = <T extends { id: string }>(xs: T[]) => [...xs].sort((x, y) => (x.id < y.id ? -1 : 1));
        expect({ ...b, lines: byId(b.lines), accessTasks: byId(b.accessTasks) }).toEqual({ ...a, lines: byId(a.lines), accessTasks: byId(a.accessTasks) });
      }),
      { numRuns: 150 },
    );
  });
});
