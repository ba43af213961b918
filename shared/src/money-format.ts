import { formatAmount, minorUnits, parseDecimal, roundHalfUp } from './money.js';

/**
 * The one money formatter: pages, e-mails, history entries and documents all call it, so an amount
 * reads the same everywhere ("£1,234.50 incl. VAT"). Display only: totals come from the pricing
 * engine, and this never does arithmetic beyond rounding for display.
 */
export type MoneyFormatOptions = {
  /** Says whether the figure includes VAT: " incl. VAT" or " excl. VAT" after it. */
  vat?: 'incl' | 'excl';
  /**
   * `auto` (default) shows a sign on negatives only; `always` also puts "+" on positives (a change
   * to a total); `exceptZero` is `always` without a sign on zero.
   */
  signDisplay?: 'auto' | 'always' | 'exceptZero';
  /**
   * Keep every decimal the amount has, padded to the currency's minor unit but never rounded: for
   * unit costs held to 4 decimals, where £0.125 a rivet must not read as £0.13.
   */
  exact?: boolean;
};

const LOCALE = 'en-GB';
const formatters = new Map<string, Intl.NumberFormat>();

function formatterFor(currency: string, decimals: number, signDisplay: NonNullable<MoneyFormatOptions['signDisplay']>): Intl.NumberFormat {
  const key = `${currency}|${decimals}|${signDisplay}`;
  let f = formatters.get(key);
  if (!f) {
    f = new Intl.NumberFormat(LOCALE, {
      style: 'currency',
      currency,
      minimumFractionDigits: decimals,
      maximumFractionDigits: decimals,
      signDisplay,
    });
    formatters.set(key, f);
  }
  return f;
}

/**
 * `formatMoney('1234.5', 'GBP', { vat: 'incl' })` → "£1,234.50 incl. VAT".
 *
 * The amount is a decimal string and never becomes a JavaScript number: it is rounded half-up to
 * the currency's minor unit in decimal.js (HMRC's "nearest", 0.125 → 0.13 [source: HMRC manual
 * VATREC12030; sources.md]), and the exact string is handed to `Intl.NumberFormat`, which lays out
 * a numeric string digit for digit. Throws `MoneyError` for something that is not a decimal string
 * or a currency Wingstage does not support.
 */
export function formatMoney(amount: string, currency: string, opts: MoneyFormatOptions = {}): string {
  const dp = minorUnits(currency);
  const value = parseDecimal(amount, 'amount', { allowNegative: true });
  const decimals = opts.exact ? Math.max(dp, value.decimalPlaces()) : dp;
  // formatAmount writes zero without a sign, so a rounded −0.001 never shows as "-£0.00".
  const text = formatAmount(roundHalfUp(value, decimals), decimals);
  const shown = formatterFor(currency, decimals, opts.signDisplay ?? 'auto').format(text as Intl.StringNumericLiteral);
  return opts.vat === 'incl' ? `${shown} incl. VAT` : opts.vat === 'excl' ? `${shown} excl. VAT` : shown;
}
