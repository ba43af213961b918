import Decimal from 'decimal.js';

/**
 * Exact money for Wingstage. Amounts travel as decimal strings and are worked in decimal.js; a
 * JavaScript number only appears for integer minor units handed to a card processor.
 */

/**
 * A private decimal.js constructor so another module's global configuration can never change how
 * money rounds. 40 significant digits is far beyond any amount × rate we hold (12 integer digits,
 * a handful of decimals), and exponent limits keep `toString()` out of scientific notation.
 */
export const Dec = Decimal.clone({
  precision: 40,
  rounding: Decimal.ROUND_HALF_UP,
  toExpNeg: -40,
  toExpPos: 40,
});
export type Dec = Decimal;

export type MoneyErrorCode =
  | 'unknown_currency'
  | 'invalid_amount'
  | 'negative_amount'
  | 'too_many_decimals'
  | 'out_of_range'
  | 'invalid_ratio'
  | 'invalid_input';

/** The one error the money helpers and the pricing engine throw; `code` is stable for callers. */
export class MoneyError extends Error {
  override readonly name = 'MoneyError';
  constructor(
    readonly code: MoneyErrorCode,
    message: string,
    /** Where in the input the problem is, e.g. `lines[3].hours`. */
    readonly path?: string,
  ) {
    super(path ? `${path}: ${message}` : message);
    this.detail = message;
  }
  /** The message without its path. */
  readonly detail: string;

  /**
   * The same error placed inside a larger input (`lines[3]` + `hours` → `lines[3].hours`), so hot
   * loops can name fields cheaply and build the full path only when something is wrong.
   */
  within(prefix: string): MoneyError {
    return new MoneyError(this.code, this.detail, this.path ? `${prefix}.${this.path}` : prefix);
  }
}

/**
 * Minor units per currency [source: ISO 4217 list one]. Each value is also cross-checked in the
 * tests against the runtime's CLDR data. The set is deliberately small: a currency Wingstage has
 * not been checked against is refused rather than guessed.
 */
export const CURRENCY_MINOR_UNITS = {
  GBP: 2,
  EUR: 2,
  USD: 2,
  CHF: 2,
  JPY: 0,
  KRW: 0,
  BHD: 3,
  JOD: 3,
  KWD: 3,
  OMR: 3,
  TND: 3,
} as const satisfies Record<string, number>;
export type CurrencyCode = keyof typeof CURRENCY_MINOR_UNITS;
export const SUPPORTED_CURRENCIES = Object.keys(CURRENCY_MINOR_UNITS) as CurrencyCode[];

/** Decimal places of the currency's minor unit; throws `unknown_currency` for anything else. */
export function minorUnits(currency: string): number {
  const dp = (CURRENCY_MINOR_UNITS as Record<string, number>)[currency];
  if (dp === undefined) {
    throw new MoneyError('unknown_currency', `Unknown or unsupported currency "${String(currency)}"; use an ISO 4217 code such as GBP.`);
  }
  return dp;
}

// No exponents, no leading "+", no bare "." — exactly what a person or a NUMERIC column writes.
const DECIMAL_RE = /^-?\d{1,15}(\.\d{1,12})?$/;

// Estimates repeat the same rates, hours and quantities; decimal.js values are immutable, so a
// parsed string can be shared. Bounded so a long-running server never grows it without limit.
const PARSED = new Map<string, Dec>();
const PARSED_MAX = 20_000;
const ZERO_DEC = new Dec(0);

/** Empties the parse cache (for measurements that must not benefit from earlier calls). */
export function clearParsedDecimals(): void {
  PARSED.clear();
}

