import Decimal from 'decimal.js';

/**
 * Bounds from the trade, in one place so the form and the server say the same thing.
 *
 * Hard bounds are facts: a day has 24 hours, so no one logs more than 24 hours of work on one day.
 * Plausible bounds are judgement: a light-aircraft job (a microlight or permit aircraft, a light
 * single) rarely needs more than these, so a figure above one is probably a slip of the keyboard
 * (1000000 for 1). Above a plausible bound the person is asked to confirm (`confirmLarge`) rather
 * than refused: an engine replacement or a full re-cover can be large, and the workshop knows best.
 */
export const HOURS_IN_A_DAY = '24';

export const PLAUSIBLE = {
  /** Labour hours on one line or access task: a full strip and re-cover is a few hundred hours at most. */
  hours: '300',
  /** Items of one part on one line (rivets and split pins come in hundreds, not thousands). */
  quantity: '500',
  /** One amount in the workshop's currency: a unit cost, a fixed sell price, a fee or a supplier's cost. */
  amount: '30000',
  /** A labour rate per hour. */
  ratePerHour: '500',
} as const;

export type PlausibleKind = keyof typeof PLAUSIBLE;

const WHAT: Record<PlausibleKind, (limit: string) => string> = {
  hours: (l) => `more than ${l} hours`,
  quantity: (l) => `more than ${l} items`,
  amount: (l) => `more than ${Number(l).toLocaleString('en-GB')} per item or fee`,
  ratePerHour: (l) => `a rate above ${l} an hour`,
};

/** True when a decimal string is above the plausible bound for its kind; anything unparsable is left to the schema. */
export function isImplausible(kind: PlausibleKind, value: string | null | undefined): boolean {
  if (value === null || value === undefined || !/^\d+(\.\d+)?$/.test(value.trim())) return false;
  return new Decimal(value.trim()).gt(PLAUSIBLE[kind]);
}

/** "more than 500 items": what the person is asked to confirm. */
export function describeImplausible(kind: PlausibleKind): string {
  return WHAT[kind](PLAUSIBLE[kind]);
}

export interface LargeFigure {
  /** Index into the list the figure came from, and which of its fields. */
  index: number;
  field: string;
  /** Plain words for the confirmation, e.g. `"Spark plug": 1000000 — more than 500 items`. */
  message: string;
}

type FigureLine = {
  kind: string;
  description: string;
  quantity?: string | null;
  ratePerHour?: string | null;
  unitCost?: string | null;
  unitPrice?: string | null;
  amount?: string | null;
};

/** The figures on estimate or template lines above a plausible bound, in the order they appear. */
export function largeFigures(lines: readonly FigureLine[]): LargeFigure[] {
  const out: LargeFigure[] = [];
  lines.forEach((l, index) => {
    const check = (field: keyof FigureLine, kind: PlausibleKind) => {
      const v = l[field];
      if (typeof v === 'string' && isImplausible(kind, v)) {
        out.push({ index, field, message: `"${l.description || 'A line'}": ${v.trim()} is ${describeImplausible(kind)}.` });
      }
    };
    check('quantity', l.kind === 'labour' ? 'hours' : 'quantity');
    check('ratePerHour', 'ratePerHour');
    check('unitCost', 'amount');
    check('unitPrice', 'amount');
    check('amount', 'amount');
  });
  return out;
}

/** The one sentence both the form and the server's 400 use to ask for confirmation. */
export function confirmLargeMessage(figures: readonly LargeFigure[]): string {
  const list = figures.slice(0, 5).map((f) => f.message).join(' ');
  const more = figures.length > 5 ? ` And ${figures.length - 5} more.` : '';
  return `Some figures are larger than a light-aircraft job usually needs, so they were not saved yet. Check them, then confirm to save: ${list}${more}`;
}
