/**
 * A timestamptz written as Date#toISOString writes it: UTC, milliseconds, "Z". to_char's MS drops the
 * microseconds as a JS Date made from the same value does, so an answer built in SQL reads the same
 * as one built from a model row.
 */
export function isoTimestampSql(expr: string): string {
  return `to_char((${expr}) AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"')`;
}