/** Parses a decimal string strictly; never accepts numbers, so a float cannot sneak in. */
export function parseDecimal(value: unknown, path = 'value', opts: { allowNegative?: boolean } = {}): Dec {
  if (typeof value !== 'string') {
    throw new MoneyError('invalid_amount', `expected a decimal string, got ${value === null ? 'null' : typeof value}.`, path);
  }
  let d = PARSED.get(value);
  if (d === undefined) {
    if (!DECIMAL_RE.test(value)) {
      throw new MoneyError('invalid_amount', `"${value}" is not a decimal number like 12.34.`, path);
    }
    d = new Dec(value);
    if (PARSED.size >= PARSED_MAX) PARSED.clear();
    PARSED.set(value, d);
  }
  if (!opts.allowNegative && d.isNegative() && !d.isZero()) {
    throw new MoneyError('negative_amount', `"${value}" must not be negative.`, path);
  }
  return d.isZero() && d.isNegative() ? ZERO_DEC : d; // drop "-0"
}

/**
 * Parses an amount that is stored as money: it may not carry more decimals than the currency has,
 * because silently rounding a stored amount would change what someone agreed to.
 */
export function parseAmount(value: unknown, currency: string, path = 'amount', opts: { allowNegative?: boolean } = {}): Dec {
  const dp = minorUnits(currency);
  const d = parseDecimal(value, path, opts);
  if (d.decimalPlaces() > dp) {
    throw new MoneyError('too_many_decimals', `"${String(value)}" has more decimals than ${currency} allows (${dp}).`, path);
  }
  return d;
}

/**
 * Formats to exactly `dp` decimals ("12.10", "500"). The value must already fit: this never rounds,
 * so a figure that was not rounded on purpose is an error, not a silent change. (Padding the plain
 * string is also several times cheaper than decimal.js's own fixed-point formatting.)
 */
const ZERO_STRINGS = ['0', '0.0', '0.00', '0.000', '0.0000'];
export function formatAmount(d: Dec, dp: number): string {
  if (d.isZero()) return ZERO_STRINGS[dp] ?? d.abs().toFixed(dp);
  const have = d.decimalPlaces();
  if (have > dp) throw new MoneyError('too_many_decimals', `internal: ${d.toString()} has more than ${dp} decimals and was not rounded.`);
  const s = d.toString();
  if (have === dp) return s;
  return have === 0 ? `${s}.${'0'.repeat(dp)}` : s + '0'.repeat(dp - have);
}

/**
 * Nearest minor unit, half away from zero: HMRC's "nearest" rounds 0.5p up [source: HMRC manual
 * VATREC12030]; sources.md: 0.125 → 0.13, −0.125 → −0.13.
 */
export function roundHalfUp(d: Dec, dp: number): Dec {
  // Most figures already fit; skipping the copy matters in the per-line loop.
  return d.decimalPlaces() <= dp ? d : d.toDecimalPlaces(dp, Decimal.ROUND_HALF_UP);
}

/** Towards zero at `dp` decimals ("round down" in VAT Notice 700 §17.5 for a positive amount). */
export function roundDown(d: Dec, dp: number): Dec {
  return d.decimalPlaces() <= dp ? d : d.toDecimalPlaces(dp, Decimal.ROUND_DOWN);
}

/** Half to even, for callers that need banker's rounding (never used for VAT). */
export function roundHalfEven(d: Dec, dp: number): Dec {
  return d.toDecimalPlaces(dp, Decimal.ROUND_HALF_EVEN);
}

/** Normalises an amount string to the currency's decimals ("12.3" → "12.30"); refuses extra decimals. */
export function normaliseAmount(amount: string, currency: string, opts: { allowNegative?: boolean } = {}): string {
  return formatAmount(parseAmount(amount, currency, 'amount', { allowNegative: true, ...opts }), minorUnits(currency));
}

/** "12.34","GBP" → 1234: the integer a card processor takes [source: Stripe docs "Currencies"]. */
export function toMinorUnits(amount: string, currency: string): number {
  const dp = minorUnits(currency);
  const d = parseAmount(amount, currency, 'amount', { allowNegative: true });
  const minor = d.times(new Dec(10).pow(dp));
  // Integer-valued by construction; refuse anything a double could not hold exactly.
  if (minor.abs().greaterThan(Number.MAX_SAFE_INTEGER)) {
    throw new MoneyError('out_of_range', `"${amount}" ${currency} is too large to express in minor units.`, 'amount');
  }
  const n = minor.toNumber();
  return n === 0 ? 0 : n;
}

