import { describe, expect, it } from 'vitest';
import {
  JOB_STATES,
  JOB_TRANSITIONS,
  QUOTE_STATES,
  QUOTE_STATE_LABELS,
  QUOTE_STATE_OWNER_WORDS,
  StateMoveError,
  assertFindingMove,
  assertJobMove,
  assertRequestMove,
  assertRequestResendable,
  canStartWork,
  canTransition,
  isTerminalJobState,
  nextJobStates,
  quoteStateOf,
  type JobState,
} from '../src/states.js';

/** The lifecycle the workshop follows (vocabulary.md, "Job states"), written out independently of the table. */
const HAPPY_PATH: JobState[] = ['booked_in', 'inspecting', 'awaiting_owner', 'in_work', 'ready_for_release', 'invoiced', 'paid', 'closed'];

describe('job state machine', () => {
  it('when a job follows the normal lifecycle, then every step is allowed', () => {
    for (let i = 0; i < HAPPY_PATH.length - 1; i++) {
      expect(canTransition(HAPPY_PATH[i]!, HAPPY_PATH[i + 1]!)).toEqual({ ok: true });
    }
  });

  it('when a job is not yet invoiced, then it can be cancelled; from invoiced on, it cannot', () => {
    const before: JobState[] = ['booked_in', 'inspecting', 'awaiting_owner', 'in_work', 'ready_for_release'];
    for (const s of before) expect(canTransition(s, 'cancelled').ok).toBe(true);
    for (const s of ['invoiced', 'paid', 'closed'] as JobState[]) {
      const r = canTransition(s, 'cancelled');
      expect(r).toEqual({ ok: false, reason: 'A job can be cancelled only before it is invoiced.' });
    }
  });

  it('when a move skips ahead, then it is refused with a reason naming both states', () => {
    expect(canTransition('booked_in', 'invoiced')).toEqual({ ok: false, reason: 'A job that is booked in cannot move to invoiced.' });
    expect(canTransition('inspecting', 'paid')).toEqual({ ok: false, reason: 'A job that is inspecting cannot move to paid.' });
  });

  it('when a job is asked to move to the state it is in, then it is refused as already there', () => {
    for (const s of JOB_STATES) {
      const r = canTransition(s, s);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.reason).toMatch(/already/);
    }
  });

  it('when closed or cancelled, then a job is terminal and offers no next state', () => {
    expect(isTerminalJobState('closed')).toBe(true);
    expect(isTerminalJobState('cancelled')).toBe(true);
    expect(nextJobStates('closed')).toEqual([]);
    for (const s of HAPPY_PATH.slice(0, -1)) expect(isTerminalJobState(s)).toBe(false);
  });

  it('when money has been invoiced, then the job can only go forward (no way back to work)', () => {
    expect(nextJobStates('invoiced')).toEqual(['paid']);
    expect(nextJobStates('paid')).toEqual(['closed']);
  });

  it('when the table is read, then every target is a known state and canTransition agrees with it for all pairs', () => {
    for (const from of JOB_STATES) {
      for (const to of JOB_STATES) {
        const listed = JOB_TRANSITIONS[from].includes(to);
        expect({ from, to, ok: canTransition(from, to).ok }).toEqual({ from, to, ok: listed });
      }
    }
  });

  it('when every state is followed, then each can reach closed or cancelled (no dead ends)', () => {
    const reaches = (s: JobState, seen = new Set<JobState>()): boolean => {
      if (isTerminalJobState(s)) return true;
      seen.add(s);
      return JOB_TRANSITIONS[s].some((n) => !seen.has(n) && reaches(n, new Set(seen)));
    };
    for (const s of JOB_STATES) expect(reaches(s)).toBe(true);
  });
});

describe('enforced moves and the quote state', () => {
  it('when a move is forbidden, then the assert functions throw a StateMoveError with the reason', () => {
    expect(() => assertJobMove('booked_in', 'in_work')).toThrow(StateMoveError);
    expect(() => assertFindingMove('approved', 'declined')).toThrow(/cannot become declined/);
    expect(() => assertRequestMove('expired', 'sent')).toThrow(StateMoveError);
    expect(() => assertRequestResendable('revoked')).toThrow(/only a request waiting for the owner can be re-sent/);
    expect(() => assertRequestMove('sent', 'decided')).not.toThrow();
    try {
      assertJobMove('closed', 'inspecting');
    } catch (e) {
      expect(e).toBeInstanceOf(StateMoveError);
      expect((e as StateMoveError).machine).toBe('job');
      expect((e as StateMoveError).reason).toBe('A job that is closed cannot move to inspecting.');
    }
  });

  it('when the inspection lines and requests vary, then the quote state follows them', () => {
    expect(quoteStateOf({ agreedLines: 0, unagreedLines: 3, quoteRequestOpen: false, lastQuoteDecision: null })).toBe('not_sent');
    expect(quoteStateOf({ agreedLines: 0, unagreedLines: 3, quoteRequestOpen: true, lastQuoteDecision: null })).toBe('sent');
    expect(quoteStateOf({ agreedLines: 3, unagreedLines: 0, quoteRequestOpen: false, lastQuoteDecision: 'approve' })).toBe('agreed');
    expect(quoteStateOf({ agreedLines: 2, unagreedLines: 1, quoteRequestOpen: false, lastQuoteDecision: 'approve' })).toBe('changed');
    expect(quoteStateOf({ agreedLines: 0, unagreedLines: 3, quoteRequestOpen: false, lastQuoteDecision: 'decline' })).toBe('declined');
    expect(canStartWork({ unagreedLines: 1 })).toMatchObject({ ok: false });
    expect(QUOTE_STATE_OWNER_WORDS.sent).toBe('Waiting for your decision');
    for (const s of QUOTE_STATES) expect(QUOTE_STATE_LABELS[s]).not.toBe(QUOTE_STATE_OWNER_WORDS[s]);
  });
});
