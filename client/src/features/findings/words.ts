/**
 * Words of the hangar (the engineer's checklist, findings, cautions and time), in one place so one
 * name stays one name. Wingstage records the work; who certifies is the inspector's business, and
 * cautions are about hazards to people doing the work — two different notices with two titles.
 */
export const HANGAR_WORDS = {
  caution: 'Caution',
  cautionsTitle: 'Cautions for this job',
  cautionsLead: 'Hazards to the people doing the work. Follow the workshop’s own procedures and the manufacturer’s current data as well.',
  cautionsGeneral: [
    'Treat the propeller as live whenever the ignition could be connected: switch off, remove the plug leads, and keep clear of its arc.',
    'No ignition sources near fuel or fuel vapour.',
    'Engine runs: wheels chocked, aircraft tied down, the propeller arc and the area behind it clear.',
  ],
  whoCertifiesTitle: 'Who certifies',
  checklistCaution: 'Caution',
  timeTitle: 'Time',
  time: {
    hours: 'Hours',
    workedOn: 'Date',
    note: 'What you did',
    log: 'Log time',
    none: 'No time logged yet.',
    hoursHint: 'Hours worked on that day, at most 24.',
    change: 'Change',
    remove: 'Remove',
    save: 'Save change',
    cancel: 'Cancel',
    removeQuestion: (hours: string, day: string) => `Remove ${hours} logged for ${day}? The removal is kept in the job's history.`,
    removeYes: 'Yes, remove it',
    keep: 'Keep it',
    stale: 'Someone else changed this entry a moment ago; the list now shows it as it stands. Try again if it still needs changing.',
    failed: 'Not saved. Check the connection and try again.',
    changed: 'Time entry changed; the change is in the job’s history.',
    removed: 'Time entry removed; the removal is in the job’s history.',
  },
} as const;
