import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Card, PageHeader } from '@/components/ui/page';
import { Loading, Notice } from '@/components/ui/notice';
import { buttonClass } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { formatDate } from '@/lib/format';
import { workshopToday } from '@wingstage/shared';
import { csvUrl, vatQuery } from '../api';
import { ACCOUNTS_WORDS as W } from '../words';
import { AccountsNav } from './accounts-nav';
import { Money, td, tdNum, th, thNum } from './money-cell';

/** The calendar quarter holding today on the workshop's clock: the usual VAT period. */
function thisQuarter(now = new Date()): { from: string; to: string } {
  const [year, month] = workshopToday(now).split('-').map(Number) as [number, number];
  const y = year;
  const q = Math.floor((month - 1) / 3);
  const from = new Date(Date.UTC(y, q * 3, 1)).toISOString().slice(0, 10);
  const to = new Date(Date.UTC(y, q * 3 + 3, 0)).toISOString().slice(0, 10);
  return { from, to };
}

const KIND_WORDS = { deposit: 'Deposit', invoice: 'Invoice', credit_note: 'Credit note' } as const;

export function VatPage() {
  const [period, setPeriod] = useState(thisQuarter);
  const valid = period.from && period.to;
  const q = useQuery({ ...vatQuery(period.from, period.to), enabled: Boolean(valid) });
  const s = q.data;
  const err = q.error as { message?: string } | null;
  return (
    <>
      <PageHeader title={W.area} lead={W.vat.lead} actions={<a className={buttonClass('secondary')} href={csvUrl('/accounts/vat-summary.csv', period)} download>Export VAT summary (CSV)</a>} />
      <AccountsNav />
      <Card title={W.vat.title}>
        <div className="mb-4 grid grid-cols-1 gap-3 sm:grid-cols-2 lg:max-w-xl">
          <TextField label="From" type="date" value={period.from} onChange={(e) => setPeriod((p) => ({ ...p, from: e.target.value }))} />
          <TextField label="To" type="date" value={period.to} onChange={(e) => setPeriod((p) => ({ ...p, to: e.target.value }))} />
        </div>
        {err ? <Notice tone="problem" title={err.message ?? 'The summary could not be made.'} /> : null}
        {!s ? (
          err ? null : <Loading />
        ) : (
          <div className="flex flex-col gap-6">
            <div className="relative overflow-x-auto">
              <table className="w-full min-w-[28rem] border-collapse">
                <caption className="mb-2 text-left font-semibold">Output VAT by rate, {formatDate(s.from)} to {formatDate(s.to)}</caption>
                <thead className="border-b border-seam-strong">
                  <tr>
                    <th scope="col" className={th}>Rate</th>
                    <th scope="col" className={thNum}>Net</th>
                    <th scope="col" className={thNum}>VAT</th>
                    <th scope="col" className={thNum}>Gross</th>
                  </tr>
                </thead>
                <tbody>
                  {s.byRate.map((r) => (
                    <tr key={r.rate} className="border-b border-seam">
                      <th scope="row" className={`${td} text-left`}>{r.rate}</th>
                      <td className={tdNum}><Money amount={r.net} currency={s.currency} /></td>
                      <td className={tdNum}><Money amount={r.vat} currency={s.currency} /></td>
                      <td className={tdNum}><Money amount={r.gross} currency={s.currency} /></td>
                    </tr>
                  ))}
                </tbody>
                <tfoot className="border-t-2 border-seam-strong font-semibold">
                  <tr>
                    <th scope="row" className={th}>Total</th>
                    <td className={tdNum}><Money amount={s.totals.net} currency={s.currency} /></td>
                    <td className={tdNum} data-testid="vat-total"><Money amount={s.totals.vat} currency={s.currency} /></td>
                    <td className={tdNum}><Money amount={s.totals.gross} currency={s.currency} /></td>
                  </tr>
                </tfoot>
              </table>
            </div>
            <div className="relative overflow-x-auto">
              <table className="w-full min-w-[48rem] border-collapse">
                <caption className="mb-2 text-left font-semibold">The documents behind these totals</caption>
                <thead className="border-b border-seam-strong">
                  <tr>
                    <th scope="col" className={th}>Tax point</th>
                    <th scope="col" className={th}>Document</th>
                    <th scope="col" className={th}>Job</th>
                    <th scope="col" className={th}>Rate</th>
                    <th scope="col" className={thNum}>Net</th>
                    <th scope="col" className={thNum}>VAT</th>
                  </tr>
                </thead>
                <tbody>
                  {s.documents.length === 0 ? (
                    <tr><td colSpan={6} className={td}>No deposits, invoices or credit notes in this period.</td></tr>
                  ) : (
                    s.documents.map((d, i) => (
                      <tr key={`${d.id}-${i}`} className="border-b border-seam">
                        <td className={td}>{formatDate(d.taxPoint)}</td>
                        <td className={td}>
                          <span className="sr-only">{KIND_WORDS[d.kind]}: </span>{d.reference}
                          {d.note ? <span className="block text-xs text-slate-soft">{d.note}</span> : null}
                        </td>
                        <td className={td}>{d.jobNumber}</td>
                        <td className={td}>{d.rate}</td>
                        <td className={tdNum}><Money amount={d.net} currency={s.currency} /></td>
                        <td className={tdNum}><Money amount={d.vat} currency={s.currency} /></td>
                      </tr>
                    ))
                  )}
                </tbody>
              </table>
            </div>
          </div>
        )}
      </Card>
    </>
  );
}
