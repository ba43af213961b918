/**
 * Staff-side words for the owner's standing go-ahead (the trade's "pre-authorised limit") and for
 * sending findings, in one place so one name stays one name. "Limit" alone is kept for measured
 * limits on checklist items; money the owner agreed in advance is always the standing go-ahead.
 */
export const GO_AHEAD = {
  title: 'Standing go-ahead (pre-authorised limit)',
  formLabel: 'Standing go-ahead',
  none: 'No standing go-ahead: every finding goes to the owner for a decision.',
  perFinding: 'Per finding',
  perJob: 'On this job in total',
  noneOfKind: 'None of this kind',
  usedSoFar: 'Used so far',
  headroom: 'Left to use',
  noJobTotal: 'No job total set',
  agreed: 'Agreed',
  explain:
    "Findings inside the owner's standing go-ahead are approved on their behalf when you send, marked \"Approved under standing go-ahead\", and reported to the owner. An airworthiness finding still goes to the inspector, whoever approves the cost.",
  set: 'Set a standing go-ahead',
  change: 'Change the standing go-ahead',
  save: 'Save standing go-ahead',
  saved: 'Standing go-ahead saved.',
  stale: 'Someone else changed this job meanwhile, so the standing go-ahead was not saved. The page now shows the latest; set it again.',
  fieldPerFinding: 'Up to, per finding (incl. VAT)',
  fieldPerJob: 'Up to, in total on this job (incl. VAT)',
  fieldAgreedHow: 'How the owner agreed it',
  hintPerFinding: 'Leave empty for no per-finding amount.',
  hintPerJob: 'Leave empty for no job total.',
  loadFailed: 'The standing go-ahead could not be loaded.',
} as const;

export const SENDING = {
  approvedUnderGoAhead: "Approved under the owner's standing go-ahead, and reported to the owner:",
  nothingLeft: "Nothing was left to send: every finding fell inside the owner's standing go-ahead.",
  airworthinessTicked:
    'An airworthiness finding is ticked. If the owner declines it, Wingstage will not mark the job ready for release while it is open, and the owner is told that the inspector decides when the aircraft may fly.',
} as const;
