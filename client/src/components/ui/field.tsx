import { forwardRef, useCallback, useEffect, useId, useRef, useState, type ForwardedRef, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from 'react';
import { FaultIcon } from './icons';

const control =
  'block w-full rounded-control border border-seam-strong bg-cloth-raised px-3 py-2 text-base text-slate min-h-11 placeholder:text-slate-soft aria-[invalid=true]:border-2 aria-[invalid=true]:border-fault';

interface FieldShellProps {
  id: string;
  label: string;
  hint?: ReactNode;
  error?: string;
  required?: boolean;
  children: ReactNode;
}

/**
 * A label's words with "(required)" shown after them. Screen readers hear "required" from
 * aria-required on the control, so the label's name stays plain.
 */
export function LabelText({ label, required }: { label: string; required?: boolean }) {
  return (
    <>
      {label}
      {required ? (
        <span aria-hidden="true" className="font-normal text-slate-soft">
          {' '}
          (required)
        </span>
      ) : null}
    </>
  );
}

/** The hint under a label, referenced by the control's aria-describedby as `${id}-hint`. */
export function FieldHint({ id, hint }: { id: string; hint?: ReactNode }) {
  return hint ? (
    <p id={`${id}-hint`} className="text-xs text-slate-soft">
      {hint}
    </p>
  ) : null;
}

function FieldShell({ id, label, hint, error, required, children }: FieldShellProps) {
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-semibold text-slate">
        <LabelText label={label} required={required} />
      </label>
      <FieldHint id={id} hint={hint} />
      {children}
      {error ? (
        <p id={`${id}-error`} className="flex items-start gap-1 text-sm font-semibold text-fault" role="alert">
          <span className="mt-0.5 shrink-0">
            <FaultIcon size={16} />
          </span>
          {error}
        </p>
      ) : null}
    </div>
  );
}

function describedBy(id: string, hint?: ReactNode, error?: string, counter = false): string | undefined {
  const ids = [hint ? `${id}-hint` : '', error ? `${id}-error` : '', counter ? `${id}-count` : ''].filter(Boolean).join(' ');
  return ids || undefined;
}

/** What every control carries: its id, whether it is in error, and the hint and error that describe it. */
function controlAria(id: string, hint: ReactNode, error: string | undefined, required: boolean | undefined, counter = false) {
  return { id, 'aria-invalid': error ? true : undefined, 'aria-describedby': describedBy(id, hint, error, counter), 'aria-required': required || undefined };
}

type Common = { label: string; hint?: ReactNode; error?: string };

export const TextField = forwardRef<HTMLInputElement, InputHTMLAttributes<HTMLInputElement> & Common>(function TextField(
  { label, hint, error, id: idProp, className = '', required, ...rest },
  ref,
) {
  const auto = useId();
  const id = idProp ?? auto;
  return (
    <FieldShell id={id} label={label} hint={hint} error={error} required={required}>
      <input
        ref={ref}
        {...controlAria(id, hint, error, required)}
        className={`${control} ${className}`}
        {...rest}
      />
    </FieldShell>
  );
});

export const SelectField = forwardRef<HTMLSelectElement, SelectHTMLAttributes<HTMLSelectElement> & Common>(function SelectField(
  { label, hint, error, id: idProp, className = '', children, required, ...rest },
  ref,
) {
  const auto = useId();
  const id = idProp ?? auto;
  return (
    <FieldShell id={id} label={label} hint={hint} error={error} required={required}>
      <select
        ref={ref}
        {...controlAria(id, hint, error, required)}
        className={`${control} ${className}`}
        {...rest}
      >
        {children}
      </select>
    </FieldShell>
  );
});

function assignRef<T>(ref: ForwardedRef<T>, el: T | null): void {
  if (typeof ref === 'function') ref(el);
  else if (ref) ref.current = el;
}

/**
 * "120 of 4,000 characters": shown under a long text box so the limit is known before it is
 * reached; past the limit it says by how much (the schema's message says the rest on saving).
 */
export function CharacterCount({ id, count, max }: { id: string; count: number; max: number }) {
  const over = count - max;
  return (
    <p id={`${id}-count`} data-counter className={`text-xs tabular-nums ${over > 0 ? 'font-semibold text-fault' : 'text-slate-soft'}`} aria-live={over > 0 ? 'polite' : 'off'}>
      {over > 0 ? `${over.toLocaleString('en-GB')} characters over the ${max.toLocaleString('en-GB')} that fit` : `${count.toLocaleString('en-GB')} of ${max.toLocaleString('en-GB')} characters`}
    </p>
  );
}

export const TextAreaField = forwardRef<HTMLTextAreaElement, TextareaHTMLAttributes<HTMLTextAreaElement> & Common & { maxChars?: number }>(function TextAreaField(
  { label, hint, error, id: idProp, className = '', required, maxChars, onInput, ...rest },
  ref,
) {
  const auto = useId();
  const id = idProp ?? auto;
  const inner = useRef<HTMLTextAreaElement | null>(null);
  const [count, setCount] = useState(0);
  const setRefs = useCallback(
    (el: HTMLTextAreaElement | null) => {
      inner.current = el;
      assignRef(ref, el);
    },
    [ref],
  );
  // Forms set the value through the ref (and on reset), not only by typing: read it after each render.
  useEffect(() => {
    const n = inner.current?.value.length ?? 0;
    setCount((c) => (c === n ? c : n));
  });
  return (
    <FieldShell id={id} label={label} hint={hint} error={error} required={required}>
      <textarea
        ref={setRefs}
        rows={4}
        {...controlAria(id, hint, error, required, maxChars !== undefined)}
        className={`${control} ${className}`}
        onInput={(e) => {
          setCount(e.currentTarget.value.length);
          onInput?.(e);
        }}
        {...rest}
      />
      {maxChars !== undefined ? <CharacterCount id={id} count={count} max={maxChars} /> : null}
    </FieldShell>
  );
});
