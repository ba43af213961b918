import {
  compareAmounts,
  Dec,
  formatAmount,
  minorUnits,
  FINDING_CATEGORY_LABELS,
  priceEstimate,
  sumAmounts,
  type ApprovalSnapshot,
  type Decision,
  type EstimateInput,
  type EstimateLineInput,
  type EstimateStage,
  type PricedEstimate,
  type SnapshotLine,
  type VatRateCode,
  type VatRounding,
  type WorkshopPricing,
} from '@wingstage/shared';

export type Choices = Record<string, Decision | undefined>;

export interface RunningTotal {
  quoted: string;
  approvedSoFar: string;
  /** This request, counting only what the owner has chosen to approve. */
  thisRequestAsChosen: string;
  /** Findings of this request without a choice yet, plus discovered work awaiting a decision elsewhere. */
  undecided: string;
  /**
   * What the bill would come to after this choice. With the committed work in the snapshot it is the
   * engine's committed total of the whole estimate as it would then stand (VAT worked on the whole
   * invoice where the workshop rounds that way), so it is exactly what the estimate shows after
   * deciding; otherwise approved so far plus this request as chosen.
   */
  newTotal: string;
  /** newTotal − approvedSoFar: how much this choice adds to the bill, so the figures shown add up. */
  addsToTotal: string;
  /** True when newTotal is the whole estimate priced at once (the snapshot carries the committed work). */
  wholeInvoice: boolean;
  /**
   * True when the figures come from the pricing engine run on the owner's choice (every snapshot
   * sent with a pricing basis). False for an older snapshot, whose part-way figures add up the
   * findings' own prices and so may count shared opening-up more than once.
   */
  exact: boolean;
  /**
   * The findings' own prices add up to more than the request: some share opening-up work that is
   * charged once when they are approved together.
   */
  sharesOpeningUp: boolean;
  /**
   * How much less the approved findings come to than their own prices added up, because opening-up
   * they share is charged once; null when nothing is shared or the figures are not the engine's.
   */
  sharedSaving: string | null;
  chosen: number;
  of: number;
}

const STAGE_OF: Record<Decision, EstimateStage> = { approve: 'approved', decline: 'declined' };

/** A snapshot line as the engine takes it, keeping its kind; `net` is already after any discount. */
function engineLine(
  l: Pick<SnapshotLine, 'kind' | 'net' | 'accessTaskId'>,
  common: { id: string; stage: EstimateStage; findingId: string | null; vatRate: VatRateCode },
): EstimateLineInput {
  const base = { ...common, accessTaskId: l.accessTaskId ?? null };
  switch (l.kind) {
    case 'labour':
      return { ...base, kind: 'labour', hours: '1', ratePerHour: l.net };
    case 'part':
      return { ...base, kind: 'part', quantity: '1', unitPrice: l.net };
    case 'subcontract':
      return { ...base, kind: 'subcontract', cost: l.net, markupPercent: '0' };
    case 'fee':
      return { ...base, kind: 'fee', amount: l.net };
  }
}

const hasBasis = (s: ApprovalSnapshot): s is ApprovalSnapshot & { pricingBasis: NonNullable<ApprovalSnapshot['pricingBasis']> } =>
  s.pricingBasis !== undefined && s.findings.every((f) => f.lines.every((l) => l.vatRate !== undefined));

/**
 * The pricing engine's input for the owner's current choice: each finding's lines in the stage
 * its choice puts them (approved, declined, or still discovered while undecided), the request's
 * opening-up tasks, and a nil inspection-scope line naming each task committed work already pays
 * for, so the engine charges that task there and never in this request. Null for a snapshot sent
 * before the pricing basis existed.
 */
export function snapshotEngineInput(snapshot: ApprovalSnapshot, choices: Choices): { input: EstimateInput; pricing: WorkshopPricing } | null {
  if (!hasBasis(snapshot)) return null;
  const basis = snapshot.pricingBasis;
  const lines: EstimateLineInput[] = [];
  for (const f of snapshot.findings) {
    const choice = choices[f.findingId];
    const stage: EstimateStage = choice ? STAGE_OF[choice] : 'discovered';
    f.lines.forEach((l, i) => lines.push(engineLine(l, { id: `${f.findingId}:${i}`, stage, findingId: f.findingId, vatRate: l.vatRate ?? 'standard' })));
  }
  for (const id of basis.accessPaid) {
    lines.push({ id: `paid:${id}`, stage: 'inspection', kind: 'fee', amount: '0', vatRate: 'zero', accessTaskId: id });
  }
  return {
    input: {
      lines,
      // Hours × rate was rounded once at sending; one hour at that price gives the same net.
      accessTasks: basis.accessTasks.map((t) => ({ id: t.id, hours: '1', ratePerHour: t.net, vatRate: t.vatRate })),
    },
    pricing: {
      currency: snapshot.currency,
      vatRounding: snapshot.rounding as VatRounding,
      vatRates: basis.vatRates,
      // Every line already carries its sell price, so no mark-up applies.
      partsMarkupPercent: '0',
      subcontractMarkupPercent: '0',
    },
  };
}

/**
 * The whole estimate as it would stand after the owner's current choice: the committed work frozen
 * at sending (inspection scope and approved work, in their own stages) plus this request's lines in
 * the stages the choice puts them. Its `committed` total is what the estimate will show once the
 * owner decides. Null for a snapshot sent without the committed work.
 */
