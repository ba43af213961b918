import { Button } from '@/components/ui/button';
import { DecisionsFlag, decisionsToSeeReasons, type DecisionsToSee } from '@/components/ui/decisions-flag';
import { Notice } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-client';
import { formatDateTime } from '@/lib/format';
import { useMarkDecisionsSeen } from '../api/mark-decisions-seen';

/**
 * On the job page while an owner's decision waits to be read: what came back, the stronger reasons
 * in words, where to read it, and "Mark as seen" to clear the flag here and in the jobs list.
 */
export function DecisionsToSeePanel({ jobId, toSee, ownerName }: { jobId: string; toSee: DecisionsToSee | null; ownerName: string }) {
  const seen = useMarkDecisionsSeen(jobId);
  if (!toSee) return null;
  const reasons = decisionsToSeeReasons(toSee);
  return (
    <section
      aria-labelledby="decisions-to-see-heading"
      data-testid="decisions-to-see"
      className={`flex flex-col gap-3 rounded-card bg-cloth-raised p-4 ${toSee.declinedAirworthiness ? 'border-2 border-ember' : reasons.length ? 'border-2 border-slate' : 'border border-seam-strong'}`}
    >
      <h2 id="decisions-to-see-heading" className="sr-only">
        Decisions not yet seen
      </h2>
      <DecisionsFlag toSee={toSee} />
      <p>
        {ownerName} decided {toSee.requests === 1 ? 'a request' : `${toSee.requests} requests`}; the latest on {formatDateTime(toSee.lastDecidedAt)}. The decisions are
        in the job’s history, and the e-mail to the workshop’s managers quotes every note.
      </p>
      {toSee.declinedAirworthiness ? (
        <p className="text-sm font-semibold">
          A declined airworthiness item stays open, so Wingstage will not mark this job ready for release. Talk it through with the owner; the inspector decides what the aircraft needs.
        </p>
      ) : null}
      {seen.isError ? (
        <Notice tone="problem" title="Not marked as seen">
          {isApiError(seen.error) ? seen.error.message : 'Try again.'}
        </Notice>
      ) : null}
      <div>
        <Button variant="secondary" busy={seen.isPending} onClick={() => seen.mutate()}>
          Mark as seen
        </Button>
      </div>
    </section>
  );
}
