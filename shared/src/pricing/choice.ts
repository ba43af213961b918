import { Dec, MoneyError, allocate, formatAmount, minorUnits } from '../money.js';
import { priceNets } from './estimate.js';
import type { LineKind, NetAccessTaskInput, NetEstimateInput, NetLineInput, NetPricing, PricedEstimate, Totals, VatRateCode } from './types.js';
import type { VatRounding } from './vat.js';

/**
 * Pricing an owner's choice on one approval request: any subset of its items approved, declined or
 * still open, priced exactly as the estimate will stand once the choice is recorded. The decision
 * page, the receipt, every e-mail, the manager's send preview and the server's snapshot all call
 * `priceChoice`, so no two of them can disagree.
 */

/** The item id of the quote (the unagreed inspection scope) in a request; a finding's item id is its own id. */
export const QUOTE_ITEM_ID = 'quote';

export type ItemChoice = 'approve' | 'decline';
/** itemId → the owner's choice; undefined (or absent) while the owner has not chosen. */
export type Choice = Record<string, ItemChoice | undefined>;

/** A line as the engine priced it: all a choice needs to price it again. */
export interface ChoiceLine {
  kind: LineKind;
  /** After any line discount, in the currency's minor units: the engine's own figure. */
  net: string;
  vatRate: VatRateCode;
  accessTaskId: string | null;
}

export interface ChoiceItem {
  /** "quote", or the finding's id. */
  id: string;
  kind: 'quote' | 'finding';
  lines: ChoiceLine[];
}

/**
 * Everything `priceChoice` needs, frozen in the snapshot at sending and built only from the
 * engine's own result (`choiceBasisFrom`).
 */
export interface ChoiceBasis {
  currency: string;
  rounding: VatRounding;
  /** The workshop's VAT percentages at sending. */
  vatRates: { standard: string; reduced: string; zero: string };
  /** Agreed so far at sending: the agreed inspection scope and approved work, with the opening-up it pays for. */
  committed: { lines: ChoiceLine[]; accessTasks: NetAccessTaskInput[] };
  /** The request's items: the quote (its unagreed inspection lines) and/or findings (their discovered lines). */
  items: ChoiceItem[];
  /** Opening-up tasks the items' lines name that agreed work does not already pay for. */
  accessTasks: { id: string; name: string; net: string; vatRate: VatRateCode }[];
}

export interface Amounts {
  net: string;
  vat: string;
  gross: string;
}

export interface PricedChoiceItem {
  id: string;
  kind: 'quote' | 'finding';
  choice: ItemChoice | null;
  /** Its share of `approvingNow` when approved in this choice (excluding opening-up work); "0.00" otherwise. */
  gross: string;
  /** Its fixed price if everything in the request were approved (excluding opening-up): for cards shown before choosing. */
  allApprovedGross: string;
}

export interface PricedOpeningUp {
  id: string;
  name: string;
  /** True when an approved item needs it, so this choice pays for it (once). */
  charged: boolean;
  /** Its share of `approvingNow` when charged; "0.00" otherwise. */
  gross: string;
  /** Its fixed price if everything were approved. */
  allApprovedGross: string;
  /** The items whose lines need it, in request order. */
  neededBy: string[];
}

export interface PricedChoice {
  currency: string;
  rounding: VatRounding;
  /** Agreed before this request: the estimate's committed total at sending. */
  agreedSoFar: Totals;
  /** The estimate's committed total once this choice is recorded. */
  newTotal: Totals;
  /** newTotal − agreedSoFar. Σ approved items' gross + Σ charged opening-up gross equals its gross exactly. */
  approvingNow: Amounts;
  /** The committed total if every item of the request were approved. */
  ifAllApproved: Totals;
  /** What the items without a choice would add if approved on top of this choice. */
  undecidedGross: string;
  items: PricedChoiceItem[];
  openingUp: PricedOpeningUp[];
  /** Items with a choice, and how many there are. */
  chosen: number;
  of: number;
}

function pricingOf(b: ChoiceBasis): NetPricing {
  return { currency: b.currency, vatRounding: b.rounding, vatRates: b.vatRates };
}

function checkBasis(b: ChoiceBasis): void {
  if (!b || typeof b !== 'object' || !Array.isArray(b.items) || !b.committed || !Array.isArray(b.accessTasks)) {
    throw new MoneyError('invalid_input', 'a choice needs its pricing basis.', 'basis');
  }
  const ids = new Set<string>();
  for (const it of b.items) {
    if (ids.has(it.id)) throw new MoneyError('invalid_input', `item "${it.id}" is in the request twice.`, 'basis.items');
    ids.add(it.id);
  }
}

function checkChoice(b: ChoiceBasis, choice: Choice): void {
  const ids = new Set(b.items.map((i) => i.id));
  for (const [k, v] of Object.entries(choice ?? {})) {
    if (!ids.has(k)) throw new MoneyError('invalid_input', `"${k}" is not an item of this request.`, 'choice');
    if (v !== undefined && v !== 'approve' && v !== 'decline') throw new MoneyError('invalid_input', 'a choice is approve or decline.', `choice.${k}`);
  }
}

