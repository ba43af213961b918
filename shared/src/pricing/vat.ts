import { Dec, MoneyError, formatAmount, minorUnits, parseAmount, parseDecimal, roundDown, roundHalfUp } from '../money.js';
import { VAT_ROUNDING_METHODS } from '../schemas/workshop.js';

/**
 * How VAT on an invoice is rounded, a workshop setting echoed with every result [source: HMRC VAT
 * Notice 700 §17.5 and §17.5.1]:
 * - `invoice-down`: VAT on the invoice total, rounded down to the penny (§17.5);
 * - `invoice-nearest`: VAT on the invoice total, to the nearest penny, half up (§17.5 read with
 *   HMRC manual VATREC12030);
 * - `line-nearest`: VAT worked per line to the nearest penny, then added (§17.5.1);
 * - `line-down-tenth`: VAT per line rounded down to 0.1p, then the total down to the penny (§17.5.1).
 */
export type VatRounding = (typeof VAT_ROUNDING_METHODS)[number];

export function assertVatRounding(r: unknown): asserts r is VatRounding {
  if (!(VAT_ROUNDING_METHODS as readonly unknown[]).includes(r)) {
    throw new MoneyError('invalid_input', `unknown VAT rounding method "${String(r)}"; use one of ${VAT_ROUNDING_METHODS.join(', ')}.`, 'rounding');
  }
}

/** A VAT percentage as a decimal string ("20", "5", "0", "17.5"): 0 to 100 inclusive. */
export function parseVatRate(rate: unknown, path = 'vatRate'): Dec {
  const d = parseDecimal(rate, path);
  if (d.greaterThan(100)) throw new MoneyError('out_of_range', `VAT rate "${String(rate)}" must be a percentage from 0 to 100.`, path);
  return d;
}

/**
 * One line's VAT under a per-line method: to the nearest minor unit (half up), or down to a tenth of
 * it (0.1p) [source: VAT Notice 700 §17.5.1]. The invoice-level methods leave the exact figure.
 */
export function roundLineVat(exact: Dec, dp: number, rounding: VatRounding): Dec {
  if (rounding === 'line-nearest') return roundHalfUp(exact, dp);
  if (rounding === 'line-down-tenth') return roundDown(exact, dp + 1);
  return exact;
}

/** String form of `roundLineVat`: "0.8676" → "0.867" (line-down-tenth) or "0.87" (line-nearest). */
export function lineVatRounded(exactVat: string, rounding: VatRounding, currency: string): string {
  const dp = minorUnits(currency);
  assertVatRounding(rounding);
  if (rounding !== 'line-nearest' && rounding !== 'line-down-tenth') {
    throw new MoneyError('invalid_input', `"${rounding}" works on the invoice total, not per line.`, 'rounding');
  }
  const v = roundLineVat(parseDecimal(exactVat, 'exactVat'), dp, rounding);
  return v.toFixed(rounding === 'line-down-tenth' ? dp + 1 : dp);
}

/** One already-parsed line for the VAT core: `key` groups lines in the breakdown. */
export interface VatItem {
  key: string;
  /** Percentage, e.g. 20. */
  rate: Dec;
  net: Dec;
  /** The line's VAT already rounded under a per-line method, when the caller has it to hand. */
  lineVat?: Dec | null;
}

export interface VatGroup {
  key: string;
  rate: Dec;
  net: Dec;
  vat: Dec;
}

export interface VatResult {
  net: Dec;
  vat: Dec;
  groups: VatGroup[];
}

/** Running sums per VAT group; merge several to total a union of stages without revisiting lines. */
export type VatAccumulator = Map<string, { key: string; rate: Dec; net: Dec; lineVat: Dec }>;

const PERCENT = new Dec('0.01');
const ZERO = new Dec(0);

export function isPerLine(rounding: VatRounding): boolean {
  return rounding === 'line-nearest' || rounding === 'line-down-tenth';
}

/** One line's exact VAT: net × rate%. Multiplying by 0.01 is exact and cheaper than dividing. */
export function exactVat(net: Dec, rate: Dec): Dec {
  return net.times(rateFactor(rate));
}

// rate% as a factor (20 → 0.2), cached: a workshop uses a handful of rates, priced thousands of times.
const FACTORS = new Map<string, Dec>();
function rateFactor(rate: Dec): Dec {
  const k = rate.toString();
  let f = FACTORS.get(k);
  if (!f) {
    f = rate.times(PERCENT);
    if (FACTORS.size < 64) FACTORS.set(k, f);
  }
  return f;
}

export function accumulateVat(items: readonly VatItem[], dp: number, rounding: VatRounding, into: VatAccumulator = new Map()): VatAccumulator {
  const perLine = isPerLine(rounding);
  for (const it of items) {
    const v = !perLine ? ZERO : (it.lineVat ?? roundLineVat(exactVat(it.net, it.rate), dp, rounding));
    const g = into.get(it.key);
    if (g) {
      g.net = g.net.plus(it.net);
      if (perLine) g.lineVat = g.lineVat.plus(v);
    } else {
      into.set(it.key, { key: it.key, rate: it.rate, net: it.net, lineVat: v });
    }
  }
  return into;
}

export function mergeVat(...accs: VatAccumulator[]): VatAccumulator {
  const out: VatAccumulator = new Map();
  for (const acc of accs) {
    for (const g of acc.values()) {
      const o = out.get(g.key);
      if (o) {
        o.net = o.net.plus(g.net);
        o.lineVat = o.lineVat.plus(g.lineVat);
      } else out.set(g.key, { ...g });
    }
  }
  return out;
}

