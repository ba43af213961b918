import type { FindingDto, Role } from '@wingstage/shared';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { isApiError } from '@/lib/api-client';
import { useMarkRectified, useWithdrawFinding } from '../api/finding-actions';

const WITHDRAWABLE = new Set<FindingDto['state']>(['draft', 'priced', 'sent']);
const RECTIFIABLE = new Set<FindingDto['state']>(['approved', 'approved_within_limit']);

/**
 * The two ways a finding stops being open: the approved work is done ("Mark rectified", which an
 * engineer may record), or the office decides it was raised in error ("Withdraw finding").
 */
export function FindingActions({ jobId, finding, role }: { jobId: string; finding: FindingDto; role: Role }) {
  const withdraw = useWithdrawFinding(jobId);
  const rectified = useMarkRectified(jobId);
  const [problem, setProblem] = useState<string | null>(null);
  const canWithdraw = (role === 'admin' || role === 'manager') && WITHDRAWABLE.has(finding.state);
  const canRectify = (role === 'admin' || role === 'manager' || role === 'engineer') && RECTIFIABLE.has(finding.state) && !finding.rectifiedAt;
  if (!canWithdraw && !canRectify) return null;

  const run = async (m: typeof withdraw) => {
    setProblem(null);
    try {
      await m.mutateAsync({ findingId: finding.id, body: { version: finding.version } });
    } catch (e) {
      setProblem(isApiError(e) ? e.message : 'That did not go through. Please try again.');
    }
  };

  return (
    <>
      {canRectify ? (
        <Button variant="primary" busy={rectified.isPending} onClick={() => void run(rectified)}>
          Mark rectified
        </Button>
      ) : null}
      {canWithdraw ? (
        <Button variant="secondary" busy={withdraw.isPending} onClick={() => void run(withdraw)}>
          Withdraw finding
        </Button>
      ) : null}
      {problem ? (
        <p role="alert" className="w-full text-sm font-semibold text-fault">
          {problem}
        </p>
      ) : null}
    </>
  );
}
