import type { Page } from '@wingstage/shared';
import { useQuery, type QueryFunctionContext, type QueryKey } from '@tanstack/react-query';
import { useCombobox } from 'downshift';
import { useEffect, useId, useRef, useState, type ReactNode, type Ref } from 'react';
import { FieldHint, LabelText } from './field';

/** How many rows one search asks for: enough to scan, few enough to load fast on a phone. */
export const PICKER_PAGE_SIZE = 20;
const DEBOUNCE_MS = 250;

interface QueryShape<T> {
  queryKey: QueryKey;
  // Method syntax on purpose: it accepts a feature's queryFn typed for its own, narrower key.
  queryFn?(context: QueryFunctionContext<QueryKey>): T | Promise<T>;
}

/**
 * Where a picker's rows come from: the feature's own list query (searched with `q` on the server)
 * and, optionally, its one-record query, to show the label of a value the form opens with.
 */
export interface PickerSource<T> {
  search: (q: string) => QueryShape<Page<T>>;
  byId?: (id: string) => QueryShape<T>;
  id: (item: T) => string;
  label: (item: T) => string;
  /** A second, quieter line under the label in the list. */
  detail?: (item: T) => ReactNode;
}

export function useDebounced<V>(value: V, ms = DEBOUNCE_MS): V {
  const [settled, setSettled] = useState(value);
  useEffect(() => {
    const t = setTimeout(() => setSettled(value), ms);
    return () => clearTimeout(t);
  }, [value, ms]);
  return settled;
}

export interface SearchPickerProps<T> {
  label: string;
  source: PickerSource<T>;
  /** The chosen record's id, or null / '' for none. */
  value: string | null | undefined;
  onChange: (id: string | null, item: T | null) => void;
  onBlur?: () => void;
  /** The record behind `value` when the caller already has it (saves a request for the label). */
  selected?: T | null;
  hint?: ReactNode;
  error?: string;
  required?: boolean;
  placeholder?: string;
  name?: string;
  id?: string;
  inputRef?: Ref<HTMLInputElement>;
  disabled?: boolean;
  /** Keep the label for screen readers only (compact rows such as the estimate's add-line bar). */
  hideLabel?: boolean;
  /** Act as a one-shot "add" control: report the pick, then empty the box for the next one. */
  clearAfterPick?: boolean;
  className?: string;
  /** Replaces the label's look (e.g. the estimate's small field labels); screen readers hear the same name. */
  labelClassName?: string;
}

const controlClass =
  'block w-full min-h-tap rounded-control border border-seam-strong bg-cloth-raised py-2 pl-3 text-base text-slate placeholder:text-slate-soft aria-[invalid=true]:border-2 aria-[invalid=true]:border-fault';

/**
 * A text box that searches one list endpoint as you type and offers the first matches in a
 * listbox (ARIA combobox, keyboard and pointer handled by downshift's useCombobox).
 */
