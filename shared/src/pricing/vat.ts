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
  rate: Dec; // percent
  net: Dec;
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
  /** Per-item VAT where the method works per line; null for the invoice-level methods. */
  itemVat: (Dec | null)[] | null;
}

const HUNDRED = new Dec(100);

/**
 * The VAT core every total goes through. Each item's VAT is first taken exactly (net × rate / 100)
 * and, for the per-line methods, rounded per line; the invoice total is then rounded by the method.
 * The breakdown by group is apportioned from that total by largest remainder so the groups always
 * add up to the VAT the invoice shows (each group is within one minor unit of its own rounded sum).
 *
 * Groups come out in a fixed order (rate descending, then key) whatever the order of the items, so
 * pricing never depends on line order.
 */
export function computeVat(items: readonly VatItem[], dp: number, rounding: VatRounding): VatResult {
  const perLine = rounding === 'line-nearest' || rounding === 'line-down-tenth';
  const itemVat: (Dec | null)[] | null = perLine ? [] : null;
  const byKey = new Map<string, { key: string; rate: Dec; net: Dec; pre: Dec }>();
  let net = new Dec(0);
  let pre = new Dec(0);
  for (const it of items) {
    const exact = it.net.times(it.rate).dividedBy(HUNDRED);
    const v = perLine ? roundLineVat(exact, dp, rounding) : exact;
    if (itemVat) itemVat.push(v);
    net = net.plus(it.net);
    pre = pre.plus(v);
    const g = byKey.get(it.key);
    if (g) {
      g.net = g.net.plus(it.net);
      g.pre = g.pre.plus(v);
    } else {
      byKey.set(it.key, { key: it.key, rate: it.rate, net: it.net, pre: v });
    }
  }
  const vat = rounding === 'invoice-nearest' || rounding === 'line-nearest' ? roundHalfUp(pre, dp) : roundDown(pre, dp);
  const groups = [...byKey.values()].sort((a, b) => b.rate.comparedTo(a.rate) || (a.key < b.key ? -1 : a.key > b.key ? 1 : 0));
  const scale = new Dec(10).pow(dp);
  const out: VatGroup[] = groups.map((g) => ({ key: g.key, rate: g.rate, net: g.net, vat: new Dec(0) }));
  // Apportion the rounded total across groups: floors of each group's own figure, leftover units to
  // the largest remainders. With a single group this is simply the total.
  const units = vat.times(scale);
  const floors = groups.map((g) => g.pre.times(scale).floor());
  const floorSum = floors.reduce((a, f) => a.plus(f), new Dec(0));
  let left = units.minus(floorSum);
  if (left.isNegative() || left.greaterThan(groups.length)) {
    // Cannot happen for non-negative nets; kept as a guard so a broken invariant is loud.
    throw new MoneyError('invalid_input', 'VAT breakdown could not be apportioned.');
  }
  const order = groups
    .map((g, i) => ({ i, rem: g.pre.times(scale).minus(floors[i]!) }))
    .sort((a, b) => b.rem.comparedTo(a.rem) || a.i - b.i);
  for (let i = 0; i < out.length; i++) out[i]!.vat = floors[i]!;
  for (let k = 0; left.greaterThan(0); k++, left = left.minus(1)) out[order[k]!.i]!.vat = out[order[k]!.i]!.vat.plus(1);
  for (const g of out) g.vat = g.vat.dividedBy(scale);
  return { net, vat, groups: out, itemVat };
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
  return gross.times(rate).dividedBy(HUNDRED.plus(rate));
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
