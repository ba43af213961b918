import { Dec, MoneyError, formatAmount, minorUnits, parseAmount, parseDecimal, roundHalfUp } from '../money.js';
import type { WorkshopDto } from '../schemas/workshop.js';
import {
  ESTIMATE_STAGES,
  LINE_KINDS,
  VAT_RATE_CODES,
  type AccessTaskInput,
  type EstimateInput,
  type EstimateLineInput,
  type EstimateStage,
  type LineKind,
  type NetAccessTaskInput,
  type NetEstimateInput,
  type NetLineInput,
  type NetPricing,
  type PricedAccessTask,
  type PricedEstimate,
  type PricedFinding,
  type PricedLine,
  type RateTotal,
  type Totals,
  type VatRateCode,
  type WorkshopPricing,
} from './types.js';
import {
  accumulateVat,
  assertVatRounding,
  exactVat,
  finishVat,
  isPerLine,
  mergeVat,
  parseVatRate,
  roundLineVat,
  type VatAccumulator,
  type VatItem,
  type VatRounding,
} from './vat.js';

const PERCENT = new Dec('0.01');
const ONE = new Dec(1);
const ZERO = new Dec(0);

/** The pricing-relevant part of a workshop's settings. */
export function workshopPricingFrom(w: Pick<WorkshopDto, 'currency' | 'vatRates' | 'settings'>): WorkshopPricing {
  return {
    currency: w.currency,
    vatRounding: w.settings.vatRounding,
    vatRates: w.vatRates,
    partsMarkupPercent: w.settings.partsMarkupPercent,
    subcontractMarkupPercent: w.settings.subcontractMarkupPercent,
  };
}

/** Settings parsed once per call, so the per-line loop never re-parses them. */
export interface PricingContext {
  currency: string;
  dp: number;
  rounding: VatRounding;
  rates: Record<VatRateCode, Dec>;
  rateStrings: Record<VatRateCode, string>;
  /** 1 + mark-up%, kept as a factor so each line is one multiplication. */
  partsFactor: Dec;
  subcontractFactor: Dec;
}

export function pricingContext(p: WorkshopPricing): PricingContext {
  if (!p || typeof p !== 'object') throw new MoneyError('invalid_input', 'workshop pricing settings are required.', 'pricing');
  const dp = minorUnits(p.currency);
  assertVatRounding(p.vatRounding);
  const rates: Record<VatRateCode, Dec> = {
    standard: parseVatRate(p.vatRates?.standard, 'pricing.vatRates.standard'),
    reduced: parseVatRate(p.vatRates?.reduced, 'pricing.vatRates.reduced'),
    zero: parseVatRate(p.vatRates?.zero, 'pricing.vatRates.zero'),
    exempt: ZERO,
    outside: ZERO,
  };
  if (!rates.zero.isZero()) throw new MoneyError('out_of_range', 'the zero rate must be 0.', 'pricing.vatRates.zero');
  const rateStrings = Object.fromEntries(VAT_RATE_CODES.map((c) => [c, rates[c].toString()])) as Record<VatRateCode, string>;
  return {
    currency: p.currency,
    dp,
    rounding: p.vatRounding,
    rates,
    rateStrings,
    partsFactor: markupFactor(p.partsMarkupPercent, 'pricing.partsMarkupPercent'),
    subcontractFactor: markupFactor(p.subcontractMarkupPercent, 'pricing.subcontractMarkupPercent'),
  };
}

function markupFactor(pct: unknown, path: string): Dec {
  return ONE.plus(parseDecimal(pct, path).times(PERCENT));
}

function oneOf<T extends string>(allowed: readonly T[], v: unknown, path: string): T {
  if (!(allowed as readonly unknown[]).includes(v)) {
    throw new MoneyError('invalid_input', `"${String(v)}" is not one of ${allowed.join(', ')}.`, path);
  }
  return v as T;
}

function optionalId(v: unknown, path: string): string | null {
  if (v === undefined || v === null) return null;
  if (typeof v !== 'string' || v.length === 0) throw new MoneyError('invalid_input', 'must be a non-empty string id.', path);
  return v;
}

function requiredId(v: unknown, path: string): string {
  const id = optionalId(v, path);
  if (id === null) throw new MoneyError('invalid_input', 'an id is required.', path);
  return id;
}