export function SearchPicker<T>({
  label,
  source,
  value,
  onChange,
  onBlur,
  selected: selectedProp,
  hint,
  error,
  required,
  placeholder,
  name,
  id: idProp,
  inputRef,
  disabled,
  hideLabel,
  clearAfterPick,
  className = '',
  labelClassName = 'text-sm font-semibold text-slate',
}: SearchPickerProps<T>) {
  const auto = useId();
  const id = idProp ?? `picker-${auto}`;
  const wanted = value || null;

  // The record behind the value: what was picked here, what the caller passed, or one look-up by id.
  const [picked, setPicked] = useState<T | null>(null);
  const known = [picked, selectedProp ?? null].find((x): x is T => x != null && wanted != null && source.id(x) === wanted) ?? null;
  const one = wanted && source.byId ? source.byId(wanted) : null;
  const lookup = useQuery<T | null>({
    queryKey: one?.queryKey ?? ['picker-none'],
    queryFn: (ctx) => (one?.queryFn ? one.queryFn(ctx) : null),
    enabled: Boolean(one && !known),
  });
  const selectedItem: T | null = clearAfterPick ? null : (known ?? (wanted && lookup.data ? (lookup.data as T) : null));
  const selectedLabel = selectedItem ? source.label(selectedItem) : '';

  const [inputValue, setInputValue] = useState(selectedLabel);
  const [typed, setTyped] = useState(false);
  // Follow a label that arrives late (the look-up) or a value reset from outside, unless the person is typing.
  const lastLabel = useRef(selectedLabel);
  useEffect(() => {
    if (lastLabel.current !== selectedLabel && !typed) setInputValue(selectedLabel);
    lastLabel.current = selectedLabel;
  }, [selectedLabel, typed]);

  const [open, setOpen] = useState(false);
  // While the box shows the chosen label, search everything; once someone types, search what they typed.
  const q = useDebounced(typed ? inputValue.trim() : '');
  const search = source.search(q);
  const results = useQuery({ queryKey: search.queryKey, queryFn: search.queryFn, enabled: open && !disabled, placeholderData: (prev) => prev });
  const items = results.data?.items ?? [];
  const total = results.data?.total ?? 0;
  const settled = results.isFetched && !results.isPlaceholderData && q === (typed ? inputValue.trim() : '');

  const { isOpen, highlightedIndex, getLabelProps, getInputProps, getMenuProps, getItemProps, getToggleButtonProps } = useCombobox<T>({
    id,
    inputId: id,
    items,
    itemToString: (item) => (item ? source.label(item) : ''),
    itemToKey: (item) => (item ? source.id(item) : null),
    selectedItem,
    inputValue,
    isOpen: open,
    onIsOpenChange: ({ isOpen: next }) => {
      setOpen(Boolean(next));
      // Closing without a pick puts the chosen label back, so the box never shows a search that was not picked.
      if (!next) {
        setTyped(false);
        setInputValue(selectedLabel);
      }
    },
    onInputValueChange: ({ inputValue: next, type }) => {
      if (type === useCombobox.stateChangeTypes.InputChange) {
        setTyped(true);
        setInputValue(next ?? '');
      }
    },
    onSelectedItemChange: ({ selectedItem: item }) => {
      if (!item) return;
      setTyped(false);
      if (clearAfterPick) {
        setInputValue('');
      } else {
        setPicked(item);
        setInputValue(source.label(item));
      }
      onChange(source.id(item), item);
    },
    stateReducer: (_state, { type, changes }) => {
      // A blur never picks for the person: only Enter, a tap or a click does.
      if (type === useCombobox.stateChangeTypes.InputBlur) return { ...changes, selectedItem: _state.selectedItem };
      return changes;
    },
  });

  const clearable = !required && !clearAfterPick && Boolean(wanted) && !disabled;
  const describedBy = [hint ? `${id}-hint` : '', error ? `${id}-error` : ''].filter(Boolean).join(' ') || undefined;
  const busy = open && results.isFetching;
  let status = '';
  if (isOpen && settled) {
    if (results.isError) status = 'The list could not be loaded. Try again.';
    else if (items.length === 0) status = 'No matches';
    else if (total > items.length) status = `Showing the first ${items.length} — type more to narrow`;
  }

  return (
    <div className={`relative flex flex-col gap-1 ${className}`}>
      <label {...getLabelProps()} className={hideLabel ? 'sr-only' : labelClassName}>
        <LabelText label={label} required={required} />
      </label>
      <FieldHint id={id} hint={hint} />
      <div className="relative">
        <input
          {...getInputProps({
            ref: inputRef,
            name,
            disabled,
            placeholder,
            onBlur: () => onBlur?.(),
            onFocus: (e) => e.currentTarget.select(),
            'aria-invalid': error ? true : undefined,
            'aria-describedby': describedBy,
            'aria-required': required || undefined,
            'aria-busy': busy || undefined,
          } as Parameters<typeof getInputProps>[0])}
          autoComplete="off"
          // Room on the right for the 44 px buttons drawn over the box, so text never runs under them.
          className={`${controlClass} ${clearable ? 'pr-24' : 'pr-12'}`}
        />
        <div className="absolute inset-y-0 right-0 flex items-center">
          {clearable ? (
            <button
              type="button"
              className="flex size-tap items-center justify-center text-slate-soft hover:text-slate"
              aria-label={`Clear ${label.toLowerCase()}`}
              onClick={() => {
                setPicked(null);
                setTyped(false);
                setInputValue('');
                onChange(null, null);
              }}
            >
              <span aria-hidden="true">×</span>
            </button>
          ) : null}
          <button
            type="button"
            {...getToggleButtonProps({ disabled })}
            aria-label={isOpen ? `Close the list of ${label.toLowerCase()}` : `Show the list of ${label.toLowerCase()}`}
            className="flex size-tap items-center justify-center text-slate"
          >
            <span aria-hidden="true">{isOpen ? '▴' : '▾'}</span>
          </button>
        </div>
      </div>
      <div
        className={
          isOpen
            ? 'absolute left-0 right-0 top-full z-30 mt-1 max-h-[min(22rem,60vh)] overflow-auto sm:min-w-96 rounded-control border border-seam-strong bg-cloth-raised shadow-lg'
            : 'hidden'
        }
      >
        <ul {...getMenuProps()} className="flex flex-col">
          {isOpen
            ? items.map((item, index) => {
                const chosen = selectedItem != null && source.id(selectedItem) === source.id(item);
                return (
                  <li
                    key={source.id(item)}
                    {...getItemProps({ item, index })}
                    className={`flex min-h-tap cursor-pointer flex-col justify-center border-b border-seam px-3 py-1.5 text-left last:border-b-0 ${
                      highlightedIndex === index ? 'bg-cloth-sunk outline-2 -outline-offset-2 outline-harbour' : ''
                    }`}
                  >
                    <span className={chosen ? 'font-semibold' : ''}>
                      {chosen ? <span aria-hidden="true">✓ </span> : null}
                      {source.label(item)}
                    </span>
                    {source.detail ? <span className="text-xs text-slate-soft">{source.detail(item)}</span> : null}
                  </li>
                );
              })
            : null}
        </ul>
        {isOpen && !settled && items.length === 0 ? <p className="px-3 py-2 text-sm text-slate-soft">Searching…</p> : null}
        {/* Pinned to the bottom of the open list, so "type more" shows without scrolling through it. */}
        {status ? (
          <p aria-hidden="true" className="sticky bottom-0 border-t border-seam-strong bg-cloth-sunk px-3 py-2 text-sm font-semibold text-slate">
            {status}
          </p>
        ) : null}
      </div>
      {/* Announced once the results settle, for people who cannot see the list change. */}
      <p role="status" className="sr-only">
        {status}
      </p>
      {error ? (
        <p id={`${id}-error`} className="flex items-start gap-1 text-sm font-semibold text-fault" role="alert">
          <span aria-hidden="true">▲</span>
          {error}
        </p>
      ) : null}
    </div>
  );
}
