/** The Accounts area's words, in one place. */
export const ACCOUNTS_WORDS = {
  area: 'Accounts',
  ledger: { title: 'Ledger', lead: 'Every amount received and handed back, what the card processor kept, and what each one settles.' },
  payouts: { title: 'Payouts', lead: 'Money the card processor sent to the bank, and whether the payments in each one add up to it.' },
  exceptions: { title: 'Exceptions', lead: 'Things that do not match. Each one stays here until someone says, in a note, how it was settled.' },
  agedDebt: { title: 'Aged debt', lead: 'What each owner still owes on issued invoices, by how long it is past the due date.' },
  vat: { title: 'VAT summary', lead: 'Output VAT for a period: deposits at the date received, invoices at their tax point, credit notes at their own date.' },
  weeks: { title: 'Weeks', lead: 'Invoiced, received and paid out in each of the last thirteen weeks.' },
  addsUp: 'Adds up',
  doesNotAddUp: 'Does not add up',
} as const;
