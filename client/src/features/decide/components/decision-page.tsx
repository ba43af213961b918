import {
  describeLimit,
  FINDING_CATEGORY_MEANINGS,
  OWNER_APPROVAL_REQUEST_STATE_LABELS,
  priceChoice,
  QUOTE_STATE_OWNER_WORDS,
  TOTAL_NAMES,
  typedNameProblem,
  workshopContactWords,
  type ApprovalSnapshot,
  type Decision,
  type DecisionPageDto,
  type PricedChoice,
} from '@wingstage/shared';
import { useEffect, useId, useMemo, useRef, useState, useSyncExternalStore, type ComponentProps, type ReactNode } from 'react';
import { ApprovalRequestBadge } from '@/components/ui/approval-badges';
import { Button as BaseButton } from '@/components/ui/button';
import { CategoryBadge } from '@/components/ui/finding-badges';
import { CheckIcon, CrossIcon, DocumentIcon, EnvelopeIcon, FaultIcon, ShieldBarIcon } from '@/components/ui/icons';
import { Notice } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-client';
import { formatDateTime, formatMoney, trimDecimal } from '@/lib/format';
import { clearDraft, deviceStorage, DRAFT_DISCARD_WORDS, readDraft, saveDraft, type DecisionDraft, type DraftDiscard } from '../draft';
import { choiceOf, declinedAirworthinessWords, declinedQuoteWords, itemsOf, openingUpWords, type Choices, type PageItem, type SnapshotFinding, type SnapshotQuote } from '../items';
import { FindingPhotos } from './finding-photos';
import { DecisionDepositsNote } from './decision-deposits';

const noSubscription = () => () => {};
/**
 * False while the page is the server's first view (its HTML, and React taking it over); true once
 * React draws it in the browser. A choice made on the server's markup before React owns it would
 * tick the box on screen and never reach the page's state, so it would be neither counted nor kept
 * on the device: until then the choices are shown but cannot be changed (a moment on a slow phone).
 */
function useLive(): boolean {
  return useSyncExternalStore(
    noSubscription,
    () => true,
    () => false,
  );
}

/** The owner's pages use the 44 px size throughout. */
const Button = (props: ComponentProps<typeof BaseButton>) => <BaseButton size="lg" {...props} />;

export interface DecisionPageProps {
  page: DecisionPageDto;
  /** The link's token: the page's photos are fetched through it. */
  token: string;
  /** Sends the owner's decisions; resolves with the page as the server now holds it. */
  onSubmit: (body: { snapshotHash: string; decisions: { itemId: string; decision: Decision; note: string }[]; typedName: string }) => Promise<unknown>;
  submitting?: boolean;
  onReload?: () => void;
  /** Where the owner's unconfirmed choices are kept on the device (localStorage unless a test gives one). */
  storage?: Storage | null;
}

/** The choices made so far, without the items still open. */
const definite = (c: Choices): Record<string, Decision> => Object.fromEntries(Object.entries(c).filter((e): e is [string, Decision] => e[1] !== undefined));

// Small counts read as words in a letter.
const WORDS = ['no', 'one', 'two', 'three', 'four', 'five', 'six', 'seven', 'eight', 'nine', 'ten'];
const things = (n: number) => `${WORDS[n] ?? String(n)} ${n === 1 ? 'thing' : 'things'}`;

/**
 * The owner's decision page: a letter from the workshop, one item at a time (the quote first, then
 * each finding), with the running total always in view, then a review of every choice and a
 * typed-name confirmation. Every figure comes from `priceChoice` over the snapshot's basis, the
 * same function the e-mails, the manager's preview and the server use.
 */
export function DecisionPage({ page, token, onSubmit, submitting = false, onReload, storage: given }: DecisionPageProps) {
  const s = page.snapshot;
  const storage = given === undefined ? deviceStorage() : given;
  const superseded = page.newerLinkSentAt !== null && page.newerLinkSentAt !== undefined;
  const itemKey = itemsOf(s)
    .map((i) => i.id)
    .join(',');
  const stored = useMemo(
    () =>
      readDraft(storage, {
        requestId: s.requestId,
        snapshotHash: page.snapshotHash,
        state: page.state,
        closedReason: page.closedReason,
        superseded,
        itemIds: itemKey ? itemKey.split(',') : [],
      }),
    [storage, s.requestId, page.snapshotHash, page.state, page.closedReason, superseded, itemKey],
  );
  // A draft that does not match the request as it now stands is removed at once, never submitted.
  useEffect(() => {
    if (stored.discarded) clearDraft(storage, s.requestId);
  }, [stored, storage, s.requestId]);

  if (page.state !== 'sent' || page.closedReason || superseded) {
    return page.decisions && page.decidedAt && !superseded ? <Receipt page={page} discarded={stored.discarded} token={token} /> : <Closed page={page} discarded={stored.discarded} />;
  }
  return (
    <Deciding
      page={page}
      token={token}
      onSubmit={onSubmit}
      submitting={submitting}
      onReload={onReload}
      storage={storage}
      draft={stored.draft}
      discarded={stored.discarded}
      key={page.snapshotHash + s.requestId}
    />
  );
}

