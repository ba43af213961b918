import { Button } from './button';
import { Notice } from './notice';
import { formatDateTime } from '@/lib/format';

export interface FieldChange {
  field: string;
  label: string;
  value: string;
}

/**
 * The fields, among those labelled, whose saved value differs from what this person started
 * editing. `show` turns a value into words (a date, a label); empty values read "(empty)".
 */
export function changedFields<T extends object>(
  started: T,
  theirs: T,
  labels: Partial<Record<keyof T & string, string>>,
  show: (field: keyof T & string, value: unknown) => string = (_f, v) => String(v),
): FieldChange[] {
  return (Object.keys(labels) as (keyof T & string)[])
    .filter((f) => JSON.stringify(started[f] ?? null) !== JSON.stringify(theirs[f] ?? null))
    .map((f) => {
      const v = theirs[f];
      return { field: f, label: labels[f] ?? f, value: v === null || v === undefined || v === '' ? '(empty)' : show(f, v) };
    });
}

/**
 * Shown above a form whose save was refused because someone else saved first. What the person
 * typed stays in the form; this lists what the other person saved, and the next save goes over
 * theirs on purpose — or the person takes the saved version instead.
 */
export function TheirChangesNotice({ what, changes, savedAt, onTakeTheirs }: { what: string; changes: FieldChange[]; savedAt?: string; onTakeTheirs: () => void }) {
  return (
    <Notice tone="problem" title={`Someone else changed this ${what} while you were editing`}>
      <p>Your changes are still in the form below and have not been saved.</p>
      {changes.length > 0 ? (
        <>
          <p className="mt-1">What they saved{savedAt ? ` (at ${formatDateTime(savedAt)})` : ''}:</p>
          <ul className="mt-1 list-disc pl-5" data-testid="their-changes">
            {changes.map((d) => (
              <li key={d.field}>
                {d.label}: <strong>{d.value}</strong>
              </li>
            ))}
          </ul>
        </>
      ) : (
        <p className="mt-1">Their save did not change the fields in this form.</p>
      )}
      <p className="mt-1">Save again to put yours over theirs, or take their version and start again.</p>
      <div className="mt-2">
        <Button variant="secondary" onClick={onTakeTheirs}>
          Take their version
        </Button>
      </div>
    </Notice>
  );
}
