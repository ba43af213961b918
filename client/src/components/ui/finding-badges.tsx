import { FINDING_CATEGORY_LABELS, FINDING_STATE_LABELS, type FindingCategory, type FindingState } from '@wingstage/shared';
import type { ComponentType } from 'react';
import { AdviceIcon, CheckIcon, CrossIcon, EnvelopeIcon, EyeIcon, PencilIcon, ShieldBarIcon, SlashCircleIcon, TagIcon } from './icons';

type Icon = ComponentType<{ size?: number }>;

/**
 * A category is read from its word and its icon. The warm signal colour is kept for airworthiness
 * alone and only reinforces the word; the other two share the quiet look and differ by word, icon
 * and border style.
 */
export const CATEGORY_LOOK: Record<FindingCategory, { Icon: Icon; tone: string }> = {
  airworthiness: { Icon: ShieldBarIcon, tone: 'border-ember bg-ember-tint text-ember border-2' },
  recommended: { Icon: AdviceIcon, tone: 'border-slate-deep bg-cloth-raised text-slate-deep' },
  advisory: { Icon: EyeIcon, tone: 'border-seam-strong border-dashed bg-transparent text-slate-soft' },
};

export function CategoryBadge({ category }: { category: FindingCategory }) {
  const { Icon, tone } = CATEGORY_LOOK[category];
  return (
    <span data-category={category} className={`inline-flex items-center gap-1.5 whitespace-nowrap rounded-control border px-2 py-0.5 text-sm font-semibold ${tone}`}>
      <Icon size={15} />
      {FINDING_CATEGORY_LABELS[category]}
    </span>
  );
}

const STATE_ICON: Record<FindingState, Icon> = {
  draft: PencilIcon,
  priced: TagIcon,
  sent: EnvelopeIcon,
  approved: CheckIcon,
  approved_within_limit: CheckIcon,
  declined: CrossIcon,
  withdrawn: SlashCircleIcon,
};

export function FindingStateBadge({ state, words = FINDING_STATE_LABELS }: { state: FindingState; words?: Record<FindingState, string> }) {
  const Icon = STATE_ICON[state];
  return (
    <span data-finding-state={state} className="inline-flex items-center gap-1.5 whitespace-nowrap rounded-full border border-seam-strong bg-cloth-raised px-2.5 py-0.5 text-sm">
      <Icon size={15} />
      {words[state]}
    </span>
  );
}
