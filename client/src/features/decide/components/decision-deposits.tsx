import { useEffect, useState } from 'react';
import { buttonClass } from '@/components/ui/button';
import { formatMoney } from '@/lib/format';

interface DecisionDeposits {
  jobId: string;
  deposits: { id: string; amount: string; currency: string; reason: string; state: 'waiting' | 'paid' | 'cancelled' }[];
}

/**
 * On the receipt: a deposit the decision led the workshop to ask for, with "Pay deposit" (the owner
 * pays from their aircraft page, signed in). Nothing shows when no deposit was asked.
 */
export function DecisionDepositsNote({ token }: { token: string }) {
  const [data, setData] = useState<DecisionDeposits | null>(null);
  useEffect(() => {
    const ctl = new AbortController();
    fetch(`/api/decide/${encodeURIComponent(token)}/deposits`, { signal: ctl.signal, credentials: 'same-origin' })
      .then((r) => (r.ok ? (r.json() as Promise<DecisionDeposits>) : null))
      .then((d) => setData(d))
      .catch(() => undefined);
    return () => ctl.abort();
  }, [token]);
  const shown = data?.deposits.filter((d) => d.state !== 'cancelled') ?? [];
  if (!data || shown.length === 0) return null;
  return (
    <section data-testid="receipt-deposits" className="flex flex-col gap-3 rounded-card border-2 border-dusk bg-dusk-tint p-4" aria-label="Deposit">
      {shown.map((d) => (
        <div key={d.id} data-receipt-deposit={d.state} className="flex flex-col gap-2">
          <p className="font-semibold">
            {d.state === 'paid' ? `Deposit of ${formatMoney(d.amount, d.currency)} paid. Thank you.` : `The workshop asks for a deposit of ${formatMoney(d.amount, d.currency)} incl. VAT before the work goes ahead.`}
          </p>
          <p>What it is for: {d.reason}</p>
        </div>
      ))}
      {shown.some((d) => d.state === 'waiting') ? (
        <a className={buttonClass('primary', 'lg')} href={`/my-aircraft?job=${data.jobId}`}>
          Pay deposit
        </a>
      ) : null}
    </section>
  );
}
