import { FINDING_CATEGORIES, FINDING_CATEGORY_LABELS, FINDING_CATEGORY_MEANINGS, type FindingCategory } from '@wingstage/shared';
import { forwardRef, useId, type InputHTMLAttributes } from 'react';
import { CATEGORY_LOOK } from '@/components/ui/finding-badges';

/**
 * Three large choices, each with its word, its icon and what it means for the owner. The choice is
 * marked by a thick border and a tick, never by colour; the warm tint belongs to airworthiness.
 */
export const CategoryChoice = forwardRef<HTMLInputElement, Omit<InputHTMLAttributes<HTMLInputElement>, 'type'> & { value?: FindingCategory; error?: string; current?: FindingCategory | null }>(
  function CategoryChoice({ error, current, name, ...rest }, ref) {
    const errId = useId();
    return (
      <fieldset aria-describedby={error ? errId : undefined} className="flex flex-col gap-2">
        <legend className="mb-1 text-sm font-semibold">
          Category <span className="font-normal text-slate-soft" aria-hidden="true">(required)</span>
        </legend>
        <div className="grid gap-2 sm:grid-cols-3">
          {FINDING_CATEGORIES.map((c) => {
            const { Icon } = CATEGORY_LOOK[c];
            const chosen = current === c;
            return (
              <label
                key={c}
                data-category={c}
                className={`relative flex min-h-tap cursor-pointer flex-col gap-1 rounded-card border bg-cloth-raised p-3 has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-harbour ${
                  chosen ? 'border-[3px] border-slate' : 'border border-seam-strong'
                } ${c === 'airworthiness' ? 'bg-ember-tint' : ''}`}
              >
                <input ref={ref} type="radio" name={name} value={c} className="sr-only" {...rest} />
                <span className={`flex items-center gap-2 text-lg font-semibold ${c === 'airworthiness' ? 'text-ember' : ''}`}>
                  <Icon size={22} />
                  {FINDING_CATEGORY_LABELS[c]}
                  {chosen ? (
                    <span className="ml-auto text-base text-slate" aria-hidden="true">
                      ✓
                    </span>
                  ) : null}
                </span>
                <span className="text-sm text-slate">{FINDING_CATEGORY_MEANINGS[c]}</span>
              </label>
            );
          })}
        </div>
        {error ? (
          <p id={errId} role="alert" className="text-sm font-semibold text-fault">
            <span aria-hidden="true">▲ </span>
            {error}
          </p>
        ) : null}
      </fieldset>
    );
  },
);
