import { describe, expect, it } from 'vitest';
import {
  FINDING_CATEGORY_MEANINGS,
  FINDING_STATE_LABELS,
  JOB_STATE_LABELS,
  JOB_TRANSITION_ACTIONS,
  OWNER_FINDING_STATE_LABELS,
  OWNER_JOB_STATE_LABELS,
  PLAUSIBLE,
  aircraftCreateSchema,
  estimateSaveSchema,
  jobCreateSchema,
  largeFigures,
  templateChecklistItemSchema,
  templateCreateSchema,
  timeLogCreateSchema,
  timeLogUpdateSchema,
} from '../src/index.js';

const id = (n: number) => `0b6f3c1e-2d4a-4f5b-9c8d-${String(n).padStart(12, '0')}`;
const first = (r: { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } }, path: string) =>
  r.error?.issues.find((i) => i.path.join('.') === path)?.message;

const partLine = (quantity: string, extra: Record<string, unknown> = {}) => ({
  id: id(1),
  stage: 'inspection',
  kind: 'part',
  description: 'Split pins',
  quantity,
  unitCost: '0.40',
  ...extra,
});

describe('hours in a day', () => {
  const entry = (hours: string) => ({ hours, workedOn: '2026-12-01' });

  it('when 24 hours are logged for one day, then they are accepted; at 24.25 the message says a day has 24 hours', () => {
    expect(timeLogCreateSchema.safeParse(entry('24')).success).toBe(true);
    const r = timeLogCreateSchema.safeParse(entry('24.25'));
    expect(first(r, 'hours')).toBe('A day has 24 hours: log at most 24 hours for one day.');
  });

  it('when 99999 hours are logged, then they are refused with the same plain reason', () => {
    expect(first(timeLogCreateSchema.safeParse(entry('99999')), 'hours')).toBe('A day has 24 hours: log at most 24 hours for one day.');
  });

  it('when hours are negative, then the message says they cannot be negative, not a rule about decimals', () => {
    expect(first(timeLogCreateSchema.safeParse(entry('-3')), 'hours')).toBe('Hours cannot be negative.');
  });

  it('when hours are zero or empty, then each says so in words', () => {
    expect(first(timeLogCreateSchema.safeParse(entry('0')), 'hours')).toBe('Log more than zero hours.');
    expect(first(timeLogCreateSchema.safeParse(entry('')), 'hours')).toBe('Enter hours as a number.');
  });

  it('when an entry is corrected to more than 24 hours, then the correction is refused too', () => {
    expect(first(timeLogUpdateSchema.safeParse({ version: 0, hours: '30' }), 'hours')).toMatch(/A day has 24 hours/);
    expect(timeLogUpdateSchema.safeParse({ version: 0, hours: '7.5', note: 'Carburettor balance' }).success).toBe(true);
  });
});

describe('numbers in words', () => {
  it('when a quantity is negative, huge, not a number or has too many decimals, then each has its own message', () => {
    const q = (v: string) => first(estimateSaveSchema.safeParse({ version: 0, lines: [partLine(v)], confirmLarge: true }), 'lines.0.quantity');
    expect(q('-3')).toBe('Quantity cannot be negative.');
    expect(q('1e6')).toBe('Quantity must be a number, e.g. 2.5.');
    expect(q('1.234')).toBe('Quantity can have at most 2 decimal places.');
    expect(q('9999999999999')).toBe('Quantity is far larger than anything Wingstage can store.');
  });

  it("when a text is too long or an id is not one, then the message is in people's words, with no schema internals", () => {
    const long = jobCreateSchema.safeParse({ aircraftId: 'not-an-id', title: 'x'.repeat(161), type: 'other', bookedInOn: '2026-12-01' });
    expect(first(long, 'aircraftId')).toBe('Choose one from the list.');
    expect(first(long, 'title')).toBe('This is too long: keep it to 160 characters or fewer.');
    const item = templateChecklistItemSchema.safeParse({ text: 'y'.repeat(301) });
    expect(first(item, 'text')).toBe('Keep the check to 300 characters or fewer.');
    for (const r of [long, item]) {
      for (const issue of r.error!.issues) expect(issue.message).not.toMatch(/expected|Too big|Invalid|uuid|string/i);
    }
  });

  it('when airframe hours are negative, then the message says so', () => {
    const r = aircraftCreateSchema.safeParse({ registration: 'Q-ABCD', type: 'Trike', customerId: id(9), airframeHours: '-1' });
    expect(first(r, 'airframeHours')).toBe('Airframe hours cannot be negative.');
  });
});