/** Says the owner's unconfirmed choices were cleared, and why. */
function DraftDropped({ discarded }: { discarded: DraftDiscard | null }) {
  if (!discarded) return null;
  return (
    <div data-testid="draft-discarded">
      <Notice title="Your earlier choices were cleared">{DRAFT_DISCARD_WORDS[discarded]}</Notice>
    </div>
  );
}

function headingOf(s: ApprovalSnapshot): string {
  if (s.quote && s.findings.length) return `Our quote and work found on ${s.registration}`;
  if (s.quote) return s.quote.changeOf === 'change' ? `Changes to our quote for ${s.registration}` : `Our quote for ${s.registration}`;
  return `Work found on ${s.registration}`;
}

function Letterhead({ s, children }: { s: ApprovalSnapshot; children?: ReactNode }) {
  return (
    <header className="flex flex-col gap-1 border-b-2 border-seam-strong pb-3">
      <p className="text-sm font-semibold uppercase tracking-wide text-slate-soft">{s.workshopName}</p>
      <h1 tabIndex={-1} className="text-2xl font-bold focus:outline-none">
        {headingOf(s)}
      </h1>
      <p className="text-sm text-slate-soft">
        {s.aircraftType} · job <span className="tabular-nums">{s.jobNumber}</span>, {s.jobTitle}
      </p>
      {children}
    </header>
  );
}

function Introduction({ s, expiresAt }: { s: ApprovalSnapshot; expiresAt: string }) {
  const found = s.findings.length;
  return (
    <div className="mt-3 flex flex-col gap-2">
      <p className="inline-flex items-center gap-1.5 self-start rounded-full border border-dusk bg-dusk-tint px-2.5 py-0.5 text-sm font-semibold text-dusk">
        <EnvelopeIcon size={15} />
        {QUOTE_STATE_OWNER_WORDS.sent}
      </p>
      <p className="text-lg">Dear {s.ownerName},</p>
      {s.message ? <p className="whitespace-pre-line">{s.message}</p> : null}
      {s.quote ? (
        <p>
          {s.quote.changeOf === 'change'
            ? `The work we quoted for ${s.registration} has changed since you agreed it. Please accept or decline the changed quote before we go on.`
            : `Here is our quote for the work on ${s.registration}. Please accept or decline it before we start.`}
          {found ? ` We also found ${things(found)} that ${found === 1 ? 'was' : 'were'} not in the quote: please approve or decline each one.` : ''} Nothing is done without
          your say-so.
        </p>
      ) : (
        <p>
          While working on {s.registration} we found {things(found)} that were not in the work we quoted. Please approve or decline each one. Nothing extra is done without
          your say-so.
        </p>
      )}
      <p className="text-sm text-slate-soft">This link works until {formatDateTime(expiresAt)}.</p>
    </div>
  );
}

