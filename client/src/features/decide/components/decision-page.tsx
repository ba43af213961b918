import {
  compareAmounts,
  decisionSubmitSchema,
  describeLimit,
  FINDING_CATEGORY_MEANINGS,
  type ApprovalSnapshot,
  type Decision,
  type DecisionPageDto,
} from '@wingstage/shared';
import { useEffect, useId, useMemo, useRef, useState, type ComponentProps, type ReactNode } from 'react';
import { ApprovalRequestBadge } from '@/components/ui/approval-badges';
import { CategoryBadge } from '@/components/ui/finding-badges';
import { CheckIcon, CrossIcon } from '@/components/ui/icons';
import { Notice } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-client';
import { formatDateTime, trimDecimal, formatMoney } from '@/lib/format';
import { FindingPhotos } from './finding-photos';
import { Button as BaseButton } from '@/components/ui/button';
import { clearDraft, deviceStorage, DRAFT_DISCARD_WORDS, readDraft, saveDraft, type DecisionDraft, type DraftDiscard } from '../draft';
import { accessSavingWords, addsWithChoices, declinedAirworthinessWords, runningTotal, type Choices, type RunningTotal } from './running-total';

/** The owner's pages use the 44 px size throughout. */
const Button = (props: ComponentProps<typeof BaseButton>) => <BaseButton size="lg" {...props} />;

type SnapshotFinding = ApprovalSnapshot['findings'][number];

