import { QUOTE_STATE_LABELS, type QuoteState } from '@wingstage/shared';
import type { ComponentType } from 'react';
import { CheckIcon, CrossIcon, DocumentIcon, EnvelopeIcon, PencilIcon } from './icons';

/** The quote's state is read from its words and icon; the outline only groups settled vs open. */
const LOOK: Record<QuoteState, { Icon: ComponentType<{ size?: number }>; tone: string }> = {
  not_sent: { Icon: DocumentIcon, tone: 'border-seam-strong border-dashed bg-transparent text-slate' },
  sent: { Icon: EnvelopeIcon, tone: 'border-dusk bg-dusk-tint text-dusk' },
  agreed: { Icon: CheckIcon, tone: 'border-slate-deep bg-cloth-raised text-slate-deep' },
  changed: { Icon: PencilIcon, tone: 'border-slate bg-cloth-raised text-slate border-2' },
  declined: { Icon: CrossIcon, tone: 'border-slate bg-cloth-raised text-slate border-2' },
};

export function QuoteStateBadge({ state }: { state: QuoteState }) {
  const { Icon, tone } = LOOK[state];
  return (
    <span data-quote-state={state} className={`inline-flex items-center gap-1.5 rounded-full border px-2.5 py-0.5 text-sm font-semibold ${tone}`}>
      <Icon size={15} />
      {QUOTE_STATE_LABELS[state]}
    </span>
  );
}