function Deciding({
  page,
  token,
  onSubmit,
  submitting,
  onReload,
  storage,
  draft,
  discarded,
}: Required<Pick<DecisionPageProps, 'page' | 'token' | 'onSubmit'>> &
  Pick<DecisionPageProps, 'submitting' | 'onReload'> & { storage: Storage | null; draft: DecisionDraft | null; discarded: DraftDiscard | null }) {
  const s = page.snapshot;
  const items = useMemo(() => itemsOf(s), [s]);
  const [step, setStep] = useState(draft?.step ?? 0);
  const [choices, setChoices] = useState<Choices>(draft?.choices ?? {});
  const [notes, setNotes] = useState<Record<string, string>>(draft?.notes ?? {});
  // Set while the owner changes one item from the review: the next step goes straight back to it.
  const [returnToReview, setReturnToReview] = useState(false);
  const [restored] = useState(() => draft !== null && (Object.keys(draft.choices).length > 0 || Object.keys(draft.notes).length > 0));
  const [typedName, setTypedName] = useState('');
  const [nameError, setNameError] = useState<string | null>(null);
  const [problem, setProblem] = useState<{ message: string; reload: boolean } | null>(null);
  const topRef = useRef<HTMLDivElement>(null);
  const live = useLive();
  const reviewing = step >= items.length;
  const priced = priceChoice(s.basis, choiceOf(items, choices));

  // Every change is kept on the device at once, so a reload (or the phone dropping the tab) loses nothing.
  useEffect(() => {
    saveDraft(storage, s.requestId, { snapshotHash: page.snapshotHash, choices: definite(choices), notes, step });
  }, [storage, s.requestId, page.snapshotHash, choices, notes, step]);

  const go = (to: number, fromReview = false) => {
    setStep(to);
    setReturnToReview(fromReview);
    topRef.current?.scrollIntoView?.({ block: 'start' });
  };

  const confirm = async () => {
    setProblem(null);
    // Only the name can be wrong here (Confirm stays off until every item is decided); the server
    // checks the whole body against decisionSubmitSchema and its words come back the same way.
    const name = typedName.trim();
    const nameIssue = typedNameProblem(name);
    if (nameIssue) {
      setNameError(nameIssue);
      return;
    }
    const body = {
      snapshotHash: page.snapshotHash,
      decisions: items.map((i) => ({ itemId: i.id, decision: choices[i.id]!, note: notes[i.id]?.trim() ?? '' })),
      typedName: name,
    };
    setNameError(null);
    try {
      await onSubmit(body);
      clearDraft(storage, s.requestId);
    } catch (e) {
      if (isApiError(e) && e.status === 409) setProblem({ message: e.message, reload: true });
      else if (isApiError(e) && e.fields.snapshotHash) setProblem({ message: e.fields.snapshotHash, reload: true });
      else if (isApiError(e) && e.fields.typedName) setNameError(e.fields.typedName);
      else setProblem({ message: isApiError(e) ? e.message : 'Your decisions could not be sent. Nothing was recorded; please try again.', reload: false });
    }
  };

  const item = items[step];
  return (
    <div ref={topRef} className="flex scroll-mt-2 flex-col gap-5">
      <Letterhead s={s}>{step === 0 ? <Introduction s={s} expiresAt={page.expiresAt ?? s.expiresAt} /> : null}</Letterhead>

      <DraftDropped discarded={discarded} />
      {restored ? (
        <p className="text-sm" data-testid="draft-restored">
          The choices you made earlier on this device are back. Nothing is sent until you confirm.
        </p>
      ) : null}

      {/* The owner's controls, held until React owns them (see useLive); `contents`: no box of its own. */}
      <fieldset disabled={!live} aria-busy={!live} className="contents">
      {reviewing || !item ? (
        <Review
          s={s}
          items={items}
          priced={priced}
          choices={choices}
          notes={notes}
          onEdit={(i) => go(i, true)}
          typedName={typedName}
          setTypedName={setTypedName}
          nameError={nameError}
          clearNameError={() => setNameError(null)}
          onConfirm={() => void confirm()}
          submitting={submitting}
          problem={problem}
          onReload={onReload}
        />
      ) : (
        <ItemStep
          key={item.id}
          s={s}
          token={token}
          items={items}
          index={step}
          item={item}
          choices={choices}
          note={notes[item.id] ?? ''}
          onChoose={(d) => setChoices((c) => ({ ...c, [item.id]: d }))}
          onNote={(n) => setNotes((x) => ({ ...x, [item.id]: n }))}
          onBack={step > 0 && !returnToReview ? () => go(step - 1) : undefined}
          onNext={() => go(returnToReview ? items.length : step + 1)}
          returnToReview={returnToReview}
        />
      )}
      </fieldset>

      <RunningTotalBar currency={s.currency} priced={priced} />
    </div>
  );
}

function stepLabel(items: PageItem[], index: number): string {
  const item = items[index]!;
  const hasQuote = items[0]?.kind === 'quote';
  if (hasQuote && items.length === 1) return item.kind === 'quote' && item.quote.changeOf === 'change' ? 'Changes to the quote' : 'The quote';
  if (!hasQuote) return `Finding ${index + 1} of ${items.length}`;
  return `${index + 1} of ${items.length} · ${item.kind === 'quote' ? (item.quote.changeOf === 'change' ? 'Changes to the quote' : 'The quote') : `Finding ${item.label}`}`;
}

function nextLabel(items: PageItem[], index: number, returnToReview: boolean): string {
  if (returnToReview) return 'Back to your choices';
  const next = items[index + 1];
  if (!next) return 'Check your choices';
  return items[index]!.kind === 'quote' ? 'On to what we found →' : 'Next finding →';
}

