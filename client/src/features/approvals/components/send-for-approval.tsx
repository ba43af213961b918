import { approvalRequestCreateSchema, sumAmounts, type FindingDto, type SendForApprovalResultDto } from '@wingstage/shared';
import { useId, useState } from 'react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-client';
import { formatDateTime, formatMoney } from '@/lib/format';
import { useSendForApproval } from '../api/approval-requests';
import { SENDING } from '../words';

/** A priced finding may be ticked and sent; anything else waits or has been decided. */
export const sendable = (f: FindingDto) => f.state === 'priced';

/** The tick beside each priced finding in the findings panel. */
export function SendTick({ finding, checked, onChange }: { finding: FindingDto; checked: boolean; onChange: (on: boolean) => void }) {
  return (
    <label className="inline-flex min-h-10 cursor-pointer items-center gap-2 rounded-control border border-seam-strong bg-cloth-raised px-3 text-sm font-semibold">
      <input type="checkbox" className="size-5 accent-harbour" checked={checked} onChange={(e) => onChange(e.target.checked)} />
      Include {finding.number} in the request
    </label>
  );
}

/**
 * Sends the ticked findings, in the order the panel lists them (the pre-authorised limit is walked
 * in that order), against the saved estimate version the manager is looking at.
 */
export function SendForApproval({
  jobId,
  ownerName,
  findings,
  selected,
  prices,
  currency,
  estimateVersion,
  unsaved,
  onSent,
}: {
  jobId: string;
  ownerName: string;
  findings: FindingDto[];
  selected: Set<string>;
  /** Each finding's own price incl. VAT, from the saved engine result. */
  prices: Map<string, string>;
  currency: string;
  estimateVersion: number;
  unsaved: boolean;
  onSent: () => void;
}) {
  const send = useSendForApproval(jobId);
  const [message, setMessage] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const [result, setResult] = useState<SendForApprovalResultDto | null>(null);
  const messageId = useId();
  const chosen = findings.filter((f) => selected.has(f.id));
  const total = sumAmounts(chosen.map((f) => prices.get(f.id) ?? '0'), currency);
  const anyPriced = findings.some(sendable);

  const submit = async () => {
    setProblem(null);
    setResult(null);
    const parsed = approvalRequestCreateSchema.safeParse({ findingIds: chosen.map((f) => f.id), message, estimateVersion });
    if (!parsed.success) {
      setProblem(parsed.error.issues[0]?.message ?? 'Check the request.');
      return;
    }
    try {
      const r = await send.mutateAsync(parsed.data);
      setResult(r);
      setMessage('');
      onSent();
    } catch (e) {
      setProblem(isApiError(e) ? e.message : 'The request was not sent. Please try again.');
    }
  };

  const byId = new Map(findings.map((f) => [f.id, f]));
  return (
    <section aria-label="Send for approval" className="flex flex-col gap-3 rounded-card border border-seam bg-cloth p-3">
      <h3 className="font-semibold">Send for approval</h3>
      {result ? (
        <Notice title="Done">
          {result.approvedWithinLimit.length > 0 ? (
            <p>
              {SENDING.approvedUnderGoAhead}{' '}
              {result.approvedWithinLimit.map((a) => `${a.number} (${formatMoney(a.gross, currency, { vat: 'incl' })})`).join(', ')}.
            </p>
          ) : null}
          {result.request ? (
            <p data-testid="request-sent">
              Request sent to {ownerName} with {result.request.findingIds.map((id) => byId.get(id)?.number ?? 'a finding').join(', ')},{' '}
              {formatMoney(result.request.gross, currency, { vat: 'incl' })}. The link works until {formatDateTime(result.request.expiresAt)}.
            </p>
          ) : (
            <p>{SENDING.nothingLeft}</p>
          )}
        </Notice>
      ) : null}
      {!anyPriced ? (
        <p className="text-sm text-slate-soft">
          {findings.some((f) => f.state === 'draft') ? 'A finding can be ticked once its lines are saved in the estimate and it shows as priced.' : 'No priced finding is waiting to be sent.'}
        </p>
      ) : (
        <>
          <p className="text-sm">
            {chosen.length === 0
              ? 'Tick the priced findings above to send them to the owner together.'
              : `${chosen.length} finding${chosen.length > 1 ? 's' : ''} ticked, ${formatMoney(total, currency, { vat: 'incl' })} in all before any shared opening-up is netted off.`}
          </p>
          <div className="flex flex-col gap-1">
            <label htmlFor={messageId} className="text-sm font-semibold">
              A short message to the owner (optional)
            </label>
            <textarea
              id={messageId}
              value={message}
              maxLength={1000}
              rows={2}
              onChange={(e) => setMessage(e.target.value)}
              className="block w-full rounded-control border border-seam-strong bg-cloth-raised px-3 py-2 text-base"
            />
          </div>
          {chosen.some((f) => f.category === 'airworthiness') ? (
            <p className="text-sm">{SENDING.airworthinessTicked}</p>
          ) : null}
          {unsaved ? <p className="text-sm font-semibold">Save the estimate first: the owner is sent the prices as saved.</p> : null}
          {problem ? (
            <p role="alert" className="text-sm font-semibold text-fault">
              {problem}
            </p>
          ) : null}
          <div>
            <Button onClick={() => void submit()} busy={send.isPending} disabled={chosen.length === 0 || unsaved}>
              Send for approval
            </Button>
          </div>
        </>
      )}
    </section>
  );
}