/**
 * The estimate as it will stand after the choice: agreed work as it was, the quote agreed when
 * approved (unagreed otherwise: a declined quote never counts), each finding approved, declined or
 * still discovered.
 */
export function estimateAfterChoice(b: ChoiceBasis, choice: Choice): NetEstimateInput {
  const lines: NetLineInput[] = b.committed.lines.map((l, i) => ({ id: `committed:${i}`, stage: 'approved', findingId: null, ...l }));
  for (const item of b.items) {
    const c = choice[item.id];
    item.lines.forEach((l, i) => {
      const id = `${item.id}:${i}`;
      if (item.kind === 'quote') lines.push({ id, stage: 'inspection', agreed: c === 'approve', findingId: null, ...l });
      else lines.push({ id, stage: c === 'approve' ? 'approved' : c === 'decline' ? 'declined' : 'discovered', findingId: item.id, ...l });
    });
  }
  return {
    lines,
    accessTasks: [...b.committed.accessTasks, ...b.accessTasks].map((t) => ({ id: t.id, net: t.net, vatRate: t.vatRate })),
  };
}

const committedOf = (b: ChoiceBasis, choice: Choice): Totals => priceNets(estimateAfterChoice(b, choice), pricingOf(b)).committed;

function diff(a: Totals, b: Totals, dp: number): Amounts {
  const d = (x: string, y: string) => formatAmount(new Dec(x).minus(y), dp);
  return { net: d(a.net, b.net), vat: d(a.vat, b.vat), gross: d(a.gross, b.gross) };
}

/** A component's own gross: its lines priced alone (no opening-up), or an opening-up task alone. */
function ownGross(b: ChoiceBasis, lines: ChoiceLine[]): string {
  const input: NetEstimateInput = { lines: lines.map((l, i) => ({ id: `own:${i}`, stage: 'approved', kind: l.kind, net: l.net, vatRate: l.vatRate, accessTaskId: null })) };
  return priceNets(input, pricingOf(b)).committed.gross;
}

/** Splits `amount` over components in proportion to their own gross (largest remainder), so the parts add up exactly. */
function split(amount: string, weights: string[], currency: string): string[] {
  if (weights.length === 0) return [];
  const zero = formatAmount(new Dec(0), minorUnits(currency));
  if (weights.every((w) => new Dec(w).isZero())) {
    if (new Dec(amount).isZero()) return weights.map(() => zero);
    return allocate(amount, weights.map(() => '1'), currency);
  }
  return allocate(amount, weights, currency);
}

interface Allocation {
  items: Map<string, string>;
  tasks: Map<string, string>;
}

function allocateDelta(b: ChoiceBasis, approved: Set<string>, delta: string, own: { items: Map<string, string>; tasks: Map<string, string> }, neededBy: Map<string, string[]>): Allocation {
  const items = b.items.filter((i) => approved.has(i.id));
  const tasks = b.accessTasks.filter((t) => (neededBy.get(t.id) ?? []).some((id) => approved.has(id)));
  const parts = split(delta, [...items.map((i) => own.items.get(i.id)!), ...tasks.map((t) => own.tasks.get(t.id)!)], b.currency);
  return {
    items: new Map(items.map((i, k) => [i.id, parts[k]!])),
    tasks: new Map(tasks.map((t, k) => [t.id, parts[items.length + k]!])),
  };
}

/**
 * Prices one choice on a request. Exact by construction: `newTotal` is the engine's committed total
 * of the estimate after the choice; `approvingNow` is its difference from `agreedSoFar`; and that
 * difference is split over the approved items and the opening-up work they pay for, each in
 * proportion to its own gross, so the figures a page shows always add up with no footnote.
 */
export function priceChoice(basis: ChoiceBasis, choice: Choice): PricedChoice {
  checkBasis(basis);
  checkChoice(basis, choice);
  const fixed = fixedOf(basis);
  const dp = minorUnits(basis.currency);
  const zero = formatAmount(new Dec(0), dp);
  const topUp: Choice = Object.fromEntries(basis.items.map((i) => [i.id, choice[i.id] ?? 'approve']));

  const newTotal = committedOf(basis, choice);
  const approvingNow = diff(newTotal, fixed.agreedSoFar, dp);
  const undecidedGross = basis.items.some((i) => choice[i.id] === undefined) ? diff(committedOf(basis, topUp), newTotal, dp).gross : zero;
  const approved = new Set(basis.items.filter((i) => choice[i.id] === 'approve').map((i) => i.id));
  const now = allocateDelta(basis, approved, approvingNow.gross, fixed.own, fixed.neededBy);

  return {
    currency: basis.currency,
    rounding: basis.rounding,
    agreedSoFar: fixed.agreedSoFar,
    newTotal,
    approvingNow,
    ifAllApproved: fixed.ifAllApproved,
    undecidedGross,
    items: basis.items.map((i) => ({
      id: i.id,
      kind: i.kind,
      choice: choice[i.id] ?? null,
      gross: now.items.get(i.id) ?? zero,
      allApprovedGross: fixed.all.items.get(i.id) ?? zero,
    })),
    openingUp: basis.accessTasks.map((t) => ({
      id: t.id,
      name: t.name,
      charged: now.tasks.has(t.id),
      gross: now.tasks.get(t.id) ?? zero,
      allApprovedGross: fixed.all.tasks.get(t.id) ?? zero,
      neededBy: fixed.neededBy.get(t.id) ?? [],
    })),
    chosen: basis.items.filter((i) => choice[i.id] !== undefined).length,
    of: basis.items.length,
  };
}

