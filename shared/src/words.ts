/**
 * One name for each total, used by staff pages, the owner's pages and e-mails alike (vocabulary.md:
 * one name for each thing). The owner's side says "your"; the staff side says "the owner's".
 */
export const TOTAL_NAMES = {
  /** The inspection scope as it stands (the quote; a change to it goes to the owner again). */
  quoted: 'Quoted',
  /** Inspection lines the owner has not yet agreed (staff side). */
  quoteAwaiting: 'Quote awaiting the owner',
  /** The same on the owner's pages. */
  quoteAwaitingOwner: 'Of the quote, not yet agreed',
  /** What the owner has agreed to: the accepted scope plus approved findings. */
  agreed: 'Agreed so far',
  /** Priced findings sent and not yet decided (staff side). */
  undecided: "Waiting for the owner's decision",
  /** The same total on the owner's pages. */
  undecidedOwner: 'Waiting for your decision',
  ifAllApproved: 'If everything is approved',
} as const;

/**
 * The workshop's name with the phone and e-mail the request carries, for every "contact the
 * workshop" the owner reads: "Brackenfold …: 01632 960418, office@….example". Only the name when it
 * carries neither (a request sent before they were carried).
 */
export function workshopContactWords(w: { workshopName: string; workshopPhone?: string; workshopEmail?: string }): string {
  const ways = [w.workshopPhone, w.workshopEmail].map((x) => x?.trim() ?? '').filter((x) => x.length > 0);
  return ways.length ? `${w.workshopName}: ${ways.join(', ')}` : w.workshopName;
}

/** Words that belong to the workshop's side of a job; the owner's pages and e-mails must not show them. */
export const STAFF_ONLY_WORDS = [
  'Sent to owner',
  'Priced',
  'Awaiting owner',
  'Approved within limit',
  'Approved under standing go-ahead',
  'Hold for owner',
  'Draft',
  'Inspecting',
  'In work',
  'Ready for release',
  'Approved so far',
  'Undecided',
  "Waiting for the owner's decision",
  'Link revoked',
] as const;