function ItemStep({
  s,
  token,
  items,
  index,
  item,
  choices,
  note,
  onChoose,
  onNote,
  onBack,
  onNext,
  returnToReview,
}: {
  s: ApprovalSnapshot;
  token: string;
  items: PageItem[];
  index: number;
  item: PageItem;
  choices: Choices;
  note: string;
  onChoose: (d: Decision) => void;
  onNote: (n: string) => void;
  onBack?: () => void;
  onNext: () => void;
  /** Reached by "Change" from the review: the one button goes straight back to it. */
  returnToReview: boolean;
}) {
  const noteId = useId();
  const choice = choices[item.id];
  // The price of this item as it would count with the owner's other choices, opening-up apart.
  const ifApproved = priceChoice(s.basis, { ...choiceOf(items, choices), [item.id]: 'approve' });
  const own = ifApproved.items.find((i) => i.id === item.id)!;
  const needs = ifApproved.openingUp.filter((o) => o.neededBy.includes(item.id));
  const money = (a: string) => formatMoney(a, s.currency, { vat: 'incl' });
  const isQuote = item.kind === 'quote';
  const name = isQuote ? (item.quote.changeOf === 'change' ? 'the changed quote' : 'the quote') : item.finding.number;
  return (
    <section aria-labelledby={`item-${item.id}`} className="flex flex-col gap-4" data-testid={isQuote ? 'decide-quote' : 'decide-finding'}>
      <p className="text-sm font-semibold text-slate-soft" aria-live="polite">
        {stepLabel(items, index)}
      </p>
      {isQuote ? <QuoteBody id={`item-${item.id}`} quote={item.quote} s={s} /> : <FindingBody id={`item-${item.id}`} finding={item.finding} token={token} />}
      <div className="rounded-card border border-seam-strong bg-cloth-raised p-4" data-testid="decide-price">
        <p className="text-sm text-slate-soft">{isQuote ? 'The price of the quoted work' : 'The price for this'}</p>
        <p className="text-2xl font-bold tabular-nums">{money(own.gross)}</p>
        {needs.map((o) => {
          const paidByOther = ifApproved.items.some((i) => i.id !== item.id && i.choice === 'approve' && o.neededBy.includes(i.id));
          return (
            <p key={o.id} className="mt-2 text-sm" data-testid="decide-needs-opening-up">
              {paidByOther ? (
                <>
                  It needs opening-up work (“{o.name}”) that is already counted once for other work you approved, so nothing more is added for it.
                </>
              ) : (
                <>
                  It needs opening-up work (“{o.name}”): <span className="font-semibold tabular-nums">{money(o.gross)}</span>, shown on its own line and charged once
                  {o.neededBy.length > 1 ? ', however many of the items that share it you approve' : ''}.
                </>
              )}
            </p>
          );
        })}
      </div>

      <fieldset className="flex flex-col gap-3">
        <legend className="mb-2 font-semibold">Your decision on {name}</legend>
        <ChoiceOption
          name={`choice-${item.id}`}
          value="approve"
          checked={choice === 'approve'}
          onChange={() => onChoose('approve')}
          icon={<CheckIcon size={22} />}
          title={isQuote ? 'Accept' : 'Approve'}
          detail={isQuote ? 'Go ahead with the quoted work at this price.' : 'Go ahead with this work at this price.'}
        />
        <ChoiceOption
          name={`choice-${item.id}`}
          value="decline"
          checked={choice === 'decline'}
          onChange={() => onChoose('decline')}
          icon={<CrossIcon size={22} />}
          title="Decline"
          detail={isQuote ? 'Do not start the quoted work.' : 'Do not do this work now.'}
        />
      </fieldset>
      {choice === 'decline' && item.kind === 'finding' && item.finding.category === 'airworthiness' ? (
        <AirworthinessNote title="This is an airworthiness item">{declinedAirworthinessWords(s.registration)}</AirworthinessNote>
      ) : null}
      {choice === 'decline' && isQuote ? <Notice title="The quoted work waits for you">{declinedQuoteWords(s.workshopName)}</Notice> : null}
      <div className="flex flex-col gap-1">
        <label htmlFor={noteId} className="text-sm font-semibold">
          A note for the workshop (optional)
        </label>
        <textarea
          id={noteId}
          value={note}
          maxLength={1000}
          onChange={(e) => onNote(e.target.value)}
          rows={2}
          className="block w-full rounded-control border border-seam-strong bg-cloth-raised px-3 py-2 text-base"
        />
      </div>
      <nav aria-label="Your choices" className="flex gap-3">
        {onBack ? (
          <Button variant="secondary" className="flex-1" onClick={onBack}>
            ← Back
          </Button>
        ) : null}
        <Button className="flex-1" onClick={onNext}>
          {nextLabel(items, index, returnToReview)}
        </Button>
      </nav>
    </section>
  );
}