/** A line's price before discount, and its cost to the workshop where it has one. */
interface LineBase {
  list: Dec;
  cost: Dec | null;
}

/**
 * Each line is rounded once, to the nearest minor unit (half up), after its own multiplication;
 * a line on a VAT invoice shows an amount in whole pence [practice: line amounts are shown and
 * stored in the currency's minor unit; VAT Notice 700 §16.3 lists the line amount excl. VAT].
 */
function lineBase(line: EstimateLineInput, ctx: PricingContext): LineBase {
  const { currency, dp } = ctx;
  switch (line.kind) {
    case 'labour': {
      const hours = parseDecimal(line.hours, 'hours');
      const rate = parseAmount(line.ratePerHour, currency, 'ratePerHour');
      return { list: roundHalfUp(hours.times(rate), dp), cost: null };
    }
    case 'part': {
      const qty = parseDecimal(line.quantity, 'quantity');
      const hasPrice = line.unitPrice !== undefined && line.unitPrice !== null;
      const hasCost = line.unitCost !== undefined && line.unitCost !== null;
      if (!hasPrice && !hasCost) throw new MoneyError('invalid_input', 'a part needs a unit cost or a fixed unit price.');
      // Unit costs may carry fractions of a penny (bulk fasteners), so they are not held to minor units.
      const rawCost = hasCost ? qty.times(parseDecimal(line.unitCost, 'unitCost')) : null;
      const cost = rawCost === null ? null : roundHalfUp(rawCost, dp);
      if (hasPrice) {
        return { list: roundHalfUp(qty.times(parseDecimal(line.unitPrice, 'unitPrice')), dp), cost };
      }
      const factor =
        line.markupPercent === undefined || line.markupPercent === null ? ctx.partsFactor : markupFactor(line.markupPercent, 'markupPercent');
      // Mark-up on the unrounded cost, so the sell price is rounded once.
      return { list: roundHalfUp(rawCost!.times(factor), dp), cost };
    }
    case 'subcontract': {
      const cost = parseAmount(line.cost, currency, 'cost');
      const factor =
        line.markupPercent === undefined || line.markupPercent === null
          ? ctx.subcontractFactor
          : markupFactor(line.markupPercent, 'markupPercent');
      return { list: roundHalfUp(cost.times(factor), dp), cost };
    }
    case 'fee':
      return { list: parseAmount(line.amount, currency, 'amount'), cost: null };
    default:
      throw new MoneyError('invalid_input', `"${String((line as { kind?: unknown }).kind)}" is not one of ${LINE_KINDS.join(', ')}.`, 'kind');
  }
}

function lineDiscount(line: EstimateLineInput, list: Dec, ctx: PricingContext): Dec {
  const d = line.discount;
  if (d === undefined || d === null) return ZERO;
  if ('percent' in d) {
    const pct = parseDecimal(d.percent, 'discount.percent');
    if (pct.greaterThan(100)) throw new MoneyError('out_of_range', 'a discount cannot exceed 100%.', 'discount.percent');
    return roundHalfUp(list.times(pct).times(PERCENT), ctx.dp);
  }
  if ('amount' in d) {
    const amt = parseAmount(d.amount, ctx.currency, 'discount.amount');
    if (amt.greaterThan(list)) throw new MoneyError('out_of_range', 'a discount cannot exceed the line amount.', 'discount.amount');
    return amt;
  }
  throw new MoneyError('invalid_input', 'a discount is { percent } or { amount }.', 'discount');
}

interface WorkLine {
  id: string;
  stage: EstimateStage;
  /** Inspection lines: agreed by the owner; true for every other stage. */
  agreed: boolean;
  kind: LineKind;
  findingId: string | null;
  accessTaskId: string | null;
  code: VatRateCode;
  rate: Dec;
  list: Dec;
  discount: Dec;
  net: Dec;
  cost: Dec | null;
  /** The line as the VAT core sees it, with its per-line VAT worked once. */
  item: VatItem;
}