export interface DecisionPageProps {
  page: DecisionPageDto;
  /** The link's token: the page's photos are fetched through it. */
  token: string;
  /** Sends the owner's decisions; resolves with the page as the server now holds it. */
  onSubmit: (body: { snapshotHash: string; decisions: { findingId: string; decision: Decision; note: string }[]; typedName: string }) => Promise<unknown>;
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
 * The owner's decision page: a letter from the workshop, one finding at a time, with the running
 * total always in view, then a review of every choice and a typed-name confirmation.
 */
export function DecisionPage({ page, token, onSubmit, submitting = false, onReload, storage: given }: DecisionPageProps) {
  const s = page.snapshot;
  const storage = given === undefined ? deviceStorage() : given;
  const superseded = page.newerLinkSentAt !== null && page.newerLinkSentAt !== undefined;
  const itemKey = s.findings.map((f) => f.findingId).join(',');
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
    return page.decisions && page.decidedAt && !superseded ? <Receipt page={page} discarded={stored.discarded} /> : <Closed page={page} discarded={stored.discarded} />;
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

function Letterhead({ s, children }: { s: ApprovalSnapshot; children?: ReactNode }) {
  return (
    <header className="flex flex-col gap-1 border-b-2 border-seam-strong pb-3">
      <p className="text-sm font-semibold uppercase tracking-wide text-slate-soft">{s.workshopName}</p>
      <h1 tabIndex={-1} className="text-2xl font-bold focus:outline-none">
        Work found on {s.registration}
      </h1>
      <p className="text-sm text-slate-soft">
        {s.aircraftType} · job <span className="tabular-nums">{s.jobNumber}</span>, {s.jobTitle}
      </p>
      {children}
    </header>
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
  const reviewing = step === s.findings.length;
  const totals = runningTotal(s, choices);

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
    const body = {
      snapshotHash: page.snapshotHash,
      decisions: s.findings.map((f) => ({ findingId: f.findingId, decision: choices[f.findingId]!, note: notes[f.findingId]?.trim() ?? '' })),
      typedName,
    };
    const parsed = decisionSubmitSchema.safeParse(body);
    if (!parsed.success) {
      const nameIssue = parsed.error.issues.find((i) => i.path[0] === 'typedName');
      setNameError(nameIssue?.message ?? null);
      if (!nameIssue) setProblem({ message: parsed.error.issues[0]?.message ?? 'Please check your choices.', reload: false });
      return;
    }
    setNameError(null);
    try {
      await onSubmit(parsed.data);
      clearDraft(storage, s.requestId);
    } catch (e) {
      if (isApiError(e) && e.status === 409) setProblem({ message: e.message, reload: true });
      else if (isApiError(e) && e.fields.snapshotHash) setProblem({ message: e.fields.snapshotHash, reload: true });
      else if (isApiError(e) && e.fields.typedName) setNameError(e.fields.typedName);
      else setProblem({ message: isApiError(e) ? e.message : 'Your decisions could not be sent. Nothing was recorded; please try again.', reload: false });
    }
  };

  return (
    <div ref={topRef} className="flex scroll-mt-2 flex-col gap-5">
      <Letterhead s={s}>
        {step === 0 ? (
          <div className="mt-3 flex flex-col gap-2">
            <p className="text-lg">Dear {s.ownerName},</p>
            {s.message ? <p className="whitespace-pre-line">{s.message}</p> : null}
            <p>
              While working on {s.registration} we found {things(s.findings.length)} that were not in the work we quoted. Please approve or decline each one. Nothing extra is done without your say-so.
            </p>
            <p className="text-sm text-slate-soft">This link works until {formatDateTime(s.expiresAt)}.</p>
          </div>
        ) : null}
      </Letterhead>

      <DraftDropped discarded={discarded} />
      {restored ? (
        <p className="text-sm" data-testid="draft-restored">
          The choices you made earlier on this device are back. Nothing is sent until you confirm.
        </p>
      ) : null}

      {reviewing ? (
        <Review
          s={s}
          totals={totals}
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
        <FindingStep
          key={s.findings[step]!.findingId}
          s={s}
          token={token}
          index={step}
          finding={s.findings[step]!}
          choice={choices[s.findings[step]!.findingId]}
          adds={addsWithChoices(s, choices, s.findings[step]!.findingId)}
          note={notes[s.findings[step]!.findingId] ?? ''}
          onChoose={(d) => setChoices((c) => ({ ...c, [s.findings[step]!.findingId]: d }))}
          onNote={(n) => setNotes((x) => ({ ...x, [s.findings[step]!.findingId]: n }))}
          onBack={step > 0 && !returnToReview ? () => go(step - 1) : undefined}
          onNext={() => go(returnToReview ? s.findings.length : step + 1)}
          last={step === s.findings.length - 1}
          returnToReview={returnToReview}
        />
      )}

      <RunningTotalBar currency={s.currency} totals={totals} />
    </div>
  );
}

function FindingStep({
  s,
  token,
  index,
  finding: f,
  choice,
  adds,
  note,
  onChoose,
  onNote,
  onBack,
  onNext,
  last,
  returnToReview,
}: {
  s: ApprovalSnapshot;
  token: string;
  index: number;
  finding: SnapshotFinding;
  choice: Decision | undefined;
  /** What approving it adds alongside the owner's other approvals (null for an older snapshot). */
  adds: string | null;
  note: string;
  onChoose: (d: Decision) => void;
  onNote: (n: string) => void;
  onBack?: () => void;
  onNext: () => void;
  last: boolean;
  /** Reached by "Change" from the review: the one button goes straight back to it. */
  returnToReview: boolean;
}) {
  const noteId = useId();
  const saving = accessSavingWords(f, formatMoney(f.accessSavingGross, s.currency, { vat: 'incl' }));
  return (
    <section aria-labelledby={`f-${f.findingId}`} className="flex flex-col gap-4" data-testid="decide-finding">
      <p className="text-sm font-semibold text-slate-soft" aria-live="polite">
        Finding {index + 1} of {s.findings.length}
      </p>
      <div className="flex flex-col gap-2">
        <h2 id={`f-${f.findingId}`} className="text-xl font-bold">
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
      <div className="rounded-card border border-seam-strong bg-cloth-raised p-4" data-testid="decide-price">
        <p className="text-sm text-slate-soft">The price for this</p>
        <p className="text-2xl font-bold tabular-nums">{formatMoney(f.price.gross, s.currency, { vat: 'incl' })}</p>
        <p className="text-sm tabular-nums text-slate-soft">{formatMoney(f.price.net, s.currency, { vat: 'excl' })}</p>
        {saving ? <p className="mt-2 text-sm">{saving}</p> : null}
        {adds !== null && compareAmounts(adds, f.price.gross) < 0 ? (
          <p className="mt-2 text-sm" data-testid="decide-adds">
            With the work you have approved, this adds <span className="font-semibold tabular-nums">{formatMoney(adds, s.currency, { vat: 'incl' })}</span>: the opening-up it needs is
            already being done, and is charged once.
          </p>
        ) : null}
      </div>

      <fieldset className="flex flex-col gap-3">
        <legend className="mb-2 font-semibold">Your decision on {f.number}</legend>
        <ChoiceOption name={`choice-${f.findingId}`} value="approve" checked={choice === 'approve'} onChange={() => onChoose('approve')} icon={<CheckIcon size={22} />} title="Approve" detail="Go ahead with this work at this price." />
        <ChoiceOption name={`choice-${f.findingId}`} value="decline" checked={choice === 'decline'} onChange={() => onChoose('decline')} icon={<CrossIcon size={22} />} title="Decline" detail="Do not do this work now." />
      </fieldset>
      {choice === 'decline' && f.category === 'airworthiness' ? (
        <Notice tone="problem" title="This cannot be left open for flying">
          {declinedAirworthinessWords(s.registration)}
        </Notice>
      ) : null}
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
      <nav aria-label="Findings" className="flex gap-3">
        {onBack ? (
          <Button variant="secondary" className="flex-1" onClick={onBack}>
            ← Back
          </Button>
        ) : null}
        <Button className="flex-1" onClick={onNext}>
          {returnToReview ? 'Back to your choices' : last ? 'Review your choices' : 'Next finding →'}
        </Button>
      </nav>
    </section>
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

function ChoiceWord({ decision }: { decision: Decision | undefined }) {
  if (!decision) return <span className="font-semibold">Not chosen yet</span>;
  return (
    <span className="inline-flex items-center gap-1 font-semibold" data-decision={decision}>
      {decision === 'approve' ? <CheckIcon size={16} /> : <CrossIcon size={16} />}
      {decision === 'approve' ? 'Approved' : 'Declined'}
    </span>
  );
}

function Review({
  s,
  totals,
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
  totals: RunningTotal;
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
  const missing = s.findings.findIndex((f) => !choices[f.findingId]);
  return (
    <section aria-labelledby="review-heading" className="flex flex-col gap-4">
      <h2 id="review-heading" className="text-xl font-bold">
        Check your choices
      </h2>
      <ul className="flex flex-col gap-3">
        {s.findings.map((f, i) => (
          <DecidedRow key={f.findingId} finding={f} snapshot={s} decision={choices[f.findingId]} note={notes[f.findingId]} data-review={f.number}>
            <div>
              <Button variant="quiet" onClick={() => onEdit(i)}>
                Change {f.number}
              </Button>
            </div>
          </DecidedRow>
        ))}
      </ul>
      <SharedSaving totals={totals} currency={s.currency} />
      {missing >= 0 ? (
        <Notice tone="problem" title="Some findings have no decision yet">
          <p>Approve or decline every finding before confirming.</p>
          <div>
            <Button variant="secondary" onClick={() => onEdit(missing)}>
              Go to {s.findings[missing]!.number}
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
          className="block min-h-tap w-full rounded-control border border-seam-strong bg-cloth-raised px-3 py-2 text-base aria-[invalid=true]:border-2 aria-[invalid=true]:border-ember"
        />
        {nameError ? (
          <p id={`${nameId}-error`} role="alert" className="flex items-start gap-1 text-sm font-semibold text-ember">
            <span aria-hidden="true">▲</span>
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

/** Why the approved findings come to less than their prices added up. */
function SharedSaving({ totals: t, currency }: { totals: RunningTotal; currency: string }) {
  if (!t.sharedSaving) return null;
  return (
    <p className="text-sm" data-testid="decide-shared-saving">
      The findings approved share opening-up work, which is charged once: together they come to{' '}
      <span className="font-semibold tabular-nums">{formatMoney(t.thisRequestAsChosen, currency, { vat: 'incl' })}</span>, which is{' '}
      <span className="font-semibold tabular-nums">{formatMoney(t.sharedSaving, currency)}</span> less than their prices added up.
    </p>
  );
}

/**
 * When VAT is worked on the whole invoice, what a choice adds to the bill can differ by a penny from
 * the approved work's own price; said once, so the figures that differ are explained.
 */
function VatOnWholeBill({ totals: t, currency }: { totals: RunningTotal; currency: string }) {
  if (!t.wholeInvoice || compareAmounts(t.addsToTotal, t.thisRequestAsChosen) === 0) return null;
  return (
    <p className="mx-auto max-w-xl pt-1 text-xs text-slate-soft" data-testid="decide-vat-whole-bill">
      VAT is worked out on the whole bill, so what you are approving adds {formatMoney(t.addsToTotal, currency)} to it, not the{' '}
      {formatMoney(t.thisRequestAsChosen, currency)} it comes to on its own.
    </p>
  );
}

function RunningTotalBar({ currency, totals: t }: { currency: string; totals: RunningTotal }) {
  const m = (a: string) => formatMoney(a, currency);
  return (
    <aside
      aria-label="Running total"
      data-testid="running-total"
      className="fixed inset-x-0 bottom-0 z-10 border-t-2 border-slate bg-cloth-raised px-4 py-2 shadow-[0_-2px_8px_rgba(30,42,51,0.12)]"
    >
      <div className="mx-auto grid max-w-xl grid-cols-2 gap-x-4 gap-y-1 text-sm tabular-nums">
        <p className="flex justify-between gap-2">
          <span className="text-slate-soft">First quoted</span> <span data-total="quoted">{m(t.quoted)}</span>
        </p>
        <p className="flex justify-between gap-2">
          <span className="text-slate-soft">Approved so far</span> <span data-total="approved-so-far">{m(t.approvedSoFar)}</span>
        </p>
        <p className="flex justify-between gap-2">
          <span className="text-slate-soft">Approving now</span> <span data-total="this-request">{m(t.addsToTotal)}</span>
        </p>
        <p className="flex justify-between gap-2">
          <span className="text-slate-soft">Not yet decided</span> <span data-total="undecided">{m(t.undecided)}</span>
        </p>
        <p className="col-span-2 flex justify-between gap-2 border-t border-seam pt-1 text-base font-bold">
          <span>New total, incl. VAT</span> <span data-total="new-total">{m(t.newTotal)}</span>
        </p>
      </div>
      <VatOnWholeBill totals={t} currency={currency} />
      {!t.exact && t.sharesOpeningUp && t.chosen > 0 && t.chosen < t.of ? (
        <p className="mx-auto max-w-xl pt-1 text-xs text-slate-soft">Some findings share opening-up work, charged once when approved together, so part-way figures may come out lower.</p>
      ) : null}
      <p className="sr-only" aria-live="polite">
        {t.chosen} of {t.of} decided.
      </p>
    </aside>
  );
}

function Receipt({ page, discarded }: { page: DecisionPageDto; discarded: DraftDiscard | null }) {
  const s = page.snapshot;
  const byId = new Map((page.decisions ?? []).map((d) => [d.findingId, d]));
  const chosen: Choices = Object.fromEntries((page.decisions ?? []).map((d) => [d.findingId, d.decision]));
  const t = runningTotal(s, chosen);
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
      <ul className="flex flex-col gap-3">
        {s.findings.map((f) => {
          const d = byId.get(f.findingId);
          return (
            <DecidedRow key={f.findingId} finding={f} snapshot={s} decision={d?.decision} note={d?.note} data-receipt={f.number} />
          );
        })}
      </ul>
      <SharedSaving totals={t} currency={s.currency} />
      <dl className="grid grid-cols-[1fr_auto] gap-x-4 gap-y-1 tabular-nums">
        <dt>First quoted</dt>
        <dd className="text-right">{formatMoney(t.quoted, s.currency)}</dd>
        <dt>You approved in this request</dt>
        <dd className="text-right">{formatMoney(t.addsToTotal, s.currency)}</dd>
        <dt className="font-bold">New total, incl. VAT</dt>
        <dd className="text-right font-bold" data-total="new-total">
          {formatMoney(t.newTotal, s.currency)}
        </dd>
      </dl>
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
  revoked: 'The workshop withdrew this link',
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
          <ApprovalRequestBadge state={page.state} />
        </p>
        <p>{page.closedReason ?? `This request can no longer be decided. Please contact ${s.workshopName}.`}</p>
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
        This link no longer opens a request
      </h1>
      <p>The link may have been cut short or changed by your e-mail program. Open it again from the e-mail, taking care to use the whole link.</p>
      <p>If it still does not open, ask the workshop to send the request again.</p>
    </article>
  );
}

/** One finding with the owner's choice, as the review before confirming and the receipt after it list them. */
function DecidedRow({
  finding: f,
  snapshot: s,
  decision,
  note,
  children,
  ...data
}: {
  finding: ApprovalSnapshot['findings'][number];
  snapshot: ApprovalSnapshot;
  decision: Decision | undefined;
  note: string | undefined;
  children?: ReactNode;
  'data-review'?: string;
  'data-receipt'?: string;
}) {
  return (
    <li {...data} className="flex flex-col gap-1 rounded-card border border-seam bg-cloth-raised p-3">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <span className="font-semibold">
          <span className="tabular-nums">{f.number}</span> · {f.title}
        </span>
        <span className="tabular-nums">{formatMoney(f.price.gross, s.currency, { vat: 'incl' })}</span>
      </div>
      <div className="flex flex-wrap items-center gap-2">
        <CategoryBadge category={f.category} />
        <ChoiceWord decision={decision} />
      </div>
      {note?.trim() ? <p className="text-sm">Your note: {note}</p> : null}
      {decision === 'decline' && f.category === 'airworthiness' ? <p className="text-sm font-semibold">{declinedAirworthinessWords(s.registration)}</p> : null}
      {children}
    </li>
  );
}
