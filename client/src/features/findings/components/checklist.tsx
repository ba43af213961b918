import { CHECKLIST_RESULT_LABELS, describeLimit, measuredValueSchema, type ChecklistResult, type JobChecklistItemDto } from '@wingstage/shared';
import { useId, useState } from 'react';
import { Button } from '@/components/ui/button';
import { AlertIcon, CheckIcon, CrossIcon, GaugeIcon, SlashCircleIcon } from '@/components/ui/icons';
import { isApiError } from '@/lib/api-client';
import { trimDecimal } from '@/lib/format';
import { useRecordChecklist } from '../api/record-work';
import type { FindingPrefill } from './finding-form';
import { HazardNote } from './hazard-note';

/** What an out-of-limit measurement proposes as a finding: the item, the value and the limit. */
export function prefillFromItem(item: JobChecklistItemDto): FindingPrefill {
  const limit = item.limit;
  const where = limit ? ` (example limit ${describeLimit(limit)})` : '';
  const unit = limit ? ` ${limit.unit}` : '';
  return {
    title: `${item.text}: outside limit`,
    location: item.section || '',
    seen: item.measuredValue ? `Measured ${trimDecimal(item.measuredValue)}${unit}${where}. ${item.note}`.trim() : item.note,
    checklistItemId: item.id,
    measuredValue: item.measuredValue ? trimDecimal(item.measuredValue) : null,
    limit,
  };
}

const RESULT_ICON = { pass: CheckIcon, fail: CrossIcon, na: SlashCircleIcon, measured: GaugeIcon } as const;

export function Checklist({ jobId, items, canRecord, onRaise }: { jobId: string; items: JobChecklistItemDto[]; canRecord: boolean; onRaise: (prefill: FindingPrefill) => void }) {
  if (items.length === 0) return <p className="text-slate-soft">This job has no checklist. Jobs booked in from a template carry its checklist.</p>;
  const sections = [...new Set(items.map((i) => i.section))];
  const done = items.filter((i) => i.result !== null).length;
  return (
    <div className="flex flex-col gap-5">
      <p className="text-sm tabular-nums" aria-live="polite">
        {done} of {items.length} recorded
      </p>
      {sections.map((s) => (
        <section key={s || 'general'} aria-label={s || 'General'} className="flex flex-col gap-3">
          <h3 className="border-b-2 border-seam-strong pb-1 font-semibold">{s || 'General'}</h3>
          <ul className="flex flex-col gap-3">
            {items
              .filter((i) => i.section === s)
              .map((i) => (
                <li key={i.id}>
                  <ChecklistItem jobId={jobId} item={i} canRecord={canRecord} onRaise={onRaise} />
                </li>
              ))}
          </ul>
        </section>
      ))}
    </div>
  );
}

