import { JOB_STATE_LABELS, type JobState } from '@wingstage/shared';
import type { ComponentType } from 'react';
import {
  ArchiveIcon,
  CalendarIcon,
  CoinIcon,
  DocumentIcon,
  EnvelopeIcon,
  FlagIcon,
  LensIcon,
  SlashCircleIcon,
  SpannerIcon,
} from './icons';

/**
 * A job state is read from its label and its icon; the tint only groups states (hands-on work,
 * waiting on the owner, money, finished) and never carries meaning alone.
 */
const LOOK: Record<JobState, { Icon: ComponentType<{ size?: number }>; tone: string }> = {
  booked_in: { Icon: CalendarIcon, tone: 'bg-cloth-sunk text-slate border-seam-strong' },
  inspecting: { Icon: LensIcon, tone: 'bg-harbour-tint text-harbour-deep border-harbour' },
  awaiting_owner: { Icon: EnvelopeIcon, tone: 'bg-dusk-tint text-dusk border-dusk' },
  in_work: { Icon: SpannerIcon, tone: 'bg-harbour-tint text-harbour-deep border-harbour' },
  ready_for_release: { Icon: FlagIcon, tone: 'bg-harbour text-on-harbour border-harbour' },
  invoiced: { Icon: DocumentIcon, tone: 'bg-cloth-raised text-slate-deep border-slate-deep' },
  paid: { Icon: CoinIcon, tone: 'bg-cloth-raised text-slate-deep border-slate-deep' },
  closed: { Icon: ArchiveIcon, tone: 'bg-slate-deep text-on-harbour border-slate-deep' },
  cancelled: { Icon: SlashCircleIcon, tone: 'bg-transparent text-slate-soft border-slate-soft border-dashed' },
};

/** `words`: the labels to use — the owner's pages pass the owner's own (OWNER_JOB_STATE_LABELS). */
export function StateBadge({ state, size = 'md', words = JOB_STATE_LABELS }: { state: JobState; size?: 'md' | 'lg'; words?: Record<JobState, string> }) {
  const { Icon, tone } = LOOK[state];
  return (
    <span
      data-state={state}
      className={`inline-flex items-center gap-1.5 whitespace-nowrap rounded-full border font-semibold ${tone} ${
        size === 'lg' ? 'px-3 py-1 text-base' : 'px-2.5 py-0.5 text-sm'
      }`}
    >
      <Icon size={size === 'lg' ? 18 : 15} />
      {words[state]}
    </span>
  );
}
