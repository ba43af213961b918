import {
  approvalRequestCreateSchema,
  choiceBasisFrom,
  priceChoice,
  QUOTE_ITEM_ID,
  type EstimateDto,
  type FindingDto,
  type PricedChoice,
  type SendForApprovalResultDto,
  type WorkshopDto,
  pricedEstimateOf,
} from '@wingstage/shared';
import { useId, useState } from 'react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-client';
import { formatDateTime, formatMoney } from '@/lib/format';
import { useSendForApproval } from '../api/approval-requests';
import { SENDING } from '../words';

/** A priced finding may be ticked and sent; anything else waits or has been decided. */
export const sendable = (f: FindingDto) => f.state === 'priced';

/** The quote can be put to the owner while some inspection line is unagreed and no request holds it yet. */
export const quoteSendable = (e: EstimateDto) => e.quote.state !== 'sent' && e.lines.some((l) => l.stage === 'inspection' && l.agreedAt === null);

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
 * What the owner would be asked, priced the way the server will freeze it: the basis is built
 * from the SAVED estimate's engine result by the same shared helper the server uses, and priced
 * with `priceChoice`, so the preview, the e-mail and the owner's page show one figure. Null when
 * nothing is ticked or the saved estimate no longer holds lines for what is ticked.
 */
export function sendPreview(estimate: EstimateDto, vatRates: WorkshopDto['vatRates'], request: { quote: boolean; findingIds: string[] }): PricedChoice | null {
  if (!request.quote && request.findingIds.length === 0) return null;
  const names = new Map(estimate.accessTasks.map((t) => [t.id, t.name]));
  try {
    const basis = choiceBasisFrom(pricedEstimateOf(estimate), request, vatRates, (id) => names.get(id) ?? 'Opening-up work');
    return priceChoice(basis, Object.fromEntries(basis.items.map((i) => [i.id, 'approve' as const])));
  } catch {
    return null;
  }
}

/**
 * Sends the quote (when ticked) and the ticked findings, in the order the panel lists them (the
 * pre-authorised limit is walked in that order; it never covers the quote), against the saved
 * estimate version the manager is looking at.
 */
