import Decimal from 'decimal.js';
import type { ChecklistLimit } from './schemas/templates.js';

export type LimitCheck = 'within' | 'below' | 'above';

/** Compares a measured value with a limit in exact decimals; the limit's ends are inside it. */
export function checkLimit(value: string, limit: ChecklistLimit): LimitCheck {
  const v = new Decimal(value);
  if (limit.min !== null && v.lt(limit.min)) return 'below';
  if (limit.max !== null && v.gt(limit.max)) return 'above';
  return 'within';
}

export function describeLimit(limit: ChecklistLimit): string {
  const u = limit.unit;
  if (limit.min !== null && limit.max !== null) return `${limit.min}–${limit.max} ${u}`;
  if (limit.min !== null) return `at least ${limit.min} ${u}`;
  return `at most ${limit.max} ${u}`;
}
