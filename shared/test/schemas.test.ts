import { describe, expect, it } from 'vitest';
import {
  aircraftCreateSchema,
  aircraftUpdateSchema,
  customerUpdateSchema,
  customerCreateSchema,
  invitationAcceptSchema,
  invitationCreateSchema,
  jobCreateSchema,
  listQuerySchema,
  passwordSchema,
  signInSchema,
  vatNumberSchema,
  workshopUpdateSchema,
} from '../src/index.js';

const uuid = '0b6f3c1e-2d4a-4f5b-9c8d-7e6f5a4b3c2d';

function fieldErrors(result: { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } }) {
  return Object.fromEntries((result.error?.issues ?? []).map((i) => [i.path.join('.'), i.message]));
}

describe('sign-in and passwords', () => {
  it('when an e-mail has capitals and spaces, then it is trimmed and lower-cased', () => {
    expect(signInSchema.parse({ email: '  Manager@Brackenfold.Example ', password: 'x' }).email).toBe('manager@brackenfold.example');
  });

  it('when a password is 72 bytes, then it is accepted; at 73 bytes it is refused', () => {
    // OWASP Password Storage Cheat Sheet: bcrypt has a 72-byte input limit, so longer input is refused, not cut.
    expect(passwordSchema.safeParse('a'.repeat(72)).success).toBe(true);
    expect(passwordSchema.safeParse('a'.repeat(73)).success).toBe(false);
    // "é" is two bytes in UTF-8: 36 of them are 72 bytes, 37 are 74.
    expect(passwordSchema.safeParse('é'.repeat(36)).success).toBe(true);
    expect(passwordSchema.safeParse('é'.repeat(37)).success).toBe(false);
  });

  it('when a password is shorter than ten characters, then the message says how long it must be', () => {
    const r = passwordSchema.safeParse('short');
    expect(r.success).toBe(false);
    expect(r.error?.issues[0]?.message).toBe('Use at least 10 characters.');
  });

  it('when the confirmation differs, then the error sits on confirmPassword', () => {
    const r = invitationAcceptSchema.safeParse({
      token: 'a'.repeat(43),
      name: 'Hazel Brambury',
      password: 'correct-horse-1',
      confirmPassword: 'correct-horse-2',
    });
    expect(fieldErrors(r)).toEqual({ confirmPassword: 'The passwords do not match.' });
  });
});

describe('invitations', () => {
  it('when an owner is invited without an owner record, then it is refused', () => {
    const r = invitationCreateSchema.safeParse({ role: 'owner', email: 'x@owners.example', name: 'X' });
    expect(r.success).toBe(false);
    expect(Object.keys(fieldErrors(r))).toContain('customerId');
  });

  it('when staff are invited, then no owner record is needed', () => {
    const r = invitationCreateSchema.parse({ role: 'engineer', email: 'new@brackenfold.example', name: 'New Engineer' });
    expect(r.role).toBe('engineer');
  });

  it('when the role is unknown, then it is refused', () => {
    expect(invitationCreateSchema.safeParse({ role: 'superuser', email: 'a@b.example', name: 'A' }).success).toBe(false);
  });
});

