import { z } from 'zod';

export const idSchema = z.uuid({ message: 'Must be a valid id.' });
export const idParamsSchema = z.object({ id: idSchema });

/**
 * Control characters other than tab, line feed and carriage return (C0, DEL and C1). PostgreSQL
 * refuses NUL outright and JSONB refuses it even escaped; the rest are invisible and only confuse.
 */
const CONTROL_CHARACTER = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F-\u009F]/;
/** Half of a surrogate pair: not a character at all, and refused by JSONB (a text column would silently change it). */
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

export const hasControlCharacter = (s: string): boolean => CONTROL_CHARACTER.test(s);
export const hasLoneSurrogate = (s: string): boolean => LONE_SURROGATE.test(s);

/**
 * The base of every text field in a request: a string without invisible control characters
 * (tab and new lines are fine) and without broken halves of a character. Both checks abort, so no
 * later check or refinement ever sees such a value. Not trimmed here (passwords keep their spaces).
 */
export const safeString = (label: string) =>
  z
    .string()
    .refine((s) => !hasControlCharacter(s), {
      message: `${label}: remove the invisible control character (it often comes with pasted text).`,
      abort: true,
    })
    .refine((s) => !hasLoneSurrogate(s), {
      message: `${label}: a character is broken (half of an emoji or symbol); type it again.`,
      abort: true,
    });

/**
 * A non-negative decimal written as a string, with at most `dp` decimals: never a float. The format
 * check aborts, so refinements that read the value as a number only ever see a well-formed one.
 */
export const decimalString = (dp: number, label = 'Value') =>
  z
    .string()
    .trim()
    .regex(dp === 0 ? /^\d{1,12}$/ : new RegExp(`^\\d{1,12}(\\.\\d{1,${dp}})?$`), {
      message: dp === 0 ? `${label} must be a whole number.` : `${label} must be a number with at most ${dp === 1 ? 'one decimal' : `${dp} decimals`}.`,
      abort: true,
    });

export const isoDate = z.iso.date({ message: 'Use a date like 2026-12-01.' });

const trimmed = (min: number, max: number, label: string) =>
  safeString(label)
    .trim()
    .min(min, { message: min <= 1 ? `${label} is required.` : `${label} needs at least ${min} characters.` })
    .max(max, { message: `${label} must be at most ${max} characters.` });
export const requiredText = trimmed;
export const optionalText = (max: number, label: string) =>
  safeString(label).trim().max(max, { message: `${label} must be at most ${max} characters.` }).optional().default('');

/** A short code or name without a "required" message of its own (labour rate codes, sort keys). */
export const shortText = (max: number, label: string) => safeString(label).trim().max(max, { message: `${label} must be at most ${max} characters.` });

export const emailSchema = z
  .string()
  .trim()
  .toLowerCase()
  .max(254, { message: 'E-mail must be at most 254 characters.' })
  .pipe(z.email({ message: 'Enter a valid e-mail address.' }));

/** `ids=a,b,c` on a list: fetch these records (at most 100), e.g. the parts one finding names. */
export const idListParam = z
  .string()
  .transform((v) => v.split(',').map((s) => s.trim()).filter(Boolean))
  .pipe(z.array(idSchema, { message: 'ids is a comma-separated list of ids.' }).min(1).max(100, { message: 'Ask for at most 100 ids at once.' }));

/** Shared list query for tables that search, sort and page on the server. */
export const listQuerySchema = z.object({
  q: shortText(100, 'Search').optional().default(''),
  sort: shortText(40, 'Sort').optional(),
  dir: z.enum(['asc', 'desc']).optional().default('asc'),
  page: z.coerce.number().int().min(1).max(100000).optional().default(1),
  pageSize: z.coerce.number().int().min(1).max(100).optional().default(20),
});
export type ListQuery = z.output<typeof listQuerySchema>;

export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
}

type PatchShape<T extends z.ZodRawShape> = {
  [K in keyof T]: z.ZodOptional<T[K] extends z.ZodDefault<infer Inner extends z.ZodType> ? Inner : T[K]>;
};

/**
 * The PATCH form of a create schema: every field optional and no defaults. zod 4's `.partial()`
 * keeps a field's `.default()`, so a PATCH that sends one field would reset the others; this
 * strips the defaults so absent keys stay absent.
 */
export function patchOf<T extends z.ZodRawShape>(schema: z.ZodObject<T>): z.ZodObject<PatchShape<T>> {
  const shape = Object.fromEntries(
    Object.entries(schema.shape).map(([k, field]) => {
      const f = field as z.ZodType;
      return [k, (f instanceof z.ZodDefault ? (f.unwrap() as z.ZodType) : f).optional()];
    }),
  );
  return z.object(shape) as unknown as z.ZodObject<PatchShape<T>>;
}
