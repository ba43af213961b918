/**
 * Allowed state transitions, declared once and enforced by the server's services.
 * The client uses the same tables to decide which actions to offer.
 */

export const JOB_STATES = [
  'booked_in',
  'inspecting',
  'awaiting_owner',
  'in_work',
  'ready_for_release',
  'invoiced',
  'paid',
  'closed',
  'cancelled',
] as const;
export type JobState = (typeof JOB_STATES)[number];

export const JOB_STATE_LABELS: Record<JobState, string> = {
  booked_in: 'Booked in',
  inspecting: 'Inspecting',
  awaiting_owner: 'Awaiting owner',
  in_work: 'In work',
  ready_for_release: 'Ready for release',
  invoiced: 'Invoiced',
  paid: 'Paid',
  closed: 'Closed',
  cancelled: 'Cancelled',
};

/**
 * The same states said from the owner's side (vocabulary.md, "Job states"): the owner's pages use
 * these, never the staff words above.
 */
export const OWNER_JOB_STATE_LABELS: Record<JobState, string> = {
  booked_in: 'Booked in',
  inspecting: 'Being inspected',
  awaiting_owner: 'Waiting for your decision',
  in_work: 'Work under way',
  ready_for_release: 'Work finished',
  invoiced: 'Invoice ready',
  paid: 'Paid',
  closed: 'Closed',
  cancelled: 'Cancelled',
};

/** from → the states it may move to. Cancelled is possible only before invoicing. */
export const JOB_TRANSITIONS: Record<JobState, readonly JobState[]> = {
  booked_in: ['inspecting', 'cancelled'],
  inspecting: ['awaiting_owner', 'in_work', 'cancelled'],
  awaiting_owner: ['in_work', 'inspecting', 'cancelled'],
  in_work: ['awaiting_owner', 'ready_for_release', 'cancelled'],
  ready_for_release: ['in_work', 'invoiced', 'cancelled'],
  invoiced: ['paid'],
  paid: ['closed'],
  closed: [],
  cancelled: [],
};

/** The button label for moving a job into each state (vocabulary.md, "Actions"). */
export const JOB_TRANSITION_ACTIONS: Record<JobState, string> = {
  booked_in: 'Book in',
  inspecting: 'Start inspection',
  awaiting_owner: 'Hold for owner',
  in_work: 'Start work',
  ready_for_release: 'Mark ready for release',
  invoiced: 'Mark invoiced',
  paid: 'Mark paid',
  closed: 'Close job',
  cancelled: 'Cancel job',
};

export type TransitionCheck = { ok: true } | { ok: false; reason: string };

export function canTransition(from: JobState, to: JobState): TransitionCheck {
  if (from === to) return { ok: false, reason: `The job is already ${JOB_STATE_LABELS[to].toLowerCase()}.` };
  if (JOB_TRANSITIONS[from].includes(to)) return { ok: true };
  if (to === 'cancelled') {
    return { ok: false, reason: 'A job can be cancelled only before it is invoiced.' };
  }
  return {
    ok: false,
    reason: `A job that is ${JOB_STATE_LABELS[from].toLowerCase()} cannot move to ${JOB_STATE_LABELS[to].toLowerCase()}.`,
  };
}

export function nextJobStates(from: JobState): readonly JobState[] {
  return JOB_TRANSITIONS[from];
}

export function isTerminalJobState(state: JobState): boolean {
  return JOB_TRANSITIONS[state].length === 0;
}

/**
 * Findings (vocabulary.md): draft → priced → sent → approved / declined, or approved within the
 * pre-authorised limit, or withdrawn. A priced finding goes back to draft if its lines are removed;
 * a sent one goes back to priced when its request is replaced.
 */
export const FINDING_STATES = ['draft', 'priced', 'sent', 'approved', 'approved_within_limit', 'declined', 'withdrawn'] as const;
export type FindingState = (typeof FINDING_STATES)[number];

export const FINDING_STATE_LABELS: Record<FindingState, string> = {
  draft: 'Draft',
  priced: 'Priced',
  sent: 'Sent to owner',
  approved: 'Approved',
  approved_within_limit: 'Approved under standing go-ahead',
  declined: 'Declined',
  withdrawn: 'Withdrawn',
};

/**
 * Finding states from the owner's side. "Within limit" is the owner's standing go-ahead (their
 * pre-authorised limit), never to be confused with a measured limit.
 */
export const OWNER_FINDING_STATE_LABELS: Record<FindingState, string> = {
  draft: 'Being priced',
  priced: 'Being priced',
  sent: 'Waiting for your decision',
  approved: 'You approved',
  approved_within_limit: 'Approved under your standing go-ahead',
  declined: 'You declined',
  withdrawn: 'Withdrawn by the workshop',
};

export const FINDING_TRANSITIONS: Record<FindingState, readonly FindingState[]> = {
  draft: ['priced', 'approved_within_limit', 'withdrawn'],
  priced: ['draft', 'sent', 'approved_within_limit', 'withdrawn'],
  sent: ['priced', 'approved', 'declined', 'withdrawn'],
  approved: [],
  approved_within_limit: [],
  declined: ['priced'],
  withdrawn: [],
};

export function canMoveFinding(from: FindingState, to: FindingState): TransitionCheck {
  if (FINDING_TRANSITIONS[from].includes(to)) return { ok: true };
  return {
    ok: false,
    reason: `A finding that is ${FINDING_STATE_LABELS[from].toLowerCase()} cannot become ${FINDING_STATE_LABELS[to].toLowerCase()}.`,
  };
}

/**
 * An airworthiness finding is open until it is rectified (approved and the work recorded as done)
 * or withdrawn; declining it does not close it. An open one blocks ready for release.
 */
export function isOpenAirworthiness(f: { category: string; state: FindingState; rectifiedAt: string | null }): boolean {
  return f.category === 'airworthiness' && f.state !== 'withdrawn' && f.rectifiedAt === null;
}

/**
 * Approval requests (vocabulary.md): sent → decided, or expired, revoked, or replaced when a price
 * changed after sending (the newer request supersedes it).
 */
export const APPROVAL_REQUEST_STATES = ['sent', 'decided', 'expired', 'revoked', 'replaced'] as const;
export type ApprovalRequestState = (typeof APPROVAL_REQUEST_STATES)[number];
export const APPROVAL_REQUEST_STATE_LABELS: Record<ApprovalRequestState, string> = {
  sent: 'Sent',
  decided: 'Decided',
  expired: 'Expired',
  revoked: 'Link revoked',
  replaced: 'Replaced',
};
/** Approval request states from the owner's side. */
export const OWNER_APPROVAL_REQUEST_STATE_LABELS: Record<ApprovalRequestState, string> = {
  sent: 'Waiting for your decision',
  decided: 'You decided',
  expired: 'Link expired',
  revoked: 'Link revoked by the workshop',
  replaced: 'A newer link was sent',
};
export const APPROVAL_REQUEST_TRANSITIONS: Record<ApprovalRequestState, readonly ApprovalRequestState[]> = {
  sent: ['decided', 'expired', 'revoked', 'replaced'],
  decided: [],
  expired: [],
  revoked: [],
  replaced: [],
};
