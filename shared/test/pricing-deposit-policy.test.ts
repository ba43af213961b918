import { describe, expect, it } from 'vitest';
import { MoneyError, depositOnQuoteAccepted, depositOnWorkApproved, depositPolicySchema, workshopSettingsSchema } from '../src/index.js';

// The policy is the workshop's own rule, so these vectors are worked out here [derived]: percentage
// of the amount incl. VAT, rounded half-up to the penny (HMRC "nearest", manual VATREC12030).
describe('deposit on accepting the inspection quote', () => {
  it('when the policy is a percentage of the quote, then that share of the quote incl. VAT is asked', () => {
    // £1,200 + £240 VAT quoted; 25% → £360.00.
    expect(depositOnQuoteAccepted('1440.00', 'GBP', { kind: 'quote_percent', percent: '25' })).toEqual({ applies: true, basis: '1440.00', amount: '360.00' });
  });

  it('when the share falls between pennies, then it is rounded half-up', () => {
    // 33.33% of £100.05 = £33.346665 → £33.35; 12.5% of £0.20 = £0.025 → £0.03.
    expect(depositOnQuoteAccepted('100.05', 'GBP', { kind: 'quote_percent', percent: '33.33' }).amount).toBe('33.35');
    expect(depositOnQuoteAccepted('0.20', 'GBP', { kind: 'quote_percent', percent: '12.5' }).amount).toBe('0.03');
  });

  it('when the policy is none or asks on approved work, then accepting the quote asks nothing', () => {
    expect(depositOnQuoteAccepted('1440.00', 'GBP', { kind: 'none' })).toEqual({ applies: false, basis: '1440.00', amount: '0.00' });
    expect(depositOnQuoteAccepted('1440.00', 'GBP', { kind: 'approved_work_percent', percent: '50', threshold: '0.00' }).applies).toBe(false);
  });

  it('when the quote is an amount with too many decimals or a number, then it is refused', () => {
    expect(() => depositOnQuoteAccepted('10.005', 'GBP', { kind: 'quote_percent', percent: '10' })).toThrow(MoneyError);
    expect(() => depositOnQuoteAccepted(10 as unknown as string, 'GBP', { kind: 'quote_percent', percent: '10' })).toThrow(MoneyError);
  });
});

describe('deposit on approving work', () => {
  const policy = { kind: 'approved_work_percent', percent: '50', threshold: '500.00' } as const;
  it('when the approved work is worth more than the threshold, then the percentage of all of it is asked', () => {
    expect(depositOnWorkApproved('600.00', 'GBP', policy)).toEqual({ applies: true, basis: '600.00', amount: '300.00' });
  });

  it('when it is worth the threshold or less, then nothing is asked', () => {
    expect(depositOnWorkApproved('500.00', 'GBP', policy)).toEqual({ applies: false, basis: '500.00', amount: '0.00' });
    expect(depositOnWorkApproved('12.00', 'GBP', policy).applies).toBe(false);
  });

  it('when the policy is a percentage of the quote, then approving work asks nothing', () => {
    expect(depositOnWorkApproved('5000.00', 'GBP', { kind: 'quote_percent', percent: '25' }).applies).toBe(false);
  });
});

describe('the deposit policy setting', () => {
  it('when a workshop has no policy saved, then it reads as none', () => {
    expect(workshopSettingsSchema.parse({}).depositPolicy).toEqual({ kind: 'none' });
  });

  it('when a percentage is zero, over 100, or not a decimal string, then it is refused with a message', () => {
    for (const percent of ['0', '100.01', '150', 'ten', '12.345']) {
      const r = depositPolicySchema.safeParse({ kind: 'quote_percent', percent });
      expect(r.success, percent).toBe(false);
    }
    const r = depositPolicySchema.safeParse({ kind: 'quote_percent', percent: '150' });
    expect(r.error?.issues[0]?.message).toBe('The percentage must be more than 0 and at most 100.');
    expect(depositPolicySchema.safeParse({ kind: 'quote_percent', percent: '100' }).success).toBe(true);
  });

  it('when approved-work deposits lack a threshold, or the kind is unknown, then it is refused', () => {
    expect(depositPolicySchema.safeParse({ kind: 'approved_work_percent', percent: '50' }).success).toBe(false);
    const unknown = depositPolicySchema.safeParse({ kind: 'always' });
    expect(unknown.error?.issues[0]?.message).toBe('Choose no deposit, a percentage of the quote, or a percentage of approved work.');
  });
});
