import { beforeEach, describe, expect, it } from 'vitest';
import { clearDraft, readDraft, saveDraft, type DraftTarget } from './draft';

const REQ = '0b1c2d3e-4f5a-4b6c-8d7e-9f0a1b2c3d4e';
const OTHER_REQ = '9f0a1b2c-3d4e-4f5a-8b6c-7d8e9f0a1b2c';
const F1 = '2f0e7a1c-3b4d-4e5f-8a6b-7c8d9e0f1a2b';
const F2 = '8a9b0c1d-2e3f-4a5b-9c6d-7e8f9a0b1c2d';
const HASH = 'a'.repeat(64);
const KEY = `wingstage.decision-draft.${REQ}`;

const target = (over: Partial<DraftTarget> = {}): DraftTarget => ({
  requestId: REQ,
  snapshotHash: HASH,
  state: 'sent',
  closedReason: null,
  superseded: false,
  itemIds: ['quote', F1, F2],
  ...over,
});

describe('decision drafts kept on the device', () => {
  beforeEach(() => localStorage.clear());

  it('when choices and a note are saved, then reading the same request gives them back with the step', () => {
    saveDraft(localStorage, REQ, { snapshotHash: HASH, choices: { quote: 'approve', [F1]: 'decline' }, notes: { [F1]: 'Please ring me.' }, step: 2 });
    expect(readDraft(localStorage, target())).toEqual({
      draft: { snapshotHash: HASH, choices: { quote: 'approve', [F1]: 'decline' }, notes: { [F1]: 'Please ring me.' }, step: 2 },
      discarded: null,
    });
  });

  it('when nothing is chosen or written and the owner is on the first step, then nothing is kept', () => {
    saveDraft(localStorage, REQ, { snapshotHash: HASH, choices: {}, notes: { [F1]: '' }, step: 0 });
    expect(localStorage.getItem(KEY)).toBeNull();
  });

  it('when the request was sent again with a different hash, then the draft is reported as changed and not given back', () => {
    saveDraft(localStorage, REQ, { snapshotHash: HASH, choices: { [F1]: 'approve' }, notes: {}, step: 1 });
    expect(readDraft(localStorage, target({ snapshotHash: 'b'.repeat(64) }))).toEqual({ draft: null, discarded: 'changed' });
  });

  it('when the request was replaced, withdrawn or ran out, then the draft is reported as closed', () => {
    saveDraft(localStorage, REQ, { snapshotHash: HASH, choices: { [F1]: 'approve' }, notes: {}, step: 1 });
    expect(readDraft(localStorage, target({ state: 'replaced' })).discarded).toBe('closed');
    expect(readDraft(localStorage, target({ state: 'revoked' })).discarded).toBe('closed');
    expect(readDraft(localStorage, target({ state: 'sent', closedReason: 'This link ran out on 8 Dec.' })).discarded).toBe('closed');
  });

  it('when the request was decided elsewhere, then the draft is reported as decided', () => {
    saveDraft(localStorage, REQ, { snapshotHash: HASH, choices: { [F1]: 'approve' }, notes: {}, step: 1 });
    expect(readDraft(localStorage, target({ state: 'decided' }))).toEqual({ draft: null, discarded: 'decided' });
  });

  it('when the page was opened through an older link of a re-sent request, then the draft is left alone for the newest link', () => {
    saveDraft(localStorage, REQ, { snapshotHash: HASH, choices: { [F1]: 'approve' }, notes: {}, step: 1 });
    expect(readDraft(localStorage, target({ superseded: true }))).toEqual({ draft: null, discarded: null });
    expect(localStorage.getItem(KEY)).not.toBeNull();
  });

  it('when the draft names an item the request does not hold, then it is reported as unreadable', () => {
    saveDraft(localStorage, REQ, { snapshotHash: HASH, choices: { [F1]: 'approve', [F2]: 'decline' }, notes: {}, step: 2 });
    expect(readDraft(localStorage, target({ itemIds: [F1] })).discarded).toBe('unreadable');
    saveDraft(localStorage, REQ, { snapshotHash: HASH, choices: {}, notes: { [OTHER_REQ]: 'stray' }, step: 1 });
    expect(readDraft(localStorage, target()).discarded).toBe('unreadable');
  });

  it('when the stored text is not a draft (edited by hand, another version, not JSON), then it is reported as unreadable', () => {
    localStorage.setItem(KEY, '{not json');
    expect(readDraft(localStorage, target()).discarded).toBe('unreadable');
    localStorage.setItem(KEY, JSON.stringify({ v: 1, snapshotHash: HASH, choices: { [F1]: 'maybe' }, notes: {}, step: 0, savedAt: '2026-12-01T10:00:00Z' }));
    expect(readDraft(localStorage, target()).discarded).toBe('unreadable');
    localStorage.setItem(KEY, JSON.stringify({ v: 2, snapshotHash: HASH, choices: {}, notes: {}, step: 0, savedAt: '2026-12-01T10:00:00Z' }));
    expect(readDraft(localStorage, target()).discarded).toBe('unreadable');
  });

  it('when reading, then nothing is removed (the page removes a discarded draft itself), and clearDraft removes it', () => {
    saveDraft(localStorage, REQ, { snapshotHash: HASH, choices: { [F1]: 'approve' }, notes: {}, step: 1 });
    readDraft(localStorage, target({ state: 'decided' }));
    expect(localStorage.getItem(KEY)).not.toBeNull();
    clearDraft(localStorage, REQ);
    expect(localStorage.getItem(KEY)).toBeNull();
  });

  it('when a saved step is past the end of the request, then it is brought back to the review', () => {
    saveDraft(localStorage, REQ, { snapshotHash: HASH, choices: { [F1]: 'approve' }, notes: {}, step: 9 });
    expect(readDraft(localStorage, target()).draft?.step).toBe(3);
  });

  it('when another request’s draft is older than sixty days, then saving prunes it and keeps recent ones', () => {
    saveDraft(localStorage, OTHER_REQ, { snapshotHash: HASH, choices: { [F1]: 'approve' }, notes: {}, step: 1 }, new Date('2026-09-01T10:00:00Z'));
    saveDraft(localStorage, REQ, { snapshotHash: HASH, choices: { [F1]: 'approve' }, notes: {}, step: 1 }, new Date('2026-12-01T10:00:00Z'));
    expect(localStorage.getItem(`wingstage.decision-draft.${OTHER_REQ}`)).toBeNull();
    expect(localStorage.getItem(KEY)).not.toBeNull();
  });

  it('when the device gives no storage or refuses to write, then saving and reading do nothing and throw nothing', () => {
    expect(readDraft(null, target())).toEqual({ draft: null, discarded: null });
    expect(() => saveDraft(null, REQ, { snapshotHash: HASH, choices: {}, notes: {}, step: 1 })).not.toThrow();
    const refusing = {
      length: 0,
      key: () => null,
      getItem: () => {
        throw new Error('denied');
      },
      setItem: () => {
        throw new Error('quota');
      },
      removeItem: () => {
        throw new Error('denied');
      },
      clear: () => undefined,
    } satisfies Storage;
    expect(() => saveDraft(refusing, REQ, { snapshotHash: HASH, choices: { [F1]: 'approve' }, notes: {}, step: 1 })).not.toThrow();
    expect(readDraft(refusing, target())).toEqual({ draft: null, discarded: null });
    expect(() => clearDraft(refusing, REQ)).not.toThrow();
  });
});