describe('owners, aircraft and jobs', () => {
  it('when an owner has a phone with letters, then the phone field explains what is allowed', () => {
    const r = customerCreateSchema.safeParse({ name: 'A', email: 'a@owners.example', phone: 'call me' });
    expect(fieldErrors(r).phone).toBe('Use digits, spaces and + ( ) - only.');
  });

  it('when a registration is typed in lower case, then it is stored upper case', () => {
    const r = aircraftCreateSchema.parse({ customerId: uuid, registration: ' q-brka ', type: 'Two-seat flex-wing trike' });
    expect(r.registration).toBe('Q-BRKA');
    expect(r.airframeHours).toBe('0');
  });

  it('when hours are given as a float-looking string with too many decimals, then they are refused', () => {
    const r = aircraftCreateSchema.safeParse({ customerId: uuid, registration: 'Q-BRKA', type: 'T', airframeHours: '812.25' });
    expect(fieldErrors(r).airframeHours).toBe('Airframe hours can have at most one decimal place.');
  });

  it('when hours are sent as a number, then they are refused (decimals travel as strings)', () => {
    const r = aircraftCreateSchema.safeParse({ customerId: uuid, registration: 'Q-BRKA', type: 'T', airframeHours: 812.2 });
    expect(r.success).toBe(false);
  });

  it('when the due date is before booking in, then the error sits on dueOn', () => {
    const r = jobCreateSchema.safeParse({
      aircraftId: uuid,
      title: 'Annual permit inspection',
      type: 'annual_permit_inspection',
      bookedInOn: '2026-12-01',
      dueOn: '2026-11-30',
    });
    expect(fieldErrors(r)).toEqual({ dueOn: 'The due date cannot be before booking in.' });
  });

  it('when a date is not a calendar date, then it is refused', () => {
    const r = jobCreateSchema.safeParse({ aircraftId: uuid, title: 'T', type: 'repair', bookedInOn: '2026-02-30' });
    expect(r.success).toBe(false);
  });
});

describe('lists and settings', () => {
  it('when the query is empty, then paging defaults apply; page sizes over 100 are refused', () => {
    expect(listQuerySchema.parse({})).toEqual({ q: '', dir: 'asc', page: 1, pageSize: 20 });
    expect(listQuerySchema.parse({ page: '3', pageSize: '50' })).toMatchObject({ page: 3, pageSize: 50 });
    expect(listQuerySchema.safeParse({ pageSize: '1000' }).success).toBe(false);
  });

  it('when a VAT number has the UK shape, then it is accepted with or without the GB prefix', () => {
    expect(vatNumberSchema.parse('gb999000173')).toBe('GB999000173');
    expect(vatNumberSchema.safeParse('999000173').success).toBe(true);
    expect(vatNumberSchema.safeParse('GB12345').success).toBe(false);
  });

  it('when the VAT rounding method is not one of the four in VAT Notice 700 §17.5, then it is refused', () => {
    expect(workshopUpdateSchema.safeParse({ version: 0, settings: { vatRounding: 'line-nearest' } }).success).toBe(true);
    expect(workshopUpdateSchema.safeParse({ version: 0, settings: { vatRounding: 'banker' } }).success).toBe(false);
  });
});

describe('PATCH schemas', () => {
  it('when a PATCH sends one field, then no other field gets a default', () => {
    // A one-field change must not reset the others to their create defaults.
    expect(customerUpdateSchema.parse({ version: 2, name: 'Hazel Brambury' })).toEqual({ version: 2, name: 'Hazel Brambury' });
    expect(aircraftUpdateSchema.parse({ version: 0, engineHours: '412.5' })).toEqual({ version: 0, engineHours: '412.5' });
    expect(workshopUpdateSchema.parse({ version: 1, settings: { approvalLinkDays: 10 } })).toEqual({
      version: 1,
      settings: { approvalLinkDays: 10 },
    });
  });

  it('when a PATCH sends a bad value, then it is still validated', () => {
    expect(customerUpdateSchema.safeParse({ version: 0, email: 'not-an-address' }).success).toBe(false);
    expect(aircraftUpdateSchema.safeParse({ version: 0, registration: 'not a reg!' }).success).toBe(false);
  });
});

describe('work records', () => {
  it('when no hours or a discount over 100% is given, then it is refused (compared as exact decimals)', async () => {
    const { timeLogCreateSchema, estimateLineSchema } = await import('../src/index.js');
    expect(timeLogCreateSchema.safeParse({ hours: '0.00', workedOn: '2026-12-01' }).success).toBe(false);
    expect(timeLogCreateSchema.safeParse({ hours: '0.01', workedOn: '2026-12-01' }).success).toBe(true);
    const line = { id: uuid, stage: 'inspection', kind: 'fee', description: 'Permit paperwork', amount: '45.00' };
    expect(estimateLineSchema.safeParse({ ...line, discountPercent: '100.00' }).success).toBe(true);
    expect(estimateLineSchema.safeParse({ ...line, discountPercent: '100.01' }).success).toBe(false);
  });
});