interface WorkAccess {
  id: string;
  code: VatRateCode;
  rate: Dec;
  net: Dec;
  item: VatItem;
  stages: Set<EstimateStage>;
  /** Named by agreed work (an agreed inspection line or an approved line). */
  byAgreed: boolean;
  /** Named by work awaiting the owner (an unagreed inspection line or discovered work). */
  byAwaiting: boolean;
  /** Named by an unagreed inspection line. */
  byUnagreedQuote: boolean;
  committedRemedies: Set<string>;
  allRemedies: Set<string>;
}

/** Key for "one remedy": a finding, or the inspection scope / lines raised without a finding. */
const SCOPE_REMEDY = '\u0000scope';

function vatItem(key: VatRateCode, rate: Dec, net: Dec, ctx: PricingContext): VatItem {
  return { key, rate, net, lineVat: isPerLine(ctx.rounding) ? roundLineVat(exactVat(net, rate), ctx.dp, ctx.rounding) : null };
}

function totalsOf(acc: VatAccumulator, ctx: PricingContext): Totals {
  const r = finishVat(acc, ctx.dp, ctx.rounding);
  return {
    net: formatAmount(r.net, ctx.dp),
    vat: formatAmount(r.vat, ctx.dp),
    gross: formatAmount(r.net.plus(r.vat), ctx.dp),
    byRate: r.groups.map((g): RateTotal => ({
      code: g.key as VatRateCode,
      rate: ctx.rateStrings[g.key as VatRateCode],
      net: formatAmount(g.net, ctx.dp),
      vat: formatAmount(g.vat, ctx.dp),
    })),
  };
}

function newAccess(id: string, code: VatRateCode, net: Dec, ctx: PricingContext): WorkAccess {
  return {
    id,
    code,
    rate: ctx.rates[code],
    net,
    item: vatItem(code, ctx.rates[code], net, ctx),
    stages: new Set(),
    byAgreed: false,
    byAwaiting: false,
    byUnagreedQuote: false,
    committedRemedies: new Set(),
    allRemedies: new Set(),
  };
}

function accessCommon(t: { id?: unknown; vatRate?: unknown }, access: Map<string, WorkAccess>): { id: string; code: VatRateCode } {
  if (!t || typeof t !== 'object') throw new MoneyError('invalid_input', 'an access task must be an object.');
  const id = requiredId(t.id, 'id');
  if (access.has(id)) throw new MoneyError('invalid_input', `access task id "${id}" is used twice.`, 'id');
  return { id, code: oneOf(VAT_RATE_CODES, t.vatRate, 'vatRate') };
}

function addAccessTask(t: AccessTaskInput, access: Map<string, WorkAccess>, ctx: PricingContext): void {
  const { id, code } = accessCommon(t, access);
  const hours = parseDecimal(t.hours, 'hours');
  const rate = parseAmount(t.ratePerHour, ctx.currency, 'ratePerHour');
  access.set(id, newAccess(id, code, roundHalfUp(hours.times(rate), ctx.dp), ctx));
}

function addNetAccessTask(t: NetAccessTaskInput, access: Map<string, WorkAccess>, ctx: PricingContext): void {
  const { id, code } = accessCommon(t, access);
  access.set(id, newAccess(id, code, parseAmount(t.net, ctx.currency, 'net'), ctx));
}

/** What every line shares, whether priced from its inputs or already priced: ids, stage, agreement, access. */
interface LineHead {
  id: string;
  stage: EstimateStage;
  agreed: boolean;
  kind: LineKind;
  code: VatRateCode;
  findingId: string | null;
  accessTaskId: string | null;
}

