import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import * as shared from '../src/index.js';
import { hasControlCharacter, hasLoneSurrogate } from '../src/index.js';

/**
 * Every zod schema the shared package exports, fed arbitrary and hostile input: parsing never
 * throws (a throw inside a refinement reaches the server as a 500), and whatever a schema accepts
 * carries no control character and no broken half of a character into the database.
 */
const schemas: [string, z.ZodType][] = Object.entries(shared as Record<string, unknown>).filter((e): e is [string, z.ZodType] => e[1] instanceof z.ZodType);

/** The keys an object schema reads, looking through pipes and refinements. */
function keysOf(s: z.ZodType): string[] {
  const def = (s as unknown as { def: { type: string; in?: z.ZodType; innerType?: z.ZodType; shape?: Record<string, unknown> } }).def;
  if (def.type === 'object' && def.shape) return Object.keys(def.shape);
  if (def.type === 'pipe' && def.in) return keysOf(def.in);
  if (def.innerType) return keysOf(def.innerType);
  return [];
}

const uuid = fc.uuid({ version: 4 });
/** Strings a hostile or careless client sends: control characters, lone surrogates, numbers that are not, and very long ones. */
export const nastyString = fc.oneof(
  fc.string(),
  fc.string({ unit: 'binary' }),
  fc.constantFrom('\u0000', 'a\u0000b', '\ud800', 'x\udc00y', '\u001b[31m', '\u007f', '\u0085', 'abc', '1e999', 'NaN', '-1', '12.345', ' 7 ', '0x10', '١٢', '', ' '),
  fc.string({ minLength: 300, maxLength: 5000 }),
  uuid,
);
const nastyValue: fc.Arbitrary<unknown> = fc.oneof(
  nastyString,
  fc.integer(),
  fc.double(),
  fc.boolean(),
  fc.constant(null),
  fc.array(nastyString, { maxLength: 3 }),
  fc.dictionary(fc.string({ maxLength: 8 }), nastyString, { maxKeys: 3 }),
);

function badText(v: unknown): boolean {
  if (typeof v === 'string') return hasControlCharacter(v.replace(/[\t\n\r]/g, '')) || hasLoneSurrogate(v);
  if (Array.isArray(v)) return v.some(badText);
  if (v && typeof v === 'object') return Object.values(v).some(badText);
  return false;
}

describe('shared schemas under fuzzing', () => {
  it('when the shared package is searched for schemas, then it finds the request schemas', () => {
    expect(schemas.length).toBeGreaterThan(25);
    expect(schemas.map(([n]) => n)).toEqual(expect.arrayContaining(['estimateSaveSchema', 'decisionSubmitSchema', 'timeLogCreateSchema', 'jobUpdateSchema']));
  });

  it.each(schemas)('when %s is given any JSON value, then parsing never throws', (_name, schema) => {
    fc.assert(
      fc.property(fc.jsonValue(), (v) => {
        expect(() => schema.safeParse(v)).not.toThrow();
      }),
      { numRuns: 60 },
    );
  });

  it.each(schemas.filter(([, s]) => keysOf(s).length > 0))(
    'when %s gets hostile values in its own fields, then parsing never throws and nothing accepted carries a control or broken character',
    (_name, schema) => {
      const keys = keysOf(schema);
      fc.assert(
        fc.property(fc.dictionary(fc.constantFrom(...keys), nastyValue, { maxKeys: keys.length }), (v) => {
          const r = schema.safeParse(v);
          if (r.success) expect(badText(r.data)).toBe(false);
        }),
        { numRuns: 120 },
      );
    },
  );

  it('when a non-numeric hours or discount arrives, then it is refused as a format error, not thrown', () => {
    const time = shared.timeLogCreateSchema.safeParse({ hours: 'abc', workedOn: '2026-12-01' });
    expect(time.success).toBe(false);
    expect(time.error!.issues.map((i) => i.message)).toEqual(['Hours must be a number, e.g. 2.5.']);
    const line = shared.estimateLineSchema.safeParse({ id: '0b6f3c1e-2d4a-4f5b-9c8d-7e6f5a4b3c2d', stage: 'inspection', kind: 'fee', description: 'Fee', amount: '10', discountPercent: 'lots' });
    expect(line.success).toBe(false);
    expect(line.error!.issues.map((i) => i.message)).toEqual(['Discount must be a number, e.g. 2.5.']);
  });

  it('when text carries a NUL, an escape character or half an emoji, then it is refused in plain words; tabs and new lines pass', () => {
    const withNul = shared.jobUpdateSchema.safeParse({ version: 0, notes: 'Hangar\u0000 3' });
    expect(withNul.error!.issues[0]!.message).toBe('Notes: remove the invisible control character (it often comes with pasted text).');
    const half = shared.decisionSubmitSchema.safeParse({ snapshotHash: 'a'.repeat(64), decisions: [{ itemId: '0b6f3c1e-2d4a-4f5b-9c8d-7e6f5a4b3c2d', decision: 'approve' }], typedName: 'Ann \ud83d' });
    expect(half.error!.issues[0]!.message).toBe('Your name: a character is broken (half of an emoji or symbol); type it again.');
    const fine = shared.jobUpdateSchema.safeParse({ version: 0, notes: 'Line one\n\tLine two 🛩️' });
    expect(fine.success).toBe(true);
  });

  it('when one estimate save lists the same access task twice, then it is refused', () => {
    const id = '0b6f3c1e-2d4a-4f5b-9c8d-7e6f5a4b3c2d';
    const task = { id, name: 'Cowling off', hours: '1', ratePerHour: '60' };
    const r = shared.estimateSaveSchema.safeParse({ version: 0, lines: [], accessTasks: [task, { ...task, name: 'Again' }] });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0]).toMatchObject({ path: ['accessTasks', 1, 'id'], message: 'Each access task needs its own id; this one is listed twice.' });
  });
});
