import { canResendRequest, type ApprovalRequestDto, type FindingDto } from '@wingstage/shared';
import { useState } from 'react';
import { ApprovalRequestBadge } from '@/components/ui/approval-badges';
import { Button } from '@/components/ui/button';
import { isApiError } from '@/lib/api-client';
import { formatDateTime, formatMoney } from '@/lib/format';
import { useRequestAction } from '../api/approval-requests';

function When({ label, at }: { label: string; at: string | null }) {
  if (!at) return null;
  return (
    <span>
      <span className="text-slate-soft">{label} </span>
      {formatDateTime(at)}
    </span>
  );
}

/** Every request sent on the job, newest first, with what the office can still do about each. */
export function ApprovalRequestsList({ jobId, requests, findings, currency, canAct }: { jobId: string; requests: ApprovalRequestDto[]; findings: FindingDto[]; currency: string; canAct: boolean }) {
  const revoke = useRequestAction(jobId, 'revoke');
  const resend = useRequestAction(jobId, 'resend');
  const [problem, setProblem] = useState<{ id: string; message: string } | null>(null);
  const [done, setDone] = useState<{ id: string; message: string } | null>(null);
  if (requests.length === 0) return <p className="text-slate-soft">Nothing has been sent to the owner on this job yet.</p>;
  const numbers = new Map(findings.map((f) => [f.id, `${f.number} ${f.title}`]));

  const run = async (r: ApprovalRequestDto, m: typeof revoke, after: string) => {
    setProblem(null);
    setDone(null);
    try {
      await m.mutateAsync(r.id);
      setDone({ id: r.id, message: after });
    } catch (e) {
      setProblem({ id: r.id, message: isApiError(e) ? e.message : 'That did not go through. Please try again.' });
    }
  };

  return (
    <ul className="flex flex-col gap-3" aria-label="Approval requests">
      {requests.map((r) => (
        <li key={r.id} data-request={r.id} className="flex flex-col gap-2 rounded-card border border-seam bg-cloth-raised p-3">
          <div className="flex flex-wrap items-center justify-between gap-2">
            <ApprovalRequestBadge state={r.state} />
            <span className="font-semibold tabular-nums">{formatMoney(r.gross, currency, { vat: 'incl' })}</span>
          </div>
          <ul className="text-sm">
            {r.includesQuote ? <li>The quote (inspection scope not yet agreed)</li> : null}
            {r.findingIds.map((id) => (
              <li key={id}>{numbers.get(id) ?? 'A finding no longer listed'}</li>
            ))}
          </ul>
          <p className="flex flex-wrap gap-x-4 gap-y-1 text-sm tabular-nums">
            <When label="Sent" at={r.sentAt} />
            {r.state === 'sent' || r.state === 'expired' ? <When label={r.state === 'expired' ? 'Expired' : 'Expires'} at={r.expiresAt} /> : null}
            <When label="Reminded" at={r.lastRemindedAt} />
            <When label="Revoked" at={r.revokedAt} />
            {r.decidedAt ? (
              <span>
                <span className="text-slate-soft">Decided </span>
                {formatDateTime(r.decidedAt)}
                {r.decidedByName ? ` by ${r.decidedByName}` : ''}
              </span>
            ) : null}
          </p>
          {r.state === 'replaced' ? <p className="text-sm">A price changed after sending, so a newer request took its place.</p> : null}
          {r.state === 'expired' || r.state === 'revoked' ? (
            <p className="text-sm text-slate-soft">This link is finished: to ask the owner again, send a new request.</p>
          ) : null}
          {canAct && canResendRequest(r.state).ok ? (
            <div className="flex flex-wrap gap-2">
              <Button variant="secondary" busy={resend.isPending && resend.variables === r.id} onClick={() => void run(r, resend, 'A new link is on its way to the owner; the old one no longer works.')}>
                Resend
              </Button>
              <Button variant="secondary" busy={revoke.isPending && revoke.variables === r.id} onClick={() => void run(r, revoke, 'The link no longer works. What it held is back with the workshop.')}>
                Revoke link
              </Button>
            </div>
          ) : null}
          {done?.id === r.id ? (
            <p role="status" className="text-sm font-semibold">
              {done.message}
            </p>
          ) : null}
          {problem?.id === r.id ? (
            <p role="alert" className="text-sm font-semibold text-fault">
              {problem.message}
            </p>
          ) : null}
        </li>
      ))}
    </ul>
  );
}