describe('figures larger than a light-aircraft job usually needs', () => {
  it('when a part quantity of 1,000,000 is saved without confirmation, then the save is refused with the figure named; with confirmLarge it passes', () => {
    const body = { version: 0, lines: [partLine('1000000')] };
    const refused = estimateSaveSchema.safeParse(body);
    expect(refused.success).toBe(false);
    expect(first(refused, 'confirmLarge')).toMatch(/"Split pins": 1000000 is more than 500 items\./);
    expect(estimateSaveSchema.safeParse({ ...body, confirmLarge: true }).success).toBe(true);
  });

  it('when every figure is at its plausible bound, then nothing needs confirming', () => {
    expect(largeFigures([{ kind: 'part', description: 'Rivets', quantity: PLAUSIBLE.quantity, unitCost: PLAUSIBLE.amount }])).toEqual([]);
    expect(largeFigures([{ kind: 'labour', description: 'Re-cover', quantity: PLAUSIBLE.hours, ratePerHour: PLAUSIBLE.ratePerHour }])).toEqual([]);
  });

  it('when labour hours, a rate, a fee or an access task are above their bounds, then each is named', () => {
    const f = largeFigures([
      { kind: 'labour', description: 'Strip', quantity: '301', ratePerHour: '501' },
      { kind: 'fee', description: 'Paperwork', amount: '30000.01' },
    ]);
    expect(f.map((x) => x.field)).toEqual(['quantity', 'ratePerHour', 'amount']);
    const tasks = estimateSaveSchema.safeParse({
      version: 0,
      lines: [],
      accessTasks: [{ id: id(2), name: 'Gearbox off', hours: '1000', ratePerHour: '60' }],
    });
    expect(first(tasks, 'confirmLarge')).toMatch(/"Gearbox off": 1000 is more than 300 hours/);
  });

  it('when a template line is implausibly large, then creating the template asks for confirmation too', () => {
    const t = { name: 'Annual', jobType: 'other', lines: [{ kind: 'fee', description: 'Paperwork', amount: '45000' }], checklist: [] };
    expect(first(templateCreateSchema.safeParse(t), 'confirmLarge')).toMatch(/Paperwork/);
    expect(templateCreateSchema.safeParse({ ...t, confirmLarge: true }).success).toBe(true);
  });
});

describe('words for the categories and the owner', () => {
  it('frames the categories as airworthiness or not plus information, with no prediction or time pressure', () => {
    expect(FINDING_CATEGORY_MEANINGS.airworthiness).toMatch(/inspector decides/);
    expect(FINDING_CATEGORY_MEANINGS.recommended).toMatch(/^Not an airworthiness item/);
    for (const m of Object.values(FINDING_CATEGORY_MEANINGS)) expect(m).not.toMatch(/will become|must now|should now|worse|before the aircraft flies/i);
  });

  it("gives the owner's standing go-ahead its own words, apart from a measured limit", () => {
    expect(FINDING_STATE_LABELS.approved_within_limit).toBe('Approved under standing go-ahead');
    expect(OWNER_FINDING_STATE_LABELS.approved_within_limit).toBe('Approved under your standing go-ahead');
  });

  it("says every job and finding state from the owner's side without the staff words", () => {
    const staffOnly = ['Sent to owner', 'Priced', 'Awaiting owner', 'Draft'];
    for (const label of [...Object.values(OWNER_JOB_STATE_LABELS), ...Object.values(OWNER_FINDING_STATE_LABELS)]) {
      expect(staffOnly).not.toContain(label);
    }
    expect(OWNER_JOB_STATE_LABELS.awaiting_owner).toBe('Waiting for your decision');
    expect(JOB_STATE_LABELS.awaiting_owner).toBe('Awaiting owner');
  });

  it('names the move to awaiting owner as an action for the user, not an order', () => {
    expect(JOB_TRANSITION_ACTIONS.awaiting_owner).toBe('Hold for owner');
  });
});
