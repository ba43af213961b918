import type { VatRounding } from './vat.js';

export const ESTIMATE_STAGES = ['inspection', 'discovered', 'approved', 'declined'] as const;
export type EstimateStage = (typeof ESTIMATE_STAGES)[number];

export const LINE_KINDS = ['labour', 'part', 'subcontract', 'fee'] as const;
export type LineKind = (typeof LINE_KINDS)[number];

/**
 * VAT treatment of a line. Exempt and outside-the-scope lines carry no VAT but are kept apart from
 * zero-rated ones, because a VAT invoice must say which supplies are zero-rated or exempt [source:
 * VAT Regulations 1995 reg 14(1), restated in VAT Notice 700 §16.3].
 */
export const VAT_RATE_CODES = ['standard', 'reduced', 'zero', 'exempt', 'outside'] as const;
export type VatRateCode = (typeof VAT_RATE_CODES)[number];

/** A discount on one line: a percentage of the line, or a fixed amount no larger than the line. */
export type LineDiscount = { percent: string } | { amount: string };

interface LineCommon {
  /** Unique within the estimate; echoed on the priced line. */
  id: string;
  stage: EstimateStage;
  vatRate: VatRateCode;
  /** The finding whose remedy this line belongs to; none for scheduled-scope lines. */
  findingId?: string | null;
  /** The opening-up work this line needs, charged once however many lines share it. */
  accessTaskId?: string | null;
  discount?: LineDiscount | null;
  /**
   * Inspection-scope lines only: has the owner agreed this line of the quote (online, by phone, or
   * recorded before quotes were agreed)? Undefined counts as agreed; the server always says.
   * An unagreed inspection line is quoted but awaits the owner like discovered work.
   */
  agreed?: boolean;
}

/** Hours × a labour rate per hour. */
export interface LabourLineInput extends LineCommon {
  kind: 'labour';
  hours: string;
  ratePerHour: string;
}

/**
 * Quantity × unit cost with a mark-up on cost (the workshop's, unless the line gives its own), or
 * quantity × a fixed sell price when `unitPrice` is given.
 */
export interface PartLineInput extends LineCommon {
  kind: 'part';
  quantity: string;
  unitCost?: string | null;
  markupPercent?: string | null;
  unitPrice?: string | null;
}

/** Work sent out: the supplier's cost plus a mark-up (the workshop's, unless the line gives its own). */
export interface SubcontractLineInput extends LineCommon {
  kind: 'subcontract';
  cost: string;
  markupPercent?: string | null;
}

/** A flat charge. */
export interface FeeLineInput extends LineCommon {
  kind: 'fee';
  amount: string;
}

export type EstimateLineInput = LabourLineInput | PartLineInput | SubcontractLineInput | FeeLineInput;

/** Opening-up labour shared by several remedies. */
export interface AccessTaskInput {
  id: string;
  hours: string;
  ratePerHour: string;
  vatRate: VatRateCode;
}

export interface EstimateInput {
  lines: EstimateLineInput[];
  accessTasks?: AccessTaskInput[];
}

/** A line whose amount excluding VAT is already known (already priced by the engine, rounded once). */
export interface NetLineInput {
  id: string;
  stage: EstimateStage;
  agreed?: boolean;
  kind: LineKind;
  /** After any line discount, in the currency's minor units. */
  net: string;
  vatRate: VatRateCode;
  findingId?: string | null;
  accessTaskId?: string | null;
}

/** An access task whose labour is already priced. */
export interface NetAccessTaskInput {
  id: string;
  net: string;
  vatRate: VatRateCode;
}

export interface NetEstimateInput {
  lines: NetLineInput[];
  accessTasks?: NetAccessTaskInput[];
}

/** What prices already-priced lines: no mark-ups apply. */
export type NetPricing = Pick<WorkshopPricing, 'currency' | 'vatRounding' | 'vatRates'>;

