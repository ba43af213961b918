import { FINDING_CATEGORY_LABELS, QUOTE_ITEM_ID, type ApprovalSnapshot, type Choice, type Decision, type PricedChoice } from '@wingstage/shared';

/** The owner's choice on each item of the request ("quote" or a finding's id); undefined while open. */
export type Choices = Record<string, Decision | undefined>;

export type SnapshotFinding = ApprovalSnapshot['findings'][number];
export type SnapshotQuote = NonNullable<ApprovalSnapshot['quote']>;

/** One thing the owner decides on, in the page's order: the quote first, then each finding. */
export type PageItem = { id: typeof QUOTE_ITEM_ID; kind: 'quote'; quote: SnapshotQuote; label: string } | { id: string; kind: 'finding'; finding: SnapshotFinding; label: string };

export function itemsOf(s: ApprovalSnapshot): PageItem[] {
  const items: PageItem[] = [];
  if (s.quote) items.push({ id: QUOTE_ITEM_ID, kind: 'quote', quote: s.quote, label: s.quote.changeOf === 'change' ? 'the changes to the quote' : 'the quote' });
  for (const f of s.findings) items.push({ id: f.findingId, kind: 'finding', finding: f, label: f.number });
  return items;
}

/** Only the items of this request, so a stray key can never reach the pricing. */
export function choiceOf(items: PageItem[], choices: Choices): Choice {
  return Object.fromEntries(items.map((i) => [i.id, choices[i.id]]));
}

/** "F-1", "the quote and F-2", "F-1, F-2 and F-3". */
export function listWords(words: string[]): string {
  if (words.length <= 1) return words[0] ?? '';
  return `${words.slice(0, -1).join(', ')} and ${words[words.length - 1]}`;
}

/** Opening-up work in words, naming the items that share it: "Opening-up work shared by F-1 and F-2". */
export function openingUpWords(o: PricedChoice['openingUp'][number], items: PageItem[]): string {
  const names = o.neededBy.map((id) => items.find((i) => i.id === id)?.label ?? id);
  return o.neededBy.length > 1 ? `Opening-up work shared by ${listWords(names)}` : `Opening-up work for ${names[0] ?? 'this work'}`;
}

/**
 * The product brief: a declined airworthiness defect is still a defect. Said plainly: Wingstage
 * holds back its own "ready for release" state; whether the aircraft may fly is the inspector's call.
 */
export function declinedAirworthinessWords(registration: string): string {
  return `You have declined an ${FINDING_CATEGORY_LABELS.airworthiness.toLowerCase()} item. While it is open, we will not mark ${registration} ready for release in Wingstage. Whether the aircraft may fly is the inspector's decision under the authority's rules; we will talk it through with you.`;
}

/** Declining the quote: nothing of the scheduled work is started without the owner's agreement. */
export function declinedQuoteWords(workshopName: string): string {
  return `We will not start the quoted work without your agreement. ${workshopName} will be in touch to talk it through.`;
}