function lineHead(line: EstimateLineInput | NetLineInput, access: Map<string, WorkAccess>, seen: Set<string>): LineHead {
  if (!line || typeof line !== 'object') throw new MoneyError('invalid_input', 'a line must be an object.');
  const id = requiredId(line.id, 'id');
  if (seen.has(id)) throw new MoneyError('invalid_input', `line id "${id}" is used twice.`, 'id');
  seen.add(id);
  const stage = oneOf(ESTIMATE_STAGES, line.stage, 'stage');
  const kind = oneOf(LINE_KINDS, line.kind, 'kind');
  const code = oneOf(VAT_RATE_CODES, line.vatRate, 'vatRate');
  const findingId = optionalId(line.findingId, 'findingId');
  const accessTaskId = optionalId(line.accessTaskId, 'accessTaskId');
  if (line.agreed !== undefined && typeof line.agreed !== 'boolean') throw new MoneyError('invalid_input', 'agreed is true or false.', 'agreed');
  const agreed = stage === 'inspection' ? line.agreed !== false : true;
  if (accessTaskId !== null) {
    const task = access.get(accessTaskId);
    if (!task) throw new MoneyError('invalid_input', `access task "${accessTaskId}" is not in accessTasks.`, 'accessTaskId');
    task.stages.add(stage);
    const remedy = findingId ?? SCOPE_REMEDY;
    const isAgreed = (stage === 'inspection' && agreed) || stage === 'approved';
    if (isAgreed) {
      task.byAgreed = true;
      task.committedRemedies.add(remedy);
    } else if (stage === 'inspection' || stage === 'discovered') {
      task.byAwaiting = true;
      if (stage === 'inspection') task.byUnagreedQuote = true;
    }
    if (stage !== 'declined') task.allRemedies.add(remedy);
  }
  return { id, stage, agreed, kind, code, findingId, accessTaskId };
}

function workLine(line: EstimateLineInput, ctx: PricingContext, access: Map<string, WorkAccess>, seen: Set<string>): WorkLine {
  const head = lineHead(line, access, seen);
  const { list, cost } = lineBase(line, ctx);
  const discount = lineDiscount(line, list, ctx);
  const net = discount.isZero() ? list : list.minus(discount);
  const rate = ctx.rates[head.code];
  // Written out, not `{ ...head, … }`: a spread followed by more keys builds each object the slow way,
  // and this runs once per line of every estimate priced.
  const { id, stage, agreed, kind, code, findingId, accessTaskId } = head;
  return { id, stage, agreed, kind, code, findingId, accessTaskId, rate, list, discount, net, cost, item: vatItem(code, rate, net, ctx) };
}

function netWorkLine(line: NetLineInput, ctx: PricingContext, access: Map<string, WorkAccess>, seen: Set<string>): WorkLine {
  const head = lineHead(line, access, seen);
  const net = parseAmount(line.net, ctx.currency, 'net');
  const rate = ctx.rates[head.code];
  const { id, stage, agreed, kind, code, findingId, accessTaskId } = head;
  return { id, stage, agreed, kind, code, findingId, accessTaskId, rate, list: net, discount: ZERO, net, cost: null, item: vatItem(code, rate, net, ctx) };
}

const STAGE_PRIORITY: readonly EstimateStage[] = ['inspection', 'approved', 'discovered', 'declined'];

/** Parses a list with each failure's path placed inside `prefix[i]`. */
function parseEach<T, R>(list: readonly T[], prefix: string, f: (x: T) => R): R[] {
  return list.map((x, i) => {
    try {
      return f(x);
    } catch (e) {
      // Field paths are relative inside the loop and only built into `lines[i].field` on failure.
      throw e instanceof MoneyError ? e.within(`${prefix}[${i}]`) : e;
    }
  });
}

/**
 * Prices a staged estimate: every figure a screen, e-mail, PDF or payment needs. Pure and
 * deterministic; totals do not depend on line order. Throws `MoneyError` on any invalid input.
 */
export function priceEstimate(input: EstimateInput, pricing: WorkshopPricing): PricedEstimate {
  const ctx = pricingContext(pricing);
  if (!input || !Array.isArray(input.lines)) throw new MoneyError('invalid_input', 'an estimate needs a list of lines.', 'lines');
  const access = new Map<string, WorkAccess>();
  parseEach(input.accessTasks ?? [], 'accessTasks', (t) => addAccessTask(t, access, ctx));
  const seen = new Set<string>();
  const work = parseEach(input.lines, 'lines', (l) => workLine(l, ctx, access, seen));
  return priceWork(work, access, ctx);
}

/**
 * The same engine on lines whose amounts are already priced (each `net` as the engine gave it):
 * what a snapshot stores, so a choice is priced exactly as the estimate will be after deciding.
 * Every figure runs through the same path as `priceEstimate`; only the per-line arithmetic is skipped.
 */
