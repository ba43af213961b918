import type { ReactNode } from 'react';
import { FaultIcon, InfoIcon } from './icons';

export function Notice({ tone = 'info', title, children }: { tone?: 'info' | 'problem'; title?: string; children?: ReactNode }) {
  const problem = tone === 'problem';
  return (
    <div
      role={problem ? 'alert' : 'status'}
      className={`flex gap-3 rounded-card border p-3 text-sm ${problem ? 'border-fault bg-fault-tint text-slate' : 'border-harbour bg-harbour-tint text-slate'}`}
    >
      <span className={problem ? 'text-fault' : 'text-harbour-deep'}>{problem ? <FaultIcon /> : <InfoIcon />}</span>
      <div className="flex flex-col gap-1">
        {title ? <p className="font-semibold">{title}</p> : null}
        {children}
      </div>
    </div>
  );
}

/** A summary at the top of a form: the server's message plus each field still in error. */
export function FormErrorSummary({ message, errors, labels }: { message?: string | null; errors: object; labels: Record<string, string> }) {
  const entries = Object.entries(errors)
    .map(([k, v]) => [k, (v as { message?: unknown } | undefined)?.message] as const)
    .filter((e): e is readonly [string, string] => typeof e[1] === 'string' && e[1].length > 0);
  if (!message && entries.length === 0) return null;
  return (
    <Notice tone="problem" title={message ?? 'Please check the highlighted fields.'}>
      {entries.length > 0 ? (
        <ul className="list-disc pl-5">
          {entries.map(([k, m]) => (
            <li key={k}>
              <span className="font-semibold">{labels[k] ?? k}:</span> {m}
            </li>
          ))}
        </ul>
      ) : null}
    </Notice>
  );
}

export function Loading({ label = 'Loading…' }: { label?: string }) {
  return (
    <p role="status" className="flex items-center gap-2 py-6 text-slate-soft">
      <span className="inline-block size-4 animate-spin rounded-full border-2 border-current border-r-transparent" aria-hidden="true" />
      {label}
    </p>
  );
}

export function Caution({ children }: { children?: ReactNode }) {
  return (
    <aside aria-label="Caution" className="mt-8 border-t border-seam pt-3 text-xs text-slate-soft">
      {children ??
        "Maintenance follows the manufacturer's current data and the authority's rules; only the licensed inspector certifies the aircraft."}
    </aside>
  );
}