/** Marks an airworthiness item with the category's own look (shield and bar), kept apart from the error mark. */
function AirworthinessNote({ title, children }: { title: string; children: ReactNode }) {
  return (
    <div role="status" data-testid="declined-airworthiness" className="flex gap-3 rounded-card border-2 border-ember bg-ember-tint p-3 text-sm text-slate">
      <span className="text-ember">
        <ShieldBarIcon />
      </span>
      <div className="flex flex-col gap-1">
        <p className="font-semibold">{title}</p>
        <p>{children}</p>
      </div>
    </div>
  );
}

function QuoteBody({ id, quote, s }: { id: string; quote: SnapshotQuote; s: ApprovalSnapshot }) {
  return (
    <div className="flex flex-col gap-3">
      <h2 id={id} className="flex items-center gap-2 text-xl font-bold">
        <DocumentIcon size={22} />
        {quote.changeOf === 'change' ? 'Changes to the quote' : 'The quote'}
      </h2>
      <p className="text-sm">
        {quote.changeOf === 'change'
          ? `The scheduled work for ${s.registration} as it now stands. You agreed an earlier version; this replaces it once you accept.`
          : `The scheduled work for ${s.registration}, ${s.jobTitle.toLowerCase()}, as we plan to do it.`}
      </p>
      <div>
        <h3 className="text-sm font-semibold text-slate-soft">The work</h3>
        <ul className="mt-1 flex flex-col divide-y divide-seam rounded-card border border-seam bg-cloth-raised" data-testid="decide-quote-lines">
          {quote.lines.map((l, i) => (
            <li key={i} className="flex justify-between gap-3 px-3 py-2 text-sm">
              <span>{l.description}</span>
              <span className="shrink-0 tabular-nums text-slate-soft">{quantityWords(l)}</span>
            </li>
          ))}
        </ul>
      </div>
    </div>
  );
}

function quantityWords(l: SnapshotQuote['lines'][number]): string {
  const q = trimDecimal(l.quantity);
  if (l.kind === 'labour') return `${q} h`;
  if (l.kind === 'part') return `× ${q}`;
  return '';
}

function FindingBody({ id, finding: f, token }: { id: string; finding: SnapshotFinding; token: string }) {
  return (
    <>
      <div className="flex flex-col gap-2">
        <h2 id={id} className="text-xl font-bold">
          <span className="tabular-nums">{f.number}</span> · {f.title}
        </h2>
        <div className="flex flex-wrap items-center gap-2">
          <CategoryBadge category={f.category} />
        </div>
        <p className="text-sm">{FINDING_CATEGORY_MEANINGS[f.category]}</p>
      </div>
      <FindingPhotos token={token} photos={f.photos} number={f.number} title={f.title} />
      <dl className="flex flex-col gap-3">
        <div>
          <dt className="text-sm font-semibold text-slate-soft">Where</dt>
          <dd>{f.location}</dd>
        </div>
        <div>
          <dt className="text-sm font-semibold text-slate-soft">What we saw</dt>
          <dd className="whitespace-pre-line">{f.seen}</dd>
        </div>
        {f.measuredValue && f.limit ? (
          <div>
            <dt className="text-sm font-semibold text-slate-soft">What we measured</dt>
            <dd className="tabular-nums">
              <span className="block">
                {trimDecimal(f.measuredValue)} {f.limit.unit}; the example limit is {describeLimit(f.limit)}
              </span>
              {f.limit.source ? <span className="block text-sm text-slate-soft">{f.limit.source}</span> : null}
            </dd>
          </div>
        ) : null}
        {f.lines.length > 0 ? (
          <div>
            <dt className="text-sm font-semibold text-slate-soft">The work</dt>
            <dd>
              <ul className="list-disc pl-5 text-sm">
                {f.lines.map((l, i) => (
                  <li key={i}>{l.description}</li>
                ))}
              </ul>
            </dd>
          </div>
        ) : null}
      </dl>
    </>
  );
}

/**
 * A large radio choice. The chosen one is told apart by a thick border, a filled mark and the word
 * "chosen", never by colour alone.
 */
function ChoiceOption({ name, value, checked, onChange, icon, title, detail }: { name: string; value: Decision; checked: boolean; onChange: () => void; icon: ReactNode; title: string; detail: string }) {
  return (
    <label
      data-choice={value}
      className={`flex min-h-tap cursor-pointer items-center gap-3 rounded-card p-3 ${checked ? 'border-[3px] border-slate bg-cloth-raised' : 'border border-seam-strong bg-cloth-raised'}`}
    >
      <input type="radio" name={name} value={value} checked={checked} onChange={onChange} className="size-6 shrink-0 accent-harbour" />
      <span aria-hidden="true" className="shrink-0">
        {icon}
      </span>
      <span className="flex flex-col">
        <span className="text-lg font-bold">{title}</span>
        <span className="text-sm text-slate-soft">{detail}</span>
      </span>
      {checked ? (
        <span aria-hidden="true" className="ml-auto text-sm font-semibold">
          ● chosen
        </span>
      ) : null}
    </label>
  );
}

