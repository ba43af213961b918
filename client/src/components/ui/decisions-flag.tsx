import { AlertIcon, ReplyIcon } from './icons';

/** The job's owners' decisions nobody on the staff has marked seen (JobDto.decisionsToSee). */
export interface DecisionsToSee {
  requests: number;
  declinedAirworthiness: boolean;
  ownerNote: boolean;
  lastDecidedAt: string;
}

/** The stronger reasons, in words: each one is said, never left to a colour. */
export function decisionsToSeeReasons(t: DecisionsToSee): string[] {
  const r: string[] = [];
  if (t.declinedAirworthiness) r.push('Airworthiness item declined');
  if (t.ownerNote) r.push('The owner left a note');
  return r;
}

export const decisionsToSeeTitle = (t: DecisionsToSee) => (t.requests === 1 ? 'New decision from the owner' : `${t.requests} new decisions from the owner`);

/**
 * The flag on a job (jobs list, job page) while an owner's decision waits to be read. A decline of
 * an airworthiness item or a note from the owner gives the stronger mark: a warning icon, a heavier
 * outline and the reason in words, so it reads the same without colour.
 */
export function DecisionsFlag({ toSee }: { toSee: DecisionsToSee | null }) {
  if (!toSee) return null;
  const reasons = decisionsToSeeReasons(toSee);
  const strong = reasons.length > 0;
  const Icon = strong ? AlertIcon : ReplyIcon;
  return (
    <span
      data-testid="decisions-flag"
      data-strength={strong ? 'strong' : 'plain'}
      className={`inline-flex max-w-full items-start gap-1.5 rounded-control px-2 py-0.5 text-sm ${
        toSee.declinedAirworthiness
          ? 'border-2 border-ember bg-ember-tint font-semibold text-slate'
          : strong
            ? 'border-2 border-slate bg-cloth-raised font-semibold text-slate'
            : 'border border-seam-strong bg-cloth-raised text-slate'
      }`}
    >
      <Icon size={16} className="mt-0.5 shrink-0" />
      <span className="flex flex-col">
        <span>{decisionsToSeeTitle(toSee)}</span>
        {reasons.length ? <span className="text-xs">{reasons.join(' · ')}</span> : null}
      </span>
    </span>
  );
}
