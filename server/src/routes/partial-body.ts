/**
 * The update schemas are `create.partial()`, and zod still fills the create defaults for absent
 * keys; a PATCH must change only what was sent, so keep just the keys present in the raw body.
 */
export function onlySent<T extends object>(parsed: T, raw: unknown): Partial<T> {
  const sent = raw && typeof raw === 'object' ? new Set(Object.keys(raw)) : new Set<string>();
  return Object.fromEntries(Object.entries(parsed).filter(([k]) => sent.has(k))) as Partial<T>;
}
