import { config, z } from 'zod';

/**
 * Messages for people. zod's own defaults ("Too big: expected string to have <=300 characters",
 * "Invalid UUID") leak how the program is built; every check without its own message falls back
 * to these, which say what to do in plain words. A schema's own message always wins.
 */
config({
  customError: (iss) => {
    switch (iss.code) {
      case 'too_big':
        if (iss.origin === 'string') return `This is too long: keep it to ${String(iss.maximum)} characters or fewer.`;
        if (iss.origin === 'array' || iss.origin === 'set') return `There are too many here: at most ${String(iss.maximum)}.`;
        return `This is too large: at most ${String(iss.maximum)}.`;
      case 'too_small':
        if (iss.origin === 'string') return Number(iss.minimum) <= 1 ? 'This cannot be left empty.' : `This needs at least ${String(iss.minimum)} characters.`;
        if (iss.origin === 'array' || iss.origin === 'set') return Number(iss.minimum) <= 1 ? 'Add at least one.' : `Add at least ${String(iss.minimum)}.`;
        return `This is too small: at least ${String(iss.minimum)}.`;
      case 'invalid_type':
        if (iss.input === undefined || iss.input === null) return 'This is required.';
        return iss.expected === 'number' ? 'Enter a number.' : iss.expected === 'boolean' ? 'Choose yes or no.' : 'This is not in the expected form.';
      case 'invalid_format':
        if (iss.format === 'uuid' || iss.format === 'guid') return 'Choose one from the list.';
        if (iss.format === 'email') return 'Enter a valid e-mail address.';
        if (iss.format === 'date') return 'Use a date like 2026-12-01.';
        return 'This is not in the expected form.';
      case 'invalid_value':
        return 'Choose one of the options offered.';
      case 'unrecognized_keys':
        return 'Some of what was sent is not expected here.';
      default:
        return undefined;
    }
  },
});

/** An id picked from a list: the person never types one, so the message says to choose. */
export const idSchema = z.uuid({ message: 'Choose one from the list.' });
export const idParamsSchema = z.object({ id: idSchema });

/**
 * Control characters other than tab, line feed and carriage return (C0, DEL and C1). PostgreSQL
 * refuses NUL outright and JSONB refuses it even escaped; the rest are invisible and only confuse.
 */
// eslint-disable-next-line no-control-regex -- matching control characters is the point of this pattern
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
 * A non-negative decimal written as a string, with at most `dp` decimals: never a float. Each way
 * it can be wrong gets its own message (empty, negative, not a number, too many decimals, too big),
 * so a person who typed -3 reads "cannot be negative", not a rule about decimals. Every refusal
 * aborts, so refinements that read the value as a number only ever see a well-formed one.
 */
export const decimalString = (dp: number, label = 'Value') =>
  z
    .string({ message: `Enter ${label.toLowerCase()} as a number.` })
    .trim()
    .superRefine((v, ctx) => {
      const say = (message: string) => ctx.addIssue({ code: 'custom', message, continue: false });
      if (v === '') return say(`Enter ${label.toLowerCase()} as a number.`);
      if (/^-\s*\d/.test(v)) return say(`${label} cannot be negative.`);
      if (!/^\d+(\.\d+)?$/.test(v)) return say(dp === 0 ? `${label} must be a whole number, e.g. 3.` : `${label} must be a number, e.g. 2.5.`);
      const [whole = '', frac = ''] = v.split('.');
      if (whole.replace(/^0+(?=\d)/, '').length > 12) return say(`${label} is far larger than anything Wingstage can store.`);
      if (dp === 0 && frac !== '') return say(`${label} must be a whole number, e.g. 3.`);
      if (frac.length > dp) return say(`${label} can have at most ${dp === 1 ? 'one decimal place' : `${dp} decimal places`}.`);
      return undefined;
    });

/** The longest text each kind of box takes; the schemas and the forms' counters read the same numbers. */
export const TEXT_MAX = {
  address: 300,
  notes: 2000,
  jobNotes: 4000,
  reason: 500,
  seen: 4000,
  remedy: 1000,
  templateDescription: 2000,
  ownerMessage: 1000,
} as const;

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