function ChecklistItem({ jobId, item, canRecord, onRaise }: { jobId: string; item: JobChecklistItemDto; canRecord: boolean; onRaise: (p: FindingPrefill) => void }) {
  const record = useRecordChecklist(jobId);
  const [measuring, setMeasuring] = useState(false);
  const [value, setValue] = useState(item.measuredValue ? trimDecimal(item.measuredValue) : '');
  const [problem, setProblem] = useState<string | null>(null);
  const inputId = useId();
  const outside = item.limitCheck === 'below' || item.limitCheck === 'above';

  const send = async (result: ChecklistResult, measuredValue: string | null = null) => {
    setProblem(null);
    try {
      await record.mutateAsync({ itemId: item.id, body: { version: item.version, result, measuredValue, note: item.note } });
      setMeasuring(false);
    } catch (e) {
      setProblem(
        isApiError(e) && e.code === 'stale_version'
          ? 'Someone else recorded this item a moment ago; it now shows their result. Record again if it needs changing.'
          : isApiError(e)
            ? e.message
            : 'Not recorded. Check the connection and try again.',
      );
    }
  };

  const submitValue = () => {
    const parsed = measuredValueSchema.safeParse(value);
    if (!parsed.success) {
      setProblem(parsed.error.issues[0]?.message ?? 'Enter a number.');
      return;
    }
    void send('measured', parsed.data);
  };

  const ResultIcon = item.result ? RESULT_ICON[item.result] : null;
  // Only an item with a measured limit can be measured; a logbook check is passed or failed.
  const measurable = item.limit !== null || item.result === 'measured';

  return (
    <article
      aria-label={item.text}
      data-result={item.result ?? 'open'}
      className={`flex flex-col gap-3 rounded-card border bg-cloth-raised p-3 ${outside ? 'border-2 border-slate' : 'border-seam'}`}
    >
      <div className="flex flex-col gap-1">
        <p className="text-base font-semibold">{item.text}</p>
        {item.limit ? (
          <p className="text-sm text-slate-soft">
            Example limit: <span className="tabular-nums">{describeLimit(item.limit)}</span>
            {item.limit.source ? <span className="block text-xs">{item.limit.source}</span> : null}
          </p>
        ) : null}
        <p className="flex flex-wrap items-center gap-1.5 text-sm" data-testid="checklist-result">
          {ResultIcon ? <ResultIcon size={16} /> : null}
          {item.result ? (
            <>
              <span className="font-semibold">{item.result === 'measured' ? `Measured ${trimDecimal(item.measuredValue ?? '')}${item.limit ? ` ${item.limit.unit}` : ''}` : CHECKLIST_RESULT_LABELS[item.result]}</span>
              {item.recordedByName ? <span className="text-slate-soft">by {item.recordedByName}</span> : null}
            </>
          ) : (
            <span className="text-slate-soft">Not yet recorded</span>
          )}
        </p>
        {item.caution ? <HazardNote text={item.caution} /> : null}
      </div>

      {outside && item.limit ? (
        <div role="status" className="flex flex-col gap-2 rounded-control border-2 border-dashed border-slate bg-cloth-sunk p-3">
          <p className="flex items-start gap-2 font-semibold">
            <AlertIcon />
            <span>
              Outside the example limit ({describeLimit(item.limit)}): {item.limitCheck === 'below' ? 'below the minimum' : 'above the maximum'}.
            </span>
          </p>
          {item.findingId ? (
            <p className="text-sm">A finding has been raised for this item.</p>
          ) : canRecord ? (
            <div>
              <Button size="lg" onClick={() => onRaise(prefillFromItem(item))}>
                Raise finding
              </Button>
            </div>
          ) : null}
        </div>
      ) : null}

      {item.result === 'fail' && !item.findingId && canRecord ? (
        <div>
          <Button size="lg" variant="secondary" onClick={() => onRaise({ ...prefillFromItem(item), title: item.text })}>
            Raise finding for this item
          </Button>
        </div>
      ) : item.result === 'fail' && item.findingId ? (
        <p className="text-sm">A finding has been raised for this item.</p>
      ) : null}

      {problem ? (
        <p role="alert" className="text-sm font-semibold text-fault">
          <span aria-hidden="true">▲ </span>
          {problem}
        </p>
      ) : null}

      {canRecord ? (
        measuring ? (
          <form
            className="flex flex-wrap items-end gap-2"
            onSubmit={(e) => {
              e.preventDefault();
              submitValue();
            }}
          >
            <div className="flex flex-1 flex-col gap-1">
              <label htmlFor={inputId} className="text-sm font-semibold">
                Measured value{item.limit ? ` (${item.limit.unit})` : ''}
              </label>
              <input
                id={inputId}
                inputMode="decimal"
                autoFocus
                autoComplete="off"
                value={value}
                onChange={(e) => setValue(e.target.value)}
                className="min-h-tap w-full rounded-control border border-seam-strong bg-cloth-raised px-3 text-lg tabular-nums"
              />
            </div>
            <Button type="submit" size="lg" busy={record.isPending}>
              Save value
            </Button>
            <Button variant="secondary" size="lg" onClick={() => setMeasuring(false)}>
              Cancel
            </Button>
          </form>
        ) : (
          <div className={`grid grid-cols-2 gap-2 ${measurable ? 'sm:grid-cols-4' : 'sm:grid-cols-3'}`} role="group" aria-label={`Record ${item.text}`}>
            {(['pass', 'fail', 'na'] as const).map((r) => {
              const Icon = RESULT_ICON[r];
              const current = item.result === r;
              return (
                <Button
                  key={r}
                  size="lg"
                  variant={current ? 'primary' : 'secondary'}
                  aria-pressed={current}
                  disabled={record.isPending}
                  onClick={() => void send(r)}
                >
                  <Icon size={18} />
                  {CHECKLIST_RESULT_LABELS[r]}
                </Button>
              );
            })}
            {measurable ? (
              <Button size="lg" variant={item.result === 'measured' ? 'primary' : 'secondary'} aria-pressed={item.result === 'measured'} onClick={() => setMeasuring(true)}>
                <GaugeIcon size={18} />
                Record value
              </Button>
            ) : null}
          </div>
        )
      ) : null}
    </article>
  );
}
