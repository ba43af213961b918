import { describeLimit, type FindingDto } from '@wingstage/shared';
import type { ReactNode } from 'react';
import { CategoryBadge, FindingStateBadge } from '@/components/ui/finding-badges';
import { formatDateTime, trimDecimal } from '@/lib/format';
import { FindingPhotos, FindingPhotoStrip } from './finding-photos';
import type { UnsentPhotos } from './raise-finding';

/** Who may change photos here, and photos waiting to be sent again after a failed upload. */
export interface FindingsListPhotos {
  jobId: string;
  canEdit: boolean;
  unsent?: Record<string, UnsentPhotos>;
  onUnsentSettled?: (findingId: string) => void;
}

export function FindingsList({
  findings,
  action,
  photos,
  empty = 'No findings raised on this job.',
}: {
  findings: FindingDto[];
  action?: (f: FindingDto) => ReactNode;
  /** Without it the photos are shown read-only. */
  photos?: FindingsListPhotos;
  empty?: string;
}) {
  if (findings.length === 0) return <p className="text-slate-soft">{empty}</p>;
  return (
    <ul className="flex flex-col gap-3">
      {findings.map((f) => (
        <li key={f.id} data-finding={f.number} className={`flex flex-col gap-2 rounded-card border bg-cloth-raised p-3 ${f.category === 'airworthiness' ? 'border-l-8 border-ember' : 'border-seam'}`}>
          <div className="flex flex-wrap items-center gap-2">
            <span className="font-semibold tabular-nums">{f.number}</span>
            <span className="font-semibold">{f.title}</span>
          </div>
          <div className="flex flex-wrap items-center gap-2">
            <CategoryBadge category={f.category} />
            <FindingStateBadge state={f.state} />
            {f.rectifiedAt ? <span className="text-sm">Rectified {formatDateTime(f.rectifiedAt)}</span> : null}
          </div>
          <p className="text-sm">
            <span className="text-slate-soft">Where: </span>
            {f.location}
          </p>
          <p className="whitespace-pre-line text-sm">{f.seen}</p>
          {f.measuredValue && f.limit ? (
            <p className="text-sm tabular-nums">
              <span className="text-slate-soft">Recorded measurement: </span>
              {trimDecimal(f.measuredValue)} {f.limit.unit} · example limit {describeLimit(f.limit)}
            </p>
          ) : null}
          {f.remedy.description || f.remedy.hours || f.remedy.parts.length > 0 || f.remedy.accessTask ? (
            <p className="text-sm">
              <span className="text-slate-soft">Proposed: </span>
              {[f.remedy.description, f.remedy.hours ? `${f.remedy.hours} h` : '', f.remedy.parts.length ? `${f.remedy.parts.length} part${f.remedy.parts.length > 1 ? 's' : ''}` : '', f.remedy.accessTask ? `needs “${f.remedy.accessTask}”` : '']
                .filter(Boolean)
                .join(' · ')}
            </p>
          ) : null}
          {photos ? (
            <FindingPhotos
              jobId={photos.jobId}
              finding={f}
              canEdit={photos.canEdit}
              unsent={photos.unsent?.[f.id] ?? null}
              onUnsentSettled={() => photos.onUnsentSettled?.(f.id)}
            />
          ) : (
            <FindingPhotoStrip finding={f} />
          )}
          <p className="text-xs text-slate-soft">
            Raised by {f.raisedByName}, {formatDateTime(f.raisedAt)}
          </p>
          {action ? <div className="flex flex-wrap gap-2">{action(f)}</div> : null}
        </li>
      ))}
    </ul>
  );
}
