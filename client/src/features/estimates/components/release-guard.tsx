import { isOpenAirworthiness, type FindingDto } from '@wingstage/shared';
import { ShieldBarIcon } from '@/components/ui/icons';

/**
 * Says, before anyone presses the button, why the job cannot be marked ready for release. The
 * server makes the same check and refuses the move; this only explains it.
 */
export function ReleaseGuard({ findings }: { findings: Pick<FindingDto, 'id' | 'number' | 'title' | 'category' | 'state' | 'rectifiedAt'>[] }) {
  const open = findings.filter(isOpenAirworthiness);
  if (open.length === 0) return null;
  return (
    <div role="note" aria-label="Release blocked" className="flex gap-3 rounded-card border-2 border-ember bg-ember-tint p-3 text-sm">
      <span className="text-ember">
        <ShieldBarIcon size={22} />
      </span>
      <div className="flex flex-col gap-1">
        <p className="font-semibold">
          Cannot be marked ready for release while {open.length === 1 ? 'an airworthiness finding is' : `${open.length} airworthiness findings are`} open
        </p>
        <ul className="list-disc pl-5">
          {open.map((f) => (
            <li key={f.id}>
              <span className="tabular-nums">{f.number}</span> {f.title} — {f.state === 'declined' ? 'declined by the owner, still open' : 'not yet rectified'}
            </li>
          ))}
        </ul>
        <p>
          An airworthiness finding stays open until the work is done and recorded, even if the owner declines it. Wingstage will not mark the job ready for release until then;
          whether the aircraft may fly is the licensed inspector's decision under the authority's rules.
        </p>
      </div>
    </div>
  );
}