export function priceNets(input: NetEstimateInput, pricing: NetPricing): PricedEstimate {
  const ctx = pricingContext({ ...pricing, partsMarkupPercent: '0', subcontractMarkupPercent: '0' });
  if (!input || !Array.isArray(input.lines)) throw new MoneyError('invalid_input', 'an estimate needs a list of lines.', 'lines');
  const access = new Map<string, WorkAccess>();
  parseEach(input.accessTasks ?? [], 'accessTasks', (t) => addNetAccessTask(t, access, ctx));
  const seen = new Set<string>();
  const work = parseEach(input.lines, 'lines', (l) => netWorkLine(l, ctx, access, seen));
  return priceWork(work, access, ctx);
}

function priceWork(work: WorkLine[], access: Map<string, WorkAccess>, ctx: PricingContext): PricedEstimate {
  const { dp } = ctx;
  // Where each access task is shown: the first stage in priority order that uses it.
  const chargedIn = new Map<string, EstimateStage | null>();
  for (const t of access.values()) chargedIn.set(t.id, STAGE_PRIORITY.find((s) => t.stages.has(s)) ?? null);

  const stageItems: Record<EstimateStage, VatItem[]> = { inspection: [], discovered: [], approved: [], declined: [] };
  // Agreed work (agreed inspection + approved) and work awaiting the owner (unagreed inspection + discovered).
  const agreedItems: VatItem[] = [];
  const awaitingItems: VatItem[] = [];
  const quoteAwaitingItems: VatItem[] = [];
  for (const l of work) {
    stageItems[l.stage].push(l.item);
    if (l.stage === 'approved' || (l.stage === 'inspection' && l.agreed)) agreedItems.push(l.item);
    else if (l.stage === 'discovered') awaitingItems.push(l.item);
    else if (l.stage === 'inspection') {
      awaitingItems.push(l.item);
      quoteAwaitingItems.push(l.item);
    }
  }
  for (const t of access.values()) {
    const s = chargedIn.get(t.id);
    if (s) stageItems[s].push(t.item);
    // Charged once: with agreed work if any agreed work needs it, else with the work awaiting the owner.
    if (t.byAgreed) agreedItems.push(t.item);
    else if (t.byAwaiting) {
      awaitingItems.push(t.item);
      if (t.byUnagreedQuote) quoteAwaitingItems.push(t.item);
    }
  }
  const acc = (items: VatItem[]) => accumulateVat(items, dp, ctx.rounding);
  const stages = {
    inspection: totalsOf(acc(stageItems.inspection), ctx),
    discovered: totalsOf(acc(stageItems.discovered), ctx),
    approved: totalsOf(acc(stageItems.approved), ctx),
    declined: totalsOf(acc(stageItems.declined), ctx),
  };
  // Sums once; the if-all-approved total merges them rather than revisit lines.
  const committedAcc = acc(agreedItems);
  const awaitingAcc = acc(awaitingItems);
  const committed = totalsOf(committedAcc, ctx);
  const ifAllApproved = totalsOf(mergeVat(committedAcc, awaitingAcc), ctx);
  const quoted = stages.inspection;

  // Only whole-penny line VAT is shown: the 0.1p figures of line-down-tenth are a working step, and
  // no amount leaves the engine with more decimals than the currency has.
  const lineVat = (v: Dec | null | undefined): string | null =>
    v === null || v === undefined || ctx.rounding !== 'line-nearest' ? null : formatAmount(v, dp);

  const lines: PricedLine[] = work.map((l) => {
    const listNet = formatAmount(l.list, dp);
    return {
      id: l.id,
      stage: l.stage,
      agreed: l.agreed,
      kind: l.kind,
      findingId: l.findingId,
      accessTaskId: l.accessTaskId,
      vatRate: l.code,
      vatPercent: ctx.rateStrings[l.code],
      cost: l.cost === null ? null : formatAmount(l.cost, dp),
      listNet,
      discount: formatAmount(l.discount, dp),
      net: l.net === l.list ? listNet : formatAmount(l.net, dp),
      vat: lineVat(l.item.lineVat),
    };
  });

  let savingNet = ZERO;
  let savingGross = ZERO;
  const accessTasks: PricedAccessTask[] = [...access.values()].map((t) => {
    const n = t.committedRemedies.size;
    const saving = n > 1 ? t.net.times(n - 1) : ZERO;
    const gross = roundHalfUp(saving.plus(exactVat(saving, t.rate)), dp);
    savingNet = savingNet.plus(saving);
    savingGross = savingGross.plus(gross);
    const all = t.allRemedies.size;
    return {
      id: t.id,
      net: formatAmount(t.net, dp),
      vatRate: t.code,
      vatPercent: ctx.rateStrings[t.code],
      chargedIn: chargedIn.get(t.id) ?? null,
      committedPays: t.byAgreed,
      committedRemedies: n,
      saving: formatAmount(saving, dp),
      savingGross: formatAmount(gross, dp),
      remediesIfAllApproved: all,
      savingIfAllApproved: formatAmount(all > 1 ? t.net.times(all - 1) : ZERO, dp),
    };
  });

  const findings = priceFindings(work, access, ctx);
  const undecidedFindings = new Set(work.filter((l) => l.stage === 'discovered' && l.findingId !== null).map((l) => l.findingId)).size;

  const change = {
    net: formatAmount(new Dec(committed.net).minus(quoted.net), dp),
    vat: formatAmount(new Dec(committed.vat).minus(quoted.vat), dp),
    gross: formatAmount(new Dec(committed.gross).minus(quoted.gross), dp),
  };

  return {
    currency: ctx.currency,
    rounding: ctx.rounding,
    lines,
    accessTasks,
    stages,
    quoted,
    committed,
    change,
    undecided: { ...totalsOf(awaitingAcc, ctx), findings: undecidedFindings },
    quoteAwaiting: totalsOf(acc(quoteAwaitingItems), ctx),
    ifAllApproved,
    accessSaving: { net: formatAmount(savingNet, dp), gross: formatAmount(savingGross, dp) },
    findings,
  };
}

