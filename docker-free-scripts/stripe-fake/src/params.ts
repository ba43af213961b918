import type Stripe from 'stripe';
import { invalid, missing } from './errors.js';

/*
 * The SDK sends form-encoded, qs-style bodies and queries, so every value arrives as a string (or a
 * nested object of strings). These read one parameter each, with the processor's error on bad input.
 */
export type Params = Record<string, unknown>;

export function str(p: Params, name: string): string | null;
export function str(p: Params, name: string, required: true): string;
export function str(p: Params, name: string, required = false): string | null {
  const v = p[name];
  if (v === undefined || v === null || v === '') {
    if (required) throw missing(name);
    return null;
  }
  if (typeof v !== 'string') throw invalid(name, `Invalid string: ${name} must be a string.`);
  if (v.length > 5000) throw invalid(name, `Invalid string: ${name} is longer than 5000 characters.`);
  return v;
}

/** A whole number of minor units (or any integer parameter): digits only, never a float. */
export function int(p: Params, name: string): number | null;
export function int(p: Params, name: string, required: true): number;
export function int(p: Params, name: string, required = false): number | null {
  const v = p[name];
  if (v === undefined || v === null || v === '') {
    if (required) throw missing(name);
    return null;
  }
  if (typeof v !== 'string' || !/^-?\d{1,15}$/.test(v)) throw invalid(name, `Invalid integer: ${String(v)}`);
  return Number(v);
}

export function amount(p: Params, name: string, required: true): number;
export function amount(p: Params, name: string): number | null;
export function amount(p: Params, name: string, required = false): number | null {
  const n = required ? int(p, name, true) : int(p, name);
  if (n !== null && (n < 1 || n > 99_999_999)) throw invalid(name, `${name} must be a whole number of the currency's smallest unit between 1 and 99999999.`);
  return n;
}

export function bool(p: Params, name: string): boolean {
  const v = p[name];
  if (v === undefined || v === '') return false;
  if (v === 'true' || v === 'false') return v === 'true';
  throw invalid(name, `Invalid boolean: ${String(v)}`);
}

export function currency(p: Params, name = 'currency'): string {
  const v = str(p, name, true);
  if (!/^[a-zA-Z]{3}$/.test(v)) throw invalid(name, `Invalid currency: ${v}. Use a three-letter ISO code such as gbp.`);
  return v.toLowerCase();
}

export function obj(p: Params, name: string): Params | null {
  const v = p[name];
  if (v === undefined || v === '') return null;
  if (typeof v !== 'object' || v === null || Array.isArray(v)) throw invalid(name, `Invalid object: ${name}.`);
  return v as Params;
}

/** Metadata: up to 50 keys of at most 40 characters, values of at most 500. */
export function metadata(p: Params, name = 'metadata'): Stripe.Metadata | null {
  const m = obj(p, name);
  if (!m) return null;
  const out: Stripe.Metadata = {};
  const entries = Object.entries(m);
  if (entries.length > 50) throw invalid(name, 'Metadata can have up to 50 keys.');
  for (const [k, v] of entries) {
    if (typeof v !== 'string') throw invalid(`${name}[${k}]`, 'Metadata values must be strings.');
    if (k.length > 40) throw invalid(`${name}[${k}]`, 'Metadata keys can be up to 40 characters long.');
    if (v.length > 500) throw invalid(`${name}[${k}]`, 'Metadata values can be up to 500 characters long.');
    out[k] = v;
  }
  return out;
}

/** `expand[0]=a&expand[1]=b.c` (qs gives an array, or an object with numeric keys past 20). */
export function expandList(p: Params): string[] {
  const v = p.expand;
  if (v === undefined || v === '') return [];
  const list = typeof v === 'string' ? [v] : Array.isArray(v) ? v : typeof v === 'object' && v ? Object.values(v) : [];
  if (!list.every((x): x is string => typeof x === 'string')) throw invalid('expand', 'expand must be a list of field paths.');
  return list;
}

/** A `created`-style filter: an integer, or an object with gt / gte / lt / lte. */
export function range(p: Params, name: string): ((n: number) => boolean) | null {
  const v = p[name];
  if (v === undefined || v === '') return null;
  if (typeof v === 'string') {
    const n = int(p, name)!;
    return (x) => x === n;
  }
  const o = obj(p, name)!;
  const bounds = { gt: int(o, 'gt'), gte: int(o, 'gte'), lt: int(o, 'lt'), lte: int(o, 'lte') };
  return (x) =>
    (bounds.gt === null || x > bounds.gt) && (bounds.gte === null || x >= bounds.gte) && (bounds.lt === null || x < bounds.lt) && (bounds.lte === null || x <= bounds.lte);
}
