import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { WeeklyMoneyDto } from '@wingstage/shared';
import { formatDate, formatMoney } from '@/lib/format';

/**
 * The chart itself, in its own module so the chart library loads only with the Weeks page.
 * Amounts are decimal strings; the chart draws them as numbers only to size the bars — every
 * figure a person reads comes from the table beside it.
 */
const SERIES = [
  { key: 'invoiced', label: 'Invoiced', fill: '#0b5e63' },
  { key: 'received', label: 'Received', fill: '#4b2e6f' },
  { key: 'paidOut', label: 'Paid out', fill: '#786d5a' },
] as const;

export default function WeeksChart({ data }: { data: WeeklyMoneyDto }) {
  const rows = data.weeks.map((w) => ({ week: formatDate(w.weekStart), invoiced: Number(w.invoiced), received: Number(w.received), paidOut: Number(w.paidOut), raw: w }));
  return (
    <div className="h-80 w-full" aria-hidden="true">
      <ResponsiveContainer width="100%" height="100%">
        <BarChart data={rows} margin={{ top: 8, right: 8, bottom: 8, left: 8 }}>
          <CartesianGrid strokeDasharray="3 3" stroke="#d3c9b4" />
          <XAxis dataKey="week" tick={{ fontSize: 12 }} />
          <YAxis tick={{ fontSize: 12 }} width={70} tickFormatter={(v: number) => formatMoney(v.toFixed(0), data.currency)} />
          <Tooltip formatter={(_v, name, item) => [formatMoney((item.payload as (typeof rows)[number]).raw[item.dataKey as 'invoiced' | 'received' | 'paidOut'], data.currency), name]} />
          <Legend />
          {SERIES.map((s) => (
            <Bar key={s.key} dataKey={s.key} name={s.label} fill={s.fill} />
          ))}
        </BarChart>
      </ResponsiveContainer>
    </div>
  );
}