export function SendForApproval({
  jobId,
  ownerName,
  findings,
  selected,
  estimate,
  vatRates,
  quoteTicked,
  onQuoteTicked,
  unsaved,
  onSent,
}: {
  jobId: string;
  ownerName: string;
  findings: FindingDto[];
  selected: Set<string>;
  /** The SAVED estimate: what the owner is sent. */
  estimate: EstimateDto;
  vatRates: WorkshopDto['vatRates'];
  quoteTicked: boolean;
  onQuoteTicked: (on: boolean) => void;
  unsaved: boolean;
  onSent: () => void;
}) {
  const send = useSendForApproval(jobId);
  const [message, setMessage] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const [result, setResult] = useState<SendForApprovalResultDto | null>(null);
  const messageId = useId();
  const currency = estimate.currency;
  const canQuote = quoteSendable(estimate);
  const withQuote = canQuote && quoteTicked;
  const chosen = findings.filter((f) => selected.has(f.id));
  const preview = sendPreview(estimate, vatRates, { quote: withQuote, findingIds: chosen.map((f) => f.id) });
  const anyPriced = findings.some(sendable);
  const labelOf = (id: string) => (id === QUOTE_ITEM_ID ? 'the quote' : (findings.find((f) => f.id === id)?.number ?? 'a finding'));

  const submit = async () => {
    setProblem(null);
    setResult(null);
    const parsed = approvalRequestCreateSchema.safeParse({ findingIds: chosen.map((f) => f.id), includeQuote: withQuote, message, estimateVersion: estimate.version });
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
  // The send panel is reached from the quote panel's "Send quote to owner" by this id.
  return (
    <section id={`send-for-approval-${jobId}`} aria-label="Send for approval" className="flex scroll-mt-4 flex-col gap-3 rounded-card border border-seam bg-cloth p-3">
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
              Request sent to {ownerName} with{' '}
              {[...(result.request.includesQuote ? ['the quote'] : []), ...result.request.findingIds.map((id) => byId.get(id)?.number ?? 'a finding')].join(', ')},{' '}
              {formatMoney(result.request.gross, currency, { vat: 'incl' })}. The link works until {formatDateTime(result.request.expiresAt)}.
            </p>
          ) : (
            <p>{SENDING.nothingLeft}</p>
          )}
        </Notice>
      ) : null}
      {canQuote ? (
        <label className="inline-flex min-h-10 cursor-pointer items-center gap-2 self-start rounded-control border border-seam-strong bg-cloth-raised px-3 text-sm font-semibold">
          <input type="checkbox" className="size-5 accent-harbour" checked={quoteTicked} onChange={(e) => onQuoteTicked(e.target.checked)} />
          Quote: the inspection scope not yet agreed, {formatMoney(estimate.quote.awaitingGross, currency, { vat: 'incl' })}
        </label>
      ) : null}
      {!anyPriced && !canQuote ? (
        <p className="text-sm text-slate-soft">
          {findings.some((f) => f.state === 'draft')
            ? 'A finding can be ticked once its lines are saved in the estimate and it shows as priced.'
            : 'Nothing is waiting to be sent: the quote is agreed or with the owner, and no priced finding waits.'}
        </p>
      ) : (
        <>
          {preview ? (
            <SendPreviewFigures preview={preview} currency={currency} labelOf={labelOf} />
          ) : (
            <p className="text-sm">{canQuote ? 'Tick the quote or the priced findings above to send them to the owner together.' : 'Tick the priced findings above to send them to the owner together.'}</p>
          )}
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
            <Button onClick={() => void submit()} busy={send.isPending} disabled={(chosen.length === 0 && !withQuote) || unsaved}>
              Send for approval
            </Button>
          </div>
        </>
      )}
    </section>
  );
}

/**
 * The request as the owner will first see it: each item's price if everything is approved, the
 * opening-up work once on its own line, and what it all adds: the same figures as the e-mail and
 * the owner's page (before any pre-authorised limit takes findings out of the request).
 */
function SendPreviewFigures({ preview: p, currency, labelOf }: { preview: PricedChoice; currency: string; labelOf: (id: string) => string }) {
  const money = (a: string) => formatMoney(a, currency, { vat: 'incl' });
  const cap = (w: string) => w.charAt(0).toUpperCase() + w.slice(1);
  return (
    <div className="flex flex-col gap-1 text-sm" data-testid="send-preview">
      <p className="font-semibold">The owner will be asked about:</p>
      <ul className="flex flex-col gap-0.5 tabular-nums">
        {p.items.map((i) => (
          <li key={i.id} className="flex justify-between gap-3">
            <span>{cap(labelOf(i.id))}</span>
            <span>{money(i.allApprovedGross)}</span>
          </li>
        ))}
        {p.openingUp.map((o) => (
          <li key={o.id} className="flex justify-between gap-3">
            <span>
              Opening-up work {o.neededBy.length > 1 ? `shared by ${o.neededBy.map(labelOf).join(' and ')}` : `for ${labelOf(o.neededBy[0] ?? '')}`} (“{o.name}”), charged once
            </span>
            <span>{money(o.allApprovedGross)}</span>
          </li>
        ))}
        <li className="flex justify-between gap-3 border-t border-seam pt-1 font-semibold">
          <span>If the owner approves everything</span>
          <span data-testid="send-preview-total">{money(p.approvingNow.gross)}</span>
        </li>
      </ul>
      <p className="text-slate-soft">
        Agreed so far {money(p.agreedSoFar.gross)}; {money(p.ifAllApproved.gross)} if everything is approved. Findings inside the pre-authorised limit are approved for the
        owner instead of being asked.
      </p>
    </div>
  );
}
