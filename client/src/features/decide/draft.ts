import { DECISIONS, type ApprovalRequestState, type Decision } from '@wingstage/shared';

/**
 * The owner's choices kept on their own device until they confirm: phones reload a tab after a trip
 * to the mail app, and the choices must not vanish with it. One draft per request, stamped with the
 * hash of what the owner saw, so a draft is only ever put back on the very request it was made on.
 * A draft is never sent by itself: it only fills the page in again, and the owner still confirms.
 */
export interface DecisionDraft {
  snapshotHash: string;
  choices: Record<string, Decision>;
  notes: Record<string, string>;
  /** Where the owner was: an item's index, or the number of items for the review. */
  step: number;
}

/** Why a stored draft was dropped instead of put back. */
export type DraftDiscard = 'changed' | 'decided' | 'closed' | 'unreadable';

/** What the owner reads when a draft is dropped: plain words, no blame, what to do next. */
export const DRAFT_DISCARD_WORDS: Record<DraftDiscard, string> = {
  changed: 'The workshop changed this request after you started, so the choices you had not confirmed were cleared. Please look through it again.',
  decided: 'These decisions were already recorded, so the choices you had not confirmed on this device were cleared. What was recorded is shown here.',
  closed: 'This request can no longer be decided here, so the choices you had not confirmed on this device were cleared. Nothing was sent.',
  unreadable: 'The choices saved on this device did not match this request, so they were cleared. Please choose again.',
};

const KEY_PREFIX = 'wingstage.decision-draft.';
const draftKey = (requestId: string) => `${KEY_PREFIX}${requestId}`;

/**
 * True when this device keeps choices for the request (or cannot say): the page then starts from
 * them, which the server's first view, made without them, does not show.
 */
export function hasStoredDraft(storage: Storage | null, requestId: string): boolean {
  if (!storage) return false;
  try {
    return storage.getItem(draftKey(requestId)) !== null;
  } catch {
    return true;
  }
}

interface StoredDraft {
  v: 1;
  snapshotHash: string;
  choices: Record<string, Decision>;
  notes: Record<string, string>;
  step: number;
  savedAt: string;
}

// Checked by hand rather than with a zod schema: the decision page loads no zod (its size budget,
// scripts/decide-size.mjs), and a stored draft is the page's own small, fixed shape.
const isRecordOf = (x: unknown, ok: (v: unknown) => boolean): x is Record<string, never> =>
  typeof x === 'object' && x !== null && !Array.isArray(x) && Object.entries(x).every(([k, v]) => k.length <= 64 && ok(v));

/** The stored draft when it has exactly the shape this page writes, else null. */
export function storedDraftOf(x: unknown): StoredDraft | null {
  if (typeof x !== 'object' || x === null) return null;
  const d = x as Record<string, unknown>;
  const ok =
    d.v === 1 &&
    typeof d.snapshotHash === 'string' &&
    /^[0-9a-f]{64}$/.test(d.snapshotHash) &&
    isRecordOf(d.choices, (v) => (DECISIONS as readonly unknown[]).includes(v)) &&
    isRecordOf(d.notes, (v) => typeof v === 'string' && v.length <= 1000) &&
    typeof d.step === 'number' &&
    Number.isInteger(d.step) &&
    d.step >= 0 &&
    d.step <= 100 &&
    typeof d.savedAt === 'string';
  return ok ? (d as unknown as StoredDraft) : null;
}

/** localStorage when the browser gives one; null when it is switched off or refused (private modes). */
export function deviceStorage(): Storage | null {
  try {
    return typeof window !== 'undefined' && window.localStorage ? window.localStorage : null;
  } catch {
    return null;
  }
}

function remove(storage: Storage, requestId: string) {
  try {
    storage.removeItem(draftKey(requestId));
  } catch {
    // A storage that refuses to remove has nothing more we can do; the hash check still guards it.
  }
}

