import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { isApiError } from './api-client';

/**
 * Puts the server's field errors next to the matching fields and returns the message for the
 * form's summary. Field paths the form does not show are folded into the summary so nothing is lost.
 */
export function applyServerErrors<T extends FieldValues>(err: unknown, setError: UseFormSetError<T>, fieldNames: readonly string[]): string {
  if (!isApiError(err)) return 'Something went wrong. Please try again.';
  const stray: string[] = [];
  for (const [path, message] of Object.entries(err.fields)) {
    if (fieldNames.includes(path)) setError(path as Path<T>, { type: 'server', message });
    else stray.push(message);
  }
  return [err.message, ...stray].join(' ');
}

/**
 * Wraps a form's submit action: clears the summary, runs the action, and on failure either lets
 * `handle` deal with the error (return true when it did) or puts the server's field errors next
 * to the fields and the rest in the summary. Use as `handleSubmit(withServerErrors(…))`.
 */
export function withServerErrors<T extends FieldValues, V>(
  setError: UseFormSetError<T>,
  setSummary: (message: string | null) => void,
  fieldNames: readonly string[],
  action: (values: V) => Promise<unknown>,
  handle?: (err: unknown) => boolean,
): (values: V) => Promise<void> {
  return async (values) => {
    setSummary(null);
    try {
      await action(values);
    } catch (err) {
      if (handle?.(err)) return;
      setSummary(applyServerErrors(err, setError, fieldNames));
    }
  };
}
