import { formatMoney } from '@/lib/format';

/** A right-aligned amount in tabular figures; "—" when there is none. */
export function Money({ amount, currency }: { amount: string | null | undefined; currency: string }) {
  return <span className="whitespace-nowrap tabular-nums">{amount === null || amount === undefined ? '—' : formatMoney(amount, currency)}</span>;
}

export const th = 'px-2 py-2 text-left text-sm font-semibold';
export const thNum = 'px-2 py-2 text-right text-sm font-semibold';
export const td = 'px-2 py-2 text-left align-top text-sm';
export const tdNum = 'px-2 py-2 text-right align-top text-sm';
