import { APPROVAL_REQUEST_STATE_LABELS, type ApprovalRequestState } from '@wingstage/shared';
import type { ComponentType } from 'react';
import { CheckIcon, ClockIcon, EnvelopeIcon, SlashCircleIcon, ArrowUpIcon } from './icons';

/** An approval request's state is read from its word and icon; the outline style only groups open vs finished. */
const LOOK: Record<ApprovalRequestState, { Icon: ComponentType<{ size?: number }>; tone: string }> = {
  sent: { Icon: EnvelopeIcon, tone: 'border-dusk bg-dusk-tint text-dusk' },
  decided: { Icon: CheckIcon, tone: 'border-slate-deep bg-cloth-raised text-slate-deep' },
  expired: { Icon: ClockIcon, tone: 'border-seam-strong border-dashed bg-transparent text-slate-soft' },
  revoked: { Icon: SlashCircleIcon, tone: 'border-seam-strong border-dashed bg-transparent text-slate-soft' },
  replaced: { Icon: ArrowUpIcon, tone: 'border-seam-strong border-dashed bg-transparent text-slate-soft' },
};

export function ApprovalRequestBadge({ state, words = APPROVAL_REQUEST_STATE_LABELS }: { state: ApprovalRequestState; words?: Record<ApprovalRequestState, string> }) {
  const { Icon, tone } = LOOK[state];
  return (
    <span data-request-state={state} className={`inline-flex items-center gap-1.5 whitespace-nowrap rounded-full border px-2.5 py-0.5 text-sm font-semibold ${tone}`}>
      <Icon size={15} />
      {words[state]}
    </span>
  );
}