export function wholeEstimateInput(snapshot: ApprovalSnapshot, choices: Choices): { input: EstimateInput; pricing: WorkshopPricing } | null {
  const request = snapshotEngineInput(snapshot, choices);
  const committed = snapshot.pricingBasis?.committed;
  if (!request || !committed) return null;
  // The committed lines name the tasks they pay for, so the request's nil placeholder lines are not needed.
  const lines = request.input.lines.filter((l) => !l.id.startsWith('paid:'));
  committed.lines.forEach((l, i) => lines.push(engineLine(l, { id: `committed:${i}`, stage: l.stage, findingId: null, vatRate: l.vatRate })));
  const tasks = new Map((request.input.accessTasks ?? []).map((t) => [t.id, t]));
  for (const t of committed.accessTasks) {
    if (!tasks.has(t.id)) tasks.set(t.id, { id: t.id, hours: '1', ratePerHour: t.net, vatRate: t.vatRate });
  }
  return { input: { lines, accessTasks: [...tasks.values()] }, pricing: request.pricing };
}

/** The engine's figures for the whole estimate after the owner's current choice, or null (see `wholeEstimateInput`). */
export function priceWholeChoice(snapshot: ApprovalSnapshot, choices: Choices): PricedEstimate | null {
  const e = wholeEstimateInput(snapshot, choices);
  return e ? priceEstimate(e.input, e.pricing) : null;
}

/** The engine's figures for the owner's current choice, or null for an older snapshot. */
export function priceChoice(snapshot: ApprovalSnapshot, choices: Choices): PricedEstimate | null {
  const e = snapshotEngineInput(snapshot, choices);
  return e ? priceEstimate(e.input, e.pricing) : null;
}

/**
 * The running total for the owner's choice. With a pricing basis in the snapshot the request is
 * priced by the same engine as the estimate: what is approved lands in the approved stage, what is
 * still open in the discovered stage, and opening-up shared by several findings is charged once,
 * in the first of those stages that uses it, for every combination of choices. An older snapshot
 * falls back to the findings' own prices (and the engine's request total when a figure covers the
 * whole request).
 */
export function runningTotal(snapshot: ApprovalSnapshot, choices: Choices): RunningTotal {
  const c = snapshot.currency;
  const findings = snapshot.findings;
  const open = findings.filter((f) => choices[f.findingId] === undefined);
  const whole = snapshot.totals.thisRequest.gross;
  const common = {
    quoted: snapshot.totals.quoted.gross,
    approvedSoFar: snapshot.totals.approvedSoFar.gross,
    sharesOpeningUp: compareAmounts(sumAmounts(findings.map((f) => f.price.gross), c), whole) > 0,
    chosen: findings.length - open.length,
    of: findings.length,
  };
  const priced = priceChoice(snapshot, choices);
  if (priced) {
    const thisRequestAsChosen = priced.stages.approved.gross;
    const ownPrices = sumAmounts(findings.filter((f) => choices[f.findingId] === 'approve').map((f) => f.price.gross), c);
    const saving = sumAmounts([ownPrices, `-${thisRequestAsChosen}`], c);
    const whole = priceWholeChoice(snapshot, choices);
    // With invoice-total rounding, VAT on the whole bill can differ by a penny from the two parts' VAT added.
    const newTotal = whole ? whole.committed.gross : sumAmounts([snapshot.totals.approvedSoFar.gross, thisRequestAsChosen], c);
    return {
      ...common,
      sharedSaving: compareAmounts(saving, '0') > 0 ? saving : null,
      thisRequestAsChosen,
      undecided: sumAmounts([priced.stages.discovered.gross, snapshot.totals.undecidedElsewhere.gross], c),
      newTotal,
      addsToTotal: formatAmount(new Dec(newTotal).minus(snapshot.totals.approvedSoFar.gross), minorUnits(c)),
      wholeInvoice: whole !== null,
      exact: true,
    };
  }
  const approved = findings.filter((f) => choices[f.findingId] === 'approve');
  // A whole request is the engine's own figure; a part of it is the sum of the findings' own prices.
  const partOf = (part: typeof findings) => (part.length === findings.length && findings.length > 0 ? whole : sumAmounts(part.map((f) => f.price.gross), c));
  const thisRequestAsChosen = partOf(approved);
  return {
    ...common,
    sharedSaving: null,
    thisRequestAsChosen,
    undecided: sumAmounts([partOf(open), snapshot.totals.undecidedElsewhere.gross], c),
    newTotal: sumAmounts([snapshot.totals.approvedSoFar.gross, thisRequestAsChosen], c),
    addsToTotal: thisRequestAsChosen,
    wholeInvoice: false,
    exact: false,
  };
}

/**
 * What approving this finding would add, given the owner's other choices: less than its own price
 * when opening-up it needs is already paid for by a finding they have approved. Null for an older
 * snapshot.
 */
export function addsWithChoices(snapshot: ApprovalSnapshot, choices: Choices, findingId: string): string | null {
  const priced = priceChoice(snapshot, { ...choices, [findingId]: undefined });
  return priced?.findings.find((f) => f.findingId === findingId)?.price.gross ?? null;
}

/**
 * The product brief: a declined airworthiness defect is still a defect. Said plainly, and always
 * deferring to the inspector.
 */
export function declinedAirworthinessWords(registration: string): string {
  return `You have declined an ${FINDING_CATEGORY_LABELS.airworthiness.toLowerCase()} item. ${registration} cannot be released to fly while it is open. The inspector decides what the aircraft needs before release, and we will talk it through with you.`;
}

/** The access-labour saving, in words, or null when there is none. */
export function accessSavingWords(f: ApprovalSnapshot['findings'][number], formatted: string): string | null {
  if (f.accessCovered.length === 0 || compareAmounts(f.accessSavingGross, '0') <= 0) return null;
  const tasks = f.accessCovered.map((t) => `“${t}”`).join(' and ');
  return `The opening-up work (${tasks}) is already being done for other work, so it is not charged again here. That saves you ${formatted}.`;
}