/** 500,"JPY" → "500"; 1234,"GBP" → "12.34". Only safe integers are accepted. */
export function fromMinorUnits(minor: number, currency: string): string {
  const dp = minorUnits(currency);
  if (typeof minor !== 'number' || !Number.isSafeInteger(minor)) {
    throw new MoneyError('invalid_amount', `minor units must be a safe integer, got ${String(minor)}.`, 'minor');
  }
  return formatAmount(new Dec(minor).dividedBy(new Dec(10).pow(dp)), dp);
}

/**
 * Splits minor units by ratio so the parts always sum to the whole: each part gets its floor, then
 * the units left over go one each to the largest remainders, ties to the earlier part [source:
 * Fowler, Patterns of Enterprise Application Architecture, "Money" — allocation without losing a
 * penny]. Works on a non-negative integer count of units.
 */
export function allocateUnits(units: Dec, ratios: Dec[]): Dec[] {
  const total = ratios.reduce((a, r) => a.plus(r), new Dec(0));
  if (total.isZero()) throw new MoneyError('invalid_ratio', 'at least one ratio must be above zero.', 'ratios');
  const floors: Dec[] = [];
  const rems: { i: number; rem: Dec }[] = [];
  let given = new Dec(0);
  for (let i = 0; i < ratios.length; i++) {
    const share = units.times(ratios[i]!).dividedBy(total);
    const floor = share.floor();
    floors.push(floor);
    rems.push({ i, rem: share.minus(floor) });
    given = given.plus(floor);
  }
  let left = units.minus(given).toNumber(); // < ratios.length, so a small exact integer
  rems.sort((a, b) => b.rem.comparedTo(a.rem) || a.i - b.i);
  for (let k = 0; left > 0; k++, left--) {
    const idx = rems[k]!.i;
    floors[idx] = floors[idx]!.plus(1);
  }
  return floors;
}

/**
 * Splits `amount` into parts by `ratios` (decimal strings, none negative, not all zero); the parts
 * are in the currency's minor units and always sum exactly to `amount`. A negative amount is split
 * as its magnitude and each part negated, so a credit mirrors its charge.
 */
export function allocate(amount: string, ratios: string[], currency: string): string[] {
  const dp = minorUnits(currency);
  const whole = parseAmount(amount, currency, 'amount', { allowNegative: true });
  if (!Array.isArray(ratios) || ratios.length === 0) {
    throw new MoneyError('invalid_ratio', 'give at least one ratio.', 'ratios');
  }
  const rs = ratios.map((r, i) => {
    try {
      return parseDecimal(r, `ratios[${i}]`);
    } catch (e) {
      if (e instanceof MoneyError) throw new MoneyError('invalid_ratio', e.message);
      throw e;
    }
  });
  const scale = new Dec(10).pow(dp);
  const units = whole.abs().times(scale);
  const parts = allocateUnits(units, rs);
  const sign = whole.isNegative() ? -1 : 1;
  return parts.map((p) => formatAmount(p.times(sign).dividedBy(scale), dp));
}

/** Sums amount strings of one currency exactly. */
export function sumAmounts(amounts: string[], currency: string): string {
  const dp = minorUnits(currency);
  let t = new Dec(0);
  amounts.forEach((a, i) => {
    t = t.plus(parseAmount(a, currency, `amounts[${i}]`, { allowNegative: true }));
  });
  return formatAmount(t, dp);
}

/** Compares two amount strings: −1, 0 or 1. */
export function compareAmounts(a: string, b: string): -1 | 0 | 1 {
  return new Dec(parseDecimal(a, 'a', { allowNegative: true })).comparedTo(parseDecimal(b, 'b', { allowNegative: true })) as -1 | 0 | 1;
}
