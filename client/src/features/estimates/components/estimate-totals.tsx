import { compareAmounts, ESTIMATE_STAGES, TOTAL_NAMES, type PricedEstimate, type Totals } from '@wingstage/shared';
import { formatMoney } from '@/lib/format';
import { STAGE_LABELS } from '@/lib/line-kinds';
import { VAT_RATE_LABELS } from '@/lib/pricing-preview';

function Money({ amount, currency, vat, testId }: { amount: string; currency: string; vat?: 'incl' | 'excl'; testId?: string }) {
  return (
    <span className="tabular-nums" data-testid={testId}>
      {formatMoney(amount, currency, { vat })}
    </span>
  );
}

function Row({ label, totals, currency, testId, strong }: { label: string; totals: Totals; currency: string; testId: string; strong?: boolean }) {
  return (
    <div className={`flex items-baseline justify-between gap-x-3 py-1.5 ${strong ? 'font-semibold' : ''}`}>
      <dt className="min-w-0">{label}</dt>
      <dd className="shrink-0 whitespace-nowrap text-right">
        <Money amount={totals.gross} currency={currency} vat="incl" testId={`${testId}-gross`} />
        <span className="block text-xs font-normal text-slate-soft">
          <Money amount={totals.net} currency={currency} vat="excl" testId={`${testId}-net`} />
        </span>
      </dd>
    </div>
  );
}

/** "The quote and 2 findings awaiting the owner", "1 finding awaiting the owner". */
function awaitingWords(p: PricedEstimate): string {
  const n = p.undecided.findings;
  const findings = `${n} ${n === 1 ? 'finding' : 'findings'}`;
  if (compareAmounts(p.quoteAwaiting.gross, '0') === 0) return `${findings} awaiting the owner`;
  return n ? `The quote and ${findings} awaiting the owner` : 'The quote awaiting the owner';
}

/** Every figure shown here is a field of the engine's result; this component only lays them out. */
export function EstimateTotals({ priced, paused }: { priced: PricedEstimate; paused?: string | null }) {
  const c = priced.currency;
  return (
    <div aria-live="polite" className="flex flex-col gap-4" data-testid="estimate-totals">
      {paused ? (
        <p className="rounded-control border border-dashed border-seam-strong px-3 py-2 text-sm">
          <span aria-hidden="true">⏸ </span>Totals paused until every figure is a number: {paused}
        </p>
      ) : null}
      <section>
        <h3 className="mb-1 text-sm font-semibold uppercase tracking-wide text-slate-soft">Where the estimate stands</h3>
        <dl className="divide-y divide-seam">
          <Row label={TOTAL_NAMES.quoted} totals={priced.quoted} currency={c} testId="total-quoted" />
          <Row label={TOTAL_NAMES.agreed} totals={priced.committed} currency={c} testId="total-committed" strong />
          {compareAmounts(priced.quoteAwaiting.gross, '0') !== 0 ? (
            <Row label={TOTAL_NAMES.quoteAwaiting} totals={priced.quoteAwaiting} currency={c} testId="total-quote-awaiting" />
          ) : null}
          <div className="flex items-baseline justify-between gap-x-3 py-1.5">
            <dt className="min-w-0">
              {TOTAL_NAMES.undecided}
              <span className="block text-xs text-slate-soft">
                {awaitingWords(priced)}
              </span>
            </dt>
            <dd className="shrink-0 whitespace-nowrap text-right">
              <Money amount={priced.undecided.gross} currency={c} vat="incl" testId="total-undecided-gross" />
              <span className="block text-xs text-slate-soft">
                <Money amount={priced.undecided.net} currency={c} vat="excl" />
              </span>
            </dd>
          </div>
          <Row label={TOTAL_NAMES.ifAllApproved} totals={priced.ifAllApproved} currency={c} testId="total-if-all" />
        </dl>
      </section>
      <section>
        <h3 className="mb-1 text-sm font-semibold uppercase tracking-wide text-slate-soft">By stage</h3>
        <dl className="divide-y divide-seam">
          {ESTIMATE_STAGES.map((s) => (
            <Row key={s} label={STAGE_LABELS[s]} totals={priced.stages[s]} currency={c} testId={`stage-${s}`} />
          ))}
        </dl>
      </section>
      <section>
        <h3 className="mb-1 text-sm font-semibold uppercase tracking-wide text-slate-soft">VAT on what is agreed</h3>
        {priced.committed.byRate.length === 0 ? (
          <p className="text-sm text-slate-soft">Nothing agreed yet.</p>
        ) : (
          <table className="w-full text-sm tabular-nums">
            <caption className="sr-only">VAT by rate on the agreed total</caption>
            <thead>
              <tr className="text-left text-slate-soft">
                <th scope="col" className="py-1 font-semibold">Rate</th>
                <th scope="col" className="py-1 text-right font-semibold">Net</th>
                <th scope="col" className="py-1 text-right font-semibold">VAT</th>
              </tr>
            </thead>
            <tbody>
              {priced.committed.byRate.map((r) => (
                <tr key={r.code} className="border-t border-seam">
                  <th scope="row" className="py-1 text-left font-normal">
                    {VAT_RATE_LABELS[r.code]} {r.rate}%
                  </th>
                  <td className="py-1 text-right">{formatMoney(r.net, c)}</td>
                  <td className="py-1 text-right">{formatMoney(r.vat, c)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      <p className="flex flex-wrap items-baseline justify-between gap-x-3 rounded-control bg-cloth-sunk px-3 py-2 text-sm">
        <span>Access labour shared, not charged twice</span>
        <Money amount={priced.accessSaving.gross} currency={c} vat="incl" testId="total-access-saving" />
      </p>
    </div>
  );
}