export interface DraftTarget {
  requestId: string;
  snapshotHash: string;
  state: ApprovalRequestState;
  /** The server gives a reason the request cannot be decided through this page. */
  closedReason: string | null;
  /**
   * Opened through an older link of a re-sent request: the request itself may still be waiting
   * behind the newest link, so its draft is left for that link and neither used nor dropped here.
   */
  superseded: boolean;
  /** The request's item ids, in the page's order. */
  itemIds: string[];
}

export interface ReadDraft {
  draft: DecisionDraft | null;
  /** Set when a stored draft must not be used: the caller removes it (`clearDraft`) and says why. */
  discarded: DraftDiscard | null;
}

/**
 * The draft stored for this request, checked against the request as the server now shows it. A
 * draft for another version of the request (a different hash), for a request that can no longer be
 * decided, or naming items the request does not hold is reported as discarded, never put back.
 * Reading changes nothing, so a page may read twice.
 */
export function readDraft(storage: Storage | null, target: DraftTarget): ReadDraft {
  if (!storage) return { draft: null, discarded: null };
  let raw: string | null;
  try {
    raw = storage.getItem(draftKey(target.requestId));
  } catch {
    return { draft: null, discarded: null };
  }
  if (raw === null || target.superseded) return { draft: null, discarded: null };
  const drop = (why: DraftDiscard): ReadDraft => ({ draft: null, discarded: why });
  if (target.state === 'decided') return drop('decided');
  if (target.state !== 'sent' || target.closedReason) return drop('closed');
  let parsed: StoredDraft;
  try {
    const r = storedDraftOf(JSON.parse(raw));
    if (!r) return drop('unreadable');
    parsed = r;
  } catch {
    return drop('unreadable');
  }
  if (parsed.snapshotHash !== target.snapshotHash) return drop('changed');
  const known = new Set(target.itemIds);
  const named = [...Object.keys(parsed.choices), ...Object.keys(parsed.notes)];
  if (named.some((id) => !known.has(id))) return drop('unreadable');
  return {
    draft: {
      snapshotHash: parsed.snapshotHash,
      choices: parsed.choices,
      notes: parsed.notes,
      step: Math.min(parsed.step, target.itemIds.length),
    },
    discarded: null,
  };
}

/** Drafts are kept this long at most: a link runs out well before, and a device should not fill up. */
const KEEP_DAYS = 60;

/** Removes drafts of other requests saved more than KEEP_DAYS ago (links long run out by then). */
function pruneOld(storage: Storage, now: Date) {
  const cutoff = now.getTime() - KEEP_DAYS * 24 * 3600 * 1000;
  const keys: string[] = [];
  for (let i = 0; i < storage.length; i++) {
    const k = storage.key(i);
    if (k?.startsWith(KEY_PREFIX)) keys.push(k);
  }
  for (const k of keys) {
    try {
      const savedAt = Date.parse((JSON.parse(storage.getItem(k) ?? '{}') as { savedAt?: string }).savedAt ?? '');
      if (!(savedAt >= cutoff)) storage.removeItem(k);
    } catch {
      storage.removeItem(k);
    }
  }
}

/** Keeps the owner's choices on the device. A full or refused storage just keeps nothing. */
export function saveDraft(storage: Storage | null, requestId: string, draft: DecisionDraft, now: Date = new Date()): void {
  if (!storage) return;
  try {
    pruneOld(storage, now);
  } catch {
    // Pruning is housekeeping; the draft below matters more.
  }
  const notes = Object.fromEntries(Object.entries(draft.notes).filter(([, n]) => n.length > 0));
  const empty = Object.keys(draft.choices).length === 0 && Object.keys(notes).length === 0;
  try {
    if (empty && draft.step === 0) storage.removeItem(draftKey(requestId));
    else storage.setItem(draftKey(requestId), JSON.stringify({ v: 1, ...draft, notes, savedAt: now.toISOString() }));
  } catch {
    // Storage full or switched off: the page still works, it just cannot survive a reload.
  }
}

/** Once the owner has confirmed, nothing of the draft stays on the device. */
export function clearDraft(storage: Storage | null, requestId: string): void {
  if (storage) remove(storage, requestId);
}