/** The workshop's settings that prices depend on (map a WorkshopDto with `workshopPricingFrom`). */
export interface WorkshopPricing {
  currency: string;
  vatRounding: VatRounding;
  /** Percentages as decimal strings, e.g. { standard: "20", reduced: "5", zero: "0" }. */
  vatRates: { standard: string; reduced: string; zero: string };
  partsMarkupPercent: string;
  subcontractMarkupPercent: string;
}

export interface RateTotal {
  code: VatRateCode;
  /** The percentage; "0" for zero-rated, exempt and outside the scope. */
  rate: string;
  net: string;
  vat: string;
}

export interface Totals {
  net: string;
  vat: string;
  gross: string;
  byRate: RateTotal[];
}

export interface PricedLine {
  id: string;
  stage: EstimateStage;
  /** Inspection lines: agreed by the owner (true for every other stage). */
  agreed: boolean;
  kind: LineKind;
  findingId: string | null;
  accessTaskId: string | null;
  vatRate: VatRateCode;
  vatPercent: string;
  /** What the workshop pays for a part or sub-contract line (quantity × unit cost, or the supplier's cost); null otherwise. */
  cost: string | null;
  /** Before any line discount. */
  listNet: string;
  discount: string;
  net: string;
  /** The line's own VAT when the workshop rounds each line to the nearest penny (line-nearest); null otherwise. */
  vat: string | null;
}

export interface PricedAccessTask {
  id: string;
  net: string;
  vatRate: VatRateCode;
  vatPercent: string;
  /** The stage that pays for it: inspection, then approved, then discovered, then declined; null when no line uses it. */
  chargedIn: EstimateStage | null;
  /** True when agreed work pays for it (an agreed inspection line or an approved line names it): it is in `committed`. */
  committedPays: boolean;
  /** Distinct remedies (findings, or the inspection scope) sharing it in the agreed inspection scope and approved work. */
  committedRemedies: number;
  /** Net saved against charging it once per remedy: (remedies − 1) × its net. */
  saving: string;
  /** The same saving including VAT at its rate, rounded to the nearest minor unit. */
  savingGross: string;
  /** Remedies that would share it if every undecided finding were approved. */
  remediesIfAllApproved: number;
  savingIfAllApproved: string;
}

export interface PricedFinding {
  findingId: string;
  /** approved / declined / discovered (awaiting a decision); "mixed" if its lines disagree. */
  stage: EstimateStage | 'mixed';
  /** The finding's own lines. */
  work: Totals;
  /** Access tasks it names that nothing already committed pays for, and so would be charged with it. */
  accessCharged: string[];
  /** Access tasks it names that the agreed inspection scope or other approved work already pays for. */
  accessCovered: string[];
  /** Its price on its own, incl. uncovered access: what the owner is asked to approve. */
  price: Totals;
}

export interface PricedEstimate {
  currency: string;
  rounding: VatRounding;
  lines: PricedLine[];
  accessTasks: PricedAccessTask[];
  stages: Record<EstimateStage, Totals>;
  /** The quote as it stands: every inspection-scope line, agreed or not. */
  quoted: Totals;
  /**
   * Agreed so far, what will be invoiced: the agreed inspection scope plus approved work, and the
   * access tasks they need (VAT worked on the whole, not per stage).
   */
  committed: Totals;
  /** committed − quoted. */
  change: { net: string; vat: string; gross: string };
  /**
   * Everything awaiting the owner: unagreed inspection lines and discovered work, with the access
   * tasks they need that agreed work does not pay for; `findings` counts findings with a line awaiting one.
   */
  undecided: Totals & { findings: number };
  /** The unagreed inspection lines only (with access tasks they need that agreed work does not pay for). */
  quoteAwaiting: Totals;
  /** committed plus everything undecided. */
  ifAllApproved: Totals;
  accessSaving: { net: string; gross: string };
  findings: PricedFinding[];
}
