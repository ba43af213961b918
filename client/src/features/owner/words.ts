import { OWNER_APPROVAL_REQUEST_STATE_LABELS, OWNER_FINDING_STATE_LABELS, OWNER_JOB_STATE_LABELS, TOTAL_NAMES, type JobState } from '@wingstage/shared';

/**
 * Every word the owner's pages use, in one place, said from the owner's side. The staff words for
 * the same things (STAFF_ONLY_WORDS) never appear here; a test reads the rendered pages for them.
 */
export const OWNER_WORDS = {
  jobState: OWNER_JOB_STATE_LABELS,
  findingState: OWNER_FINDING_STATE_LABELS,
  requestState: OWNER_APPROVAL_REQUEST_STATE_LABELS,
  title: 'My aircraft',
  dear: (firstName: string) => `Dear ${firstName},`,
  noAircraft: (workshop: string) => `${workshop} has no aircraft on record for you yet. If you expected to see one here, please get in touch.`,
  standing: (workshop: string) => `Here is where things stand with your aircraft at ${workshop}.`,
  nothingIn: 'Nothing is in the hangar for you at the moment.',
  inHangar: (n: string) => `${n} in the hangar now.`,
  othersBelow: 'Finished and cancelled jobs are listed too.',
  noJobs: (reg: string) => `No jobs on record for ${reg}.`,
  jobsFor: (reg: string) => `Jobs for ${reg}`,
  jobLine: 'Job',
  bookedIn: 'booked in',
  dueBack: 'due back',
  decisionNeeded: 'Your decision is needed',
  moneyLabel: 'The money so far',
  quoteState: 'Our quote',
  quoted: TOTAL_NAMES.quoted,
  quoteAwaiting: TOTAL_NAMES.quoteAwaitingOwner,
  /** One name for the total the owner has agreed to, everywhere the owner reads it. */
  agreed: TOTAL_NAMES.agreed,
  /** One name for what still waits for the owner's decision. */
  undecided: TOTAL_NAMES.undecidedOwner,
  whatWeFound: 'What we found',
  thanks: 'With thanks,',
  contactLead: 'To talk anything through, contact us:',
  call: 'Phone',
  write: 'E-mail',
  cautionHeading: 'Who decides when your aircraft may fly',
  caution:
    "We record the work and what you decide about its cost. Whether the aircraft may fly is decided by the licensed inspector under the authority's rules and the manufacturer's data.",
} as const;

/** What each job state means for the owner, in plain words and without claims the software cannot make. */
export const OWNER_JOB_MEANING: Record<JobState, string> = {
  booked_in: 'We have it booked in and will start soon.',
  inspecting: 'Our engineers are inspecting it now. If we find anything, we will price it and ask you before doing the work.',
  awaiting_owner: 'We are waiting for your decision on some work. Nothing extra is done without your say-so.',
  in_work: 'The work you agreed is under way.',
  ready_for_release: 'The work is finished. The inspector now checks it and signs the paperwork; whether the aircraft may fly is their decision.',
  invoiced: 'The invoice is ready for you.',
  paid: 'Paid in full. Thank you.',
  closed: 'All done and closed.',
  cancelled: 'This job was cancelled.',
};

/** Words that belong to the workshop's side of a job (shared: the decision page and the owner's e-mails are tested against them too). */
export { STAFF_ONLY_WORDS } from '@wingstage/shared';

/** Jobs still with the workshop (booked in up to finished), as opposed to invoiced, paid, closed or cancelled. */
export const IN_THE_HANGAR: readonly JobState[] = ['booked_in', 'inspecting', 'awaiting_owner', 'in_work', 'ready_for_release'];
