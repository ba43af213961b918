import type { JobChecklistItemDto, ScopeCaution } from '@wingstage/shared';
import { HandStopIcon } from '@/components/ui/icons';
import { HANGAR_WORDS } from '../words';

/**
 * The job's caution area: the hazards of this job's work, gathered from its scope lines and
 * checklist items (each also shown beside its item), after a few that apply to every job.
 */
export function JobCautions({ checklist, scopeCautions }: { checklist: JobChecklistItemDto[]; scopeCautions: ScopeCaution[] }) {
  const fromItems = checklist.filter((i) => i.caution.trim() !== '').map((i) => ({ about: i.text, text: i.caution }));
  const fromScope = scopeCautions.map((c) => ({ about: c.line, text: c.caution }));
  const specific = [...fromScope, ...fromItems];
  return (
    <section aria-labelledby="job-cautions" data-testid="job-cautions" className="flex flex-col gap-2 rounded-card border-2 border-slate-deep bg-cloth-sunk p-3 text-sm">
      <h2 id="job-cautions" className="flex items-center gap-2 text-base font-semibold">
        <HandStopIcon size={20} />
        {HANGAR_WORDS.cautionsTitle}
      </h2>
      <p className="text-slate-soft">{HANGAR_WORDS.cautionsLead}</p>
      <ul className="flex list-disc flex-col gap-1 pl-5">
        {HANGAR_WORDS.cautionsGeneral.map((c) => (
          <li key={c}>{c}</li>
        ))}
        {specific.map((c, i) => (
          <li key={`${i}-${c.about}`}>
            <span className="font-semibold">{c.about}:</span> {c.text}
          </li>
        ))}
      </ul>
    </section>
  );
}