interface Fixed {
  agreedSoFar: Totals;
  ifAllApproved: Totals;
  own: { items: Map<string, string>; tasks: Map<string, string> };
  neededBy: Map<string, string[]>;
  all: Allocation;
}

/** What does not depend on the choice, worked once per basis (a page re-prices on every tap). */
const FIXED = new WeakMap<ChoiceBasis, Fixed>();

function fixedOf(basis: ChoiceBasis): Fixed {
  const hit = FIXED.get(basis);
  if (hit) return hit;
  const dp = minorUnits(basis.currency);
  const all: Choice = Object.fromEntries(basis.items.map((i) => [i.id, 'approve' as const]));
  const agreedSoFar = committedOf(basis, {});
  const ifAllApproved = committedOf(basis, all);
  const neededBy = new Map<string, string[]>();
  for (const item of basis.items) {
    for (const l of item.lines) {
      if (l.accessTaskId === null) continue;
      const list = neededBy.get(l.accessTaskId) ?? [];
      if (!list.includes(item.id)) list.push(item.id);
      neededBy.set(l.accessTaskId, list);
    }
  }
  const own = {
    items: new Map(basis.items.map((i) => [i.id, ownGross(basis, i.lines)])),
    tasks: new Map(basis.accessTasks.map((t) => [t.id, ownGross(basis, [{ kind: 'labour', net: t.net, vatRate: t.vatRate, accessTaskId: null }])])),
  };
  const f: Fixed = {
    agreedSoFar,
    ifAllApproved,
    own,
    neededBy,
    all: allocateDelta(basis, new Set(basis.items.map((i) => i.id)), diff(ifAllApproved, agreedSoFar, dp).gross, own, neededBy),
  };
  FIXED.set(basis, f);
  return f;
}

/**
 * The basis for a request, built only from the engine's result for the estimate at sending: the
 * committed lines and the request's lines carry the engine's own nets, so re-pricing them gives the
 * estimate's own figures. Throws when an item has no lines awaiting the owner.
 */
export function choiceBasisFrom(
  priced: PricedEstimate,
  request: { quote: boolean; findingIds: string[] },
  vatRates: ChoiceBasis['vatRates'],
  accessTaskName: (id: string) => string,
): ChoiceBasis {
  const asChoice = (l: PricedEstimate['lines'][number]): ChoiceLine => ({ kind: l.kind, net: l.net, vatRate: l.vatRate, accessTaskId: l.accessTaskId });
  const items: ChoiceItem[] = [];
  if (request.quote) {
    const lines = priced.lines.filter((l) => l.stage === 'inspection' && !l.agreed);
    if (!lines.length) throw new MoneyError('invalid_input', 'the quote has no lines awaiting the owner.', 'quote');
    items.push({ id: QUOTE_ITEM_ID, kind: 'quote', lines: lines.map(asChoice) });
  }
  for (const id of request.findingIds) {
    const lines = priced.lines.filter((l) => l.stage === 'discovered' && l.findingId === id);
    if (!lines.length) throw new MoneyError('invalid_input', `finding "${id}" has no lines awaiting the owner.`, 'findingIds');
    items.push({ id, kind: 'finding', lines: lines.map(asChoice) });
  }
  const named = new Set(items.flatMap((i) => i.lines.map((l) => l.accessTaskId)).filter((x): x is string => x !== null));
  return {
    currency: priced.currency,
    rounding: priced.rounding,
    vatRates: { standard: vatRates.standard, reduced: vatRates.reduced, zero: vatRates.zero },
    committed: {
      lines: priced.lines.filter((l) => l.stage === 'approved' || (l.stage === 'inspection' && l.agreed)).map(asChoice),
      accessTasks: priced.accessTasks.filter((t) => t.committedPays).map((t) => ({ id: t.id, net: t.net, vatRate: t.vatRate })),
    },
    items,
    accessTasks: priced.accessTasks
      .filter((t) => named.has(t.id) && !t.committedPays)
      .map((t) => ({ id: t.id, name: accessTaskName(t.id), net: t.net, vatRate: t.vatRate })),
  };
}