const SCALES = new Map<number, { scale: Dec; unit: Dec }>();
function scaleOf(dp: number) {
  let s = SCALES.get(dp);
  if (!s) {
    s = { scale: new Dec(10).pow(dp), unit: new Dec(10).pow(-dp) };
    SCALES.set(dp, s);
  }
  return s;
}

/**
 * The VAT core every total goes through. Under the invoice-level methods each group's VAT is taken
 * exactly (the sum of exact line VAT equals group net × rate, so lines need not be visited twice);
 * under the per-line methods each line is rounded first. The invoice total is then rounded by the
 * method, and the breakdown by group is apportioned from that total by largest remainder so the
 * groups always add up to the VAT the invoice shows (each group within one minor unit of its own
 * figure).
 *
 * Groups come out in a fixed order (rate descending, then key) whatever the order of the items, so
 * pricing never depends on line order.
 */
export function finishVat(acc: VatAccumulator, dp: number, rounding: VatRounding): VatResult {
  const perLine = isPerLine(rounding);
  const { scale, unit } = scaleOf(dp);
  const groups = [...acc.values()]
    .sort((a, b) => b.rate.comparedTo(a.rate) || (a.key < b.key ? -1 : a.key > b.key ? 1 : 0))
    .map((g) => ({ key: g.key, rate: g.rate, net: g.net, pre: perLine ? g.lineVat : exactVat(g.net, g.rate) }));
  let net = ZERO;
  let pre = ZERO;
  for (const g of groups) {
    net = net.plus(g.net);
    pre = pre.plus(g.pre);
  }
  const vat = rounding === 'invoice-nearest' || rounding === 'line-nearest' ? roundHalfUp(pre, dp) : roundDown(pre, dp);
  // Whole minor units per line already: each group's own sum is exact and adds up to the total.
  if (groups.length <= 1 || rounding === 'line-nearest') {
    if (groups.length > 1) return { net, vat, groups: groups.map((g) => ({ key: g.key, rate: g.rate, net: g.net, vat: g.pre })) };
    return { net, vat, groups: groups.map((g) => ({ key: g.key, rate: g.rate, net: g.net, vat })) };
  }
  // Apportion the rounded total across groups: floors of each group's own figure, leftover units to
  // the largest remainders, ties to the earlier group.
  const scaled = groups.map((g) => g.pre.times(scale));
  const floors = scaled.map((x) => x.floor());
  let left = vat.times(scale).minus(floors.reduce((a, f) => a.plus(f), ZERO)).toNumber();
  if (left < 0 || left > groups.length) {
    // Cannot happen for non-negative nets; kept as a guard so a broken invariant is loud.
    throw new MoneyError('invalid_input', 'VAT breakdown could not be apportioned.');
  }
  const order = scaled.map((x, i) => ({ i, rem: x.minus(floors[i]!) })).sort((a, b) => b.rem.comparedTo(a.rem) || a.i - b.i);
  for (let k = 0; left > 0; k++, left--) floors[order[k]!.i] = floors[order[k]!.i]!.plus(1);
  return { net, vat, groups: groups.map((g, i) => ({ key: g.key, rate: g.rate, net: g.net, vat: floors[i]!.times(unit) })) };
}

export function computeVat(items: readonly VatItem[], dp: number, rounding: VatRounding): VatResult {
  return finishVat(accumulateVat(items, dp, rounding), dp, rounding);
}

export interface VatTotals {
  net: string;
  vat: string;
  gross: string;
  byRate: { rate: string; net: string; vat: string }[];
  rounding: VatRounding;
}

/**
 * VAT on a set of lines under one of HMRC's rounding methods. Nets are amounts of the currency
 * (no more decimals than it has, not negative); rates are percentages ("20"). The result carries the
 * rounding method so a stored figure always says how it was made.
 */
export function vatTotals(
  lines: { net: string; vatRate: string }[],
  opts: { currency: string; rounding: VatRounding },
): VatTotals {
  const dp = minorUnits(opts?.currency);
  assertVatRounding(opts.rounding);
  if (!Array.isArray(lines)) throw new MoneyError('invalid_input', 'lines must be an array.', 'lines');
  const items: VatItem[] = lines.map((l, i) => {
    const rate = parseVatRate(l?.vatRate, `lines[${i}].vatRate`);
    return { key: rate.toString(), rate, net: parseAmount(l?.net, opts.currency, `lines[${i}].net`) };
  });
  const r = computeVat(items, dp, opts.rounding);
  return {
    net: formatAmount(r.net, dp),
    vat: formatAmount(r.vat, dp),
    gross: formatAmount(r.net.plus(r.vat), dp),
    byRate: r.groups.map((g) => ({ rate: g.rate.toString(), net: formatAmount(g.net, dp), vat: formatAmount(g.vat, dp) })),
    rounding: opts.rounding,
  };
}

/** VAT inside a VAT-inclusive amount as an exact decimal: gross × rate / (100 + rate). */
export function vatFractionExact(gross: Dec, rate: Dec): Dec {
  return gross.times(rate).dividedBy(rate.plus(100));
}

/**
 * The VAT contained in a VAT-inclusive amount, to the nearest minor unit (half up): the VAT
 * fraction is rate/(100+rate), 1/6 at 20% and 1/21 at 5% [source: HMRC VAT Notice 700, VAT
 * fraction]. Used for deposits and other payments received gross.
 */
export function vatFraction(gross: string, vatRate: string, currency: string): string {
  const dp = minorUnits(currency);
  const g = parseAmount(gross, currency, 'gross', { allowNegative: true });
  const rate = parseVatRate(vatRate);
  return formatAmount(roundHalfUp(vatFractionExact(g, rate), dp), dp);
}