function ChoiceWord({ decision, quote }: { decision: Decision | undefined; quote: boolean }) {
  if (!decision) return <span className="font-semibold">Not chosen yet</span>;
  return (
    <span className="inline-flex items-center gap-1 font-semibold" data-decision={decision}>
      {decision === 'approve' ? <CheckIcon size={16} /> : <CrossIcon size={16} />}
      {decision === 'approve' ? (quote ? 'Accepted' : 'Approved') : 'Declined'}
    </span>
  );
}

function Review({
  s,
  items,
  priced,
  choices,
  notes,
  onEdit,
  typedName,
  setTypedName,
  nameError,
  clearNameError,
  onConfirm,
  submitting,
  problem,
  onReload,
}: {
  s: ApprovalSnapshot;
  items: PageItem[];
  priced: PricedChoice;
  choices: Choices;
  notes: Record<string, string>;
  onEdit: (i: number) => void;
  typedName: string;
  setTypedName: (v: string) => void;
  nameError: string | null;
  clearNameError: () => void;
  onConfirm: () => void;
  submitting?: boolean;
  problem: { message: string; reload: boolean } | null;
  onReload?: () => void;
}) {
  const nameId = useId();
  const missing = items.findIndex((i) => !choices[i.id]);
  return (
    <section aria-labelledby="review-heading" className="flex flex-col gap-4">
      <h2 id="review-heading" className="text-xl font-bold">
        Check your choices
      </h2>
      <ChoiceRows s={s} items={items} priced={priced} decisionOf={(id) => choices[id]} noteOf={(id) => notes[id]} attr="data-review">
        {(i) => (
          <div>
            <Button variant="quiet" onClick={() => onEdit(i)}>
              Change {items[i]!.kind === 'quote' ? 'the quote' : items[i]!.label}
            </Button>
          </div>
        )}
      </ChoiceRows>
      {missing >= 0 ? (
        <Notice tone="problem" title="Some items have no decision yet">
          <p>Decide on every item before confirming.</p>
          <div>
            <Button variant="secondary" onClick={() => onEdit(missing)}>
              Go to {items[missing]!.kind === 'quote' ? 'the quote' : items[missing]!.label}
            </Button>
          </div>
        </Notice>
      ) : null}
      <div className="flex flex-col gap-1">
        <label htmlFor={nameId} className="font-semibold">
          Type your full name to confirm
        </label>
        <p id={`${nameId}-hint`} className="text-sm text-slate-soft">
          Your name, the time and exactly what you saw on this page are recorded with your decisions.
        </p>
        <input
          id={nameId}
          value={typedName}
          onChange={(e) => {
            setTypedName(e.target.value);
            clearNameError();
          }}
          autoComplete="name"
          aria-invalid={nameError ? true : undefined}
          aria-describedby={`${nameId}-hint${nameError ? ` ${nameId}-error` : ''}`}
          className="block min-h-tap w-full rounded-control border border-seam-strong bg-cloth-raised px-3 py-2 text-base aria-[invalid=true]:border-2 aria-[invalid=true]:border-fault"
        />
        {nameError ? (
          <p id={`${nameId}-error`} role="alert" className="flex items-start gap-1 text-sm font-semibold text-fault">
            <span aria-hidden="true" className="shrink-0">
              <FaultIcon size={16} />
            </span>
            <span>{nameError}</span>
          </p>
        ) : null}
      </div>
      {problem ? (
        <Notice tone="problem" title="Your decisions were not recorded">
          <p>{problem.message}</p>
          {problem.reload && onReload ? (
            <div>
              <Button variant="secondary" onClick={onReload}>
                Reload this page
              </Button>
            </div>
          ) : null}
        </Notice>
      ) : null}
      <Button onClick={onConfirm} busy={submitting} disabled={missing >= 0}>
        Confirm decisions
      </Button>
    </section>
  );
}

/**
 * Each item with the owner's choice and what it adds, then the opening-up work the approved items
 * share, once each; the figures add up to "Approving now" exactly (priceChoice splits the engine's
 * own difference over them), so no footnote is needed.
 */
