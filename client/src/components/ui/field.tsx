import { forwardRef, useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from 'react';

const control =
  'block w-full rounded-control border border-seam-strong bg-cloth-raised px-3 py-2 text-base text-slate min-h-11 placeholder:text-slate-soft aria-[invalid=true]:border-2 aria-[invalid=true]:border-ember';

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
        <p id={`${id}-error`} className="flex items-start gap-1 text-sm font-semibold text-ember" role="alert">
          <span aria-hidden="true">▲</span>
          {error}
        </p>
      ) : null}
    </div>
  );
}

function describedBy(id: string, hint?: ReactNode, error?: string): string | undefined {
  const ids = [hint ? `${id}-hint` : '', error ? `${id}-error` : ''].filter(Boolean).join(' ');
  return ids || undefined;
}

/** What every control carries: its id, whether it is in error, and the hint and error that describe it. */
function controlAria(id: string, hint: ReactNode, error: string | undefined, required: boolean | undefined) {
  return { id, 'aria-invalid': error ? true : undefined, 'aria-describedby': describedBy(id, hint, error), 'aria-required': required || undefined };
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

export const TextAreaField = forwardRef<HTMLTextAreaElement, TextareaHTMLAttributes<HTMLTextAreaElement> & Common>(function TextAreaField(
  { label, hint, error, id: idProp, className = '', required, ...rest },
  ref,
) {
  const auto = useId();
  const id = idProp ?? auto;
  return (
    <FieldShell id={id} label={label} hint={hint} error={error} required={required}>
      <textarea
        ref={ref}
        rows={4}
        {...controlAria(id, hint, error, required)}
        className={`${control} ${className}`}
        {...rest}
      />
    </FieldShell>
  );
});