function priceFindings(work: WorkLine[], access: Map<string, WorkAccess>, ctx: PricingContext): PricedFinding[] {
  const byFinding = new Map<string, WorkLine[]>();
  // Which remedies already pay for each access task: the agreed inspection scope, and each approved finding.
  const payers = new Map<string, Set<string>>();
  for (const l of work) {
    if (l.findingId !== null) {
      const list = byFinding.get(l.findingId);
      if (list) list.push(l);
      else byFinding.set(l.findingId, [l]);
    }
    if (l.accessTaskId !== null && ((l.stage === 'inspection' && l.agreed) || l.stage === 'approved')) {
      const who = l.stage === 'inspection' ? SCOPE_REMEDY : (l.findingId ?? SCOPE_REMEDY);
      const set = payers.get(l.accessTaskId);
      if (set) set.add(who);
      else payers.set(l.accessTaskId, new Set([who]));
    }
  }
  const ids = [...byFinding.keys()].sort();
  return ids.map((findingId) => {
    const own = byFinding.get(findingId)!;
    const stageSet = new Set(own.map((l) => l.stage));
    const stage: EstimateStage | 'mixed' = stageSet.size === 1 ? own[0]!.stage : 'mixed';
    const items: VatItem[] = own.map((l) => l.item);
    const named = [...new Set(own.map((l) => l.accessTaskId).filter((x): x is string => x !== null))].sort();
    const charged: string[] = [];
    const covered: string[] = [];
    const priceItems = items.slice();
    for (const taskId of named) {
      const others = [...(payers.get(taskId) ?? [])].filter((p) => p !== findingId);
      if (others.length > 0) covered.push(taskId);
      else {
        charged.push(taskId);
        const t = access.get(taskId)!;
        priceItems.push(t.item);
      }
    }
    const workAcc = accumulateVat(items, ctx.dp, ctx.rounding);
    const work = totalsOf(workAcc, ctx);
    const price = priceItems.length === items.length ? work : totalsOf(accumulateVat(priceItems.slice(items.length), ctx.dp, ctx.rounding, mergeVat(workAcc)), ctx);
    return { findingId, stage, work, accessCharged: charged, accessCovered: covered, price };
  });
}

/** One finding's price for the owner's decision page (its work plus any access nothing else pays for). */
export function priceFinding(input: EstimateInput, pricing: WorkshopPricing, findingId: string): PricedFinding {
  const f = priceEstimate(input, pricing).findings.find((x) => x.findingId === findingId);
  if (!f) throw new MoneyError('invalid_input', `finding "${findingId}" has no lines in this estimate.`, 'findingId');
  return f;
}