function ChoiceRows({
  s,
  items,
  priced,
  decisionOf,
  noteOf,
  attr,
  children,
}: {
  s: ApprovalSnapshot;
  items: PageItem[];
  priced: PricedChoice;
  decisionOf: (id: string) => Decision | undefined;
  noteOf: (id: string) => string | undefined;
  attr: 'data-review' | 'data-receipt';
  children?: (index: number) => ReactNode;
}) {
  const money = (a: string) => formatMoney(a, s.currency, { vat: 'incl' });
  return (
    <>
      <ul className="flex flex-col gap-3">
        {items.map((it, i) => {
          const p = priced.items.find((x) => x.id === it.id)!;
          const decision = decisionOf(it.id);
          const note = noteOf(it.id);
          return (
            <li key={it.id} {...{ [attr]: it.kind === 'quote' ? 'quote' : it.label }} className="flex flex-col gap-1 rounded-card border border-seam bg-cloth-raised p-3">
              <div className="flex flex-wrap items-baseline justify-between gap-2">
                <span className="font-semibold">
                  {it.kind === 'quote' ? (
                    it.quote.changeOf === 'change' ? 'Changes to the quote' : 'The quote'
                  ) : (
                    <>
                      <span className="tabular-nums">{it.finding.number}</span> · {it.finding.title}
                    </>
                  )}
                </span>
                <span className="tabular-nums" data-item-price={decision === 'approve' ? 'counted' : 'not-counted'}>
                  {decision === 'approve' ? money(p.gross) : <span className="text-slate-soft">{money(p.allApprovedGross)}, not included</span>}
                </span>
              </div>
              <div className="flex flex-wrap items-center gap-2">
                {it.kind === 'finding' ? <CategoryBadge category={it.finding.category} /> : null}
                <ChoiceWord decision={decision} quote={it.kind === 'quote'} />
              </div>
              {note?.trim() ? <p className="text-sm">Your note: {note}</p> : null}
              {decision === 'decline' && it.kind === 'finding' && it.finding.category === 'airworthiness' ? (
                <p className="text-sm font-semibold">{declinedAirworthinessWords(s.registration)}</p>
              ) : null}
              {decision === 'decline' && it.kind === 'quote' ? <p className="text-sm font-semibold">{declinedQuoteWords(s.workshopName)}</p> : null}
              {children?.(i)}
            </li>
          );
        })}
        {priced.openingUp.map((o) => (
          <li key={o.id} data-opening-up={o.id} className="flex flex-col gap-1 rounded-card border border-dashed border-seam-strong bg-cloth-raised p-3">
            <div className="flex flex-wrap items-baseline justify-between gap-2">
              <span className="font-semibold">{openingUpWords(o, items)}</span>
              <span className="tabular-nums">{o.charged ? money(o.gross) : <span className="text-slate-soft">{money(o.allApprovedGross)}, not needed</span>}</span>
            </div>
            <p className="text-sm text-slate-soft">
              “{o.name}”: {o.charged ? 'charged once for the work you approved that needs it.' : 'charged only if you approve work that needs it.'}
            </p>
          </li>
        ))}
      </ul>
      <p className="flex justify-between gap-2 border-t border-seam pt-2 font-semibold tabular-nums" data-testid="choice-rows-total">
        <span>{attr === 'data-receipt' ? 'You approved, incl. VAT' : 'You are approving, incl. VAT'}</span>
        <span>{formatMoney(priced.approvingNow.gross, s.currency)}</span>
      </p>
    </>
  );
}

function RunningTotalBar({ currency, priced: p }: { currency: string; priced: PricedChoice }) {
  const m = (a: string) => formatMoney(a, currency);
  return (
    <aside
      aria-label="Running total"
      data-testid="running-total"
      className="fixed inset-x-0 bottom-0 z-10 border-t-2 border-slate bg-cloth-raised px-4 py-2 shadow-[0_-2px_8px_rgba(30,42,51,0.12)]"
    >
      <div className="mx-auto grid max-w-xl grid-cols-2 gap-x-4 gap-y-1 text-sm tabular-nums">
        <p className="flex justify-between gap-2">
          <span className="text-slate-soft">{TOTAL_NAMES.agreed}</span> <span data-total="agreed-so-far">{m(p.agreedSoFar.gross)}</span>
        </p>
        <p className="flex justify-between gap-2">
          <span className="text-slate-soft">Approving now</span> <span data-total="approving-now">{m(p.approvingNow.gross)}</span>
        </p>
        <p className="col-span-2 flex justify-between gap-2">
          <span className="text-slate-soft">{TOTAL_NAMES.undecidedOwner}, if approved</span> <span data-total="undecided">{m(p.undecidedGross)}</span>
        </p>
        <p className="col-span-2 flex justify-between gap-2 border-t border-seam pt-1 text-base font-bold">
          <span>New total, incl. VAT</span>{' '}
          {/* Before any choice there is no new total to show: "£0.00" would read as a price. */}
          {p.chosen === 0 ? (
            <span data-total="new-total" data-total-pending="true" className="font-normal text-slate-soft">
              Shown once you choose
            </span>
          ) : (
            <span data-total="new-total">{m(p.newTotal.gross)}</span>
          )}
        </p>
      </div>
      <p className="mx-auto max-w-xl text-xs text-slate-soft">All figures include VAT.</p>
      <p className="sr-only" aria-live="polite">
        {p.chosen} of {p.of} decided.
      </p>
    </aside>
  );
}

