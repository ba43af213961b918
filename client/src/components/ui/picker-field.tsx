import { useController, type Control, type FieldPath, type FieldValues } from 'react-hook-form';
import { SearchPicker, type SearchPickerProps } from './search-picker';

type Passed<T> = Omit<SearchPickerProps<T>, 'value' | 'onChange' | 'onBlur' | 'inputRef' | 'name' | 'error'>;

/**
 * A SearchPicker bound to one react-hook-form field: the field holds the record's id (or
 * `empty` for none) and the form's error for it shows under the box.
 */
export function PickerField<T, F extends FieldValues>({
  control,
  name,
  empty = '',
  error,
  onPick,
  ...picker
}: Passed<T> & {
  control: Control<F>;
  name: FieldPath<F>;
  /** What the field holds when nothing is chosen ('' or null, whatever the schema expects). */
  empty?: '' | null;
  /** Replaces the schema's message (e.g. a friendlier "Choose the aircraft."). */
  error?: string;
  /** Told of each pick, with the whole record (e.g. to fill other fields from it). */
  onPick?: (item: T | null) => void;
}) {
  const { field, fieldState } = useController({ control, name });
  const message = fieldState.error ? (error ?? fieldState.error.message) : undefined;
  return (
    <SearchPicker<T>
      {...picker}
      name={field.name}
      inputRef={field.ref}
      value={(field.value as string | null | undefined) ?? null}
      onBlur={field.onBlur}
      error={message}
      onChange={(id, item) => {
        field.onChange(id ?? empty);
        onPick?.(item);
      }}
    />
  );
}
