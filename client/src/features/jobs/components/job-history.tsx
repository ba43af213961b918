import type { AuditEventDto } from '@wingstage/shared';
import { formatDateTime } from '@/lib/format';

export function JobHistory({ events }: { events: AuditEventDto[] }) {
  if (events.length === 0) return <p className="text-sm text-slate-soft">Nothing recorded yet.</p>;
  return (
    <ol className="flex flex-col gap-0 border-l-2 border-seam pl-4">
      {events.map((ev) => (
        <li key={ev.id} className="relative pb-4 last:pb-0">
          <span className="absolute top-2 -left-[1.4rem] size-3 rounded-full border-2 border-harbour bg-cloth-raised" aria-hidden="true" />
          <p className="font-semibold">{ev.summary}</p>
          <p className="text-sm text-slate-soft">
            <time dateTime={ev.at} className="tabular-nums">
              {formatDateTime(ev.at)}
            </time>
            {ev.actorName ? ` · ${ev.actorName}` : ''}
            {ev.actorRole ? ` (${ev.actorRole})` : ''}
          </p>
        </li>
      ))}
    </ol>
  );
}