function Receipt({ page, discarded, token }: { page: DecisionPageDto; discarded: DraftDiscard | null; token: string }) {
  const s = page.snapshot;
  const items = itemsOf(s);
  const byId = new Map((page.decisions ?? []).map((d) => [d.itemId, d]));
  const chosen: Choices = Object.fromEntries((page.decisions ?? []).filter((d) => items.some((i) => i.id === d.itemId)).map((d) => [d.itemId, d.decision]));
  const t = priceChoice(s.basis, choiceOf(items, chosen));
  return (
    <article className="flex flex-col gap-5" data-testid="decision-receipt">
      <Letterhead s={s} />
      <DraftDropped discarded={discarded} />
      <div className="flex flex-col gap-2">
        <h2 className="text-xl font-bold">Your decisions are recorded</h2>
        <p>
          Thank you, {page.decidedByName}. {s.workshopName} received your decisions on {formatDateTime(page.decidedAt!)}. A copy is on its way to your e-mail.
        </p>
      </div>
      <ChoiceRows s={s} items={items} priced={t} decisionOf={(id) => byId.get(id)?.decision} noteOf={(id) => byId.get(id)?.note} attr="data-receipt" />
      <dl className="grid grid-cols-[1fr_auto] gap-x-4 gap-y-1 tabular-nums">
        <dt>Agreed before</dt>
        <dd className="text-right" data-total="agreed-so-far">
          {formatMoney(t.agreedSoFar.gross, s.currency)}
        </dd>
        <dt className="font-bold">New total, incl. VAT</dt>
        <dd className="text-right font-bold" data-total="new-total">
          {formatMoney(t.newTotal.gross, s.currency)}
        </dd>
      </dl>
      <DecisionDepositsNote token={token} />
      <p data-testid="receipt-contact">To change a decision, contact {workshopContactWords(s)}.</p>
      <p>
        With thanks,
        <br />
        <span className="font-semibold">{s.workshopName}</span>
      </p>
    </article>
  );
}

const CLOSED_TITLE: Record<DecisionPageDto['state'], string> = {
  sent: 'This request cannot be decided here',
  decided: 'This request has been decided',
  expired: 'This link has run out',
  revoked: 'The workshop revoked this link',
  replaced: 'A newer request replaced this one',
};

function Closed({ page, discarded }: { page: DecisionPageDto; discarded: DraftDiscard | null }) {
  const s = page.snapshot;
  const superseded = page.newerLinkSentAt !== null && page.newerLinkSentAt !== undefined;
  return (
    <article className="flex flex-col gap-5" data-testid="decision-closed" data-superseded={superseded ? 'true' : undefined}>
      <Letterhead s={s} />
      <Notice title={superseded ? 'A newer link was sent to you' : CLOSED_TITLE[page.state]}>
        <p className="flex flex-wrap items-center gap-2">
          {superseded ? <span>This request:</span> : null}
          <ApprovalRequestBadge state={page.state} words={OWNER_APPROVAL_REQUEST_STATE_LABELS} />
        </p>
        <p>{page.closedReason ?? `This request can no longer be decided. Please contact ${workshopContactWords(s)}.`}</p>
      </Notice>
      <DraftDropped discarded={discarded} />
    </article>
  );
}

/**
 * For a link the server never issued: typed wrong or cut short by a mail program. (An older link of
 * a re-sent request is known to the server and gets the closed page, saying a newer link was sent.)
 */
export function UnknownLink() {
  return (
    <article className="flex flex-col gap-3" data-testid="decision-unknown-link">
      <h1 tabIndex={-1} className="text-2xl font-bold focus:outline-none">
        This link does not open a request
      </h1>
      <p>The link may have been cut short or changed by your e-mail program. Open it again from the e-mail, taking care to use the whole link.</p>
      <p>If it still does not open, ask the workshop to send the request again.</p>
    </article>
  );
}
