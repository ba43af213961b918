import { stringify } from 'csv-stringify/sync';

/**
 * Text that a spreadsheet would run as a formula (=, +, -, @, tab, carriage return at the start)
 * is written with a leading apostrophe [OWASP "CSV Injection"]. Only text cells go through this:
 * amounts are decimal strings and keep their minus sign.
 */
export function guardText(s: string | null | undefined): string {
  const v = s ?? '';
  return /^[=+\-@\t\r]/.test(v) ? `'${v}` : v;
}

export type CsvColumn<T> = { key: string; value: (row: T) => string | null; text?: boolean };

/** A CSV document with a header row of stable column names; null cells are empty. */
export function toCsv<T>(columns: CsvColumn<T>[], rows: T[]): string {
  return stringify(
    rows.map((r) => columns.map((c) => (c.text ? guardText(c.value(r)) : (c.value(r) ?? '')))),
    { header: true, columns: columns.map((c) => c.key), record_delimiter: '\r\n' },
  );
}
