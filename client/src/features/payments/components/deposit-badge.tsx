import type { DepositRequestState } from '@wingstage/shared';
import type { ComponentType } from 'react';
import { CheckIcon, ClockIcon, SlashCircleIcon } from '@/components/ui/icons';

/** A deposit's state, read from its words and its icon; the tint only follows them. */
const LOOK: Record<DepositRequestState, { Icon: ComponentType<{ size?: number }>; tone: string }> = {
  waiting: { Icon: ClockIcon, tone: 'bg-dusk-tint text-dusk border-dusk' },
  paid: { Icon: CheckIcon, tone: 'bg-cloth-raised text-slate-deep border-slate-deep' },
  cancelled: { Icon: SlashCircleIcon, tone: 'bg-transparent text-slate-soft border-slate-soft border-dashed' },
};

export function DepositBadge({ state, words }: { state: DepositRequestState; words: Record<DepositRequestState, string> }) {
  const { Icon, tone } = LOOK[state];
  return (
    <span data-deposit-state={state} className={`inline-flex items-center gap-1.5 whitespace-nowrap rounded-full border px-2.5 py-0.5 text-sm font-semibold ${tone}`}>
      <Icon size={14} />
      {words[state]}
    </span>
  );
}
