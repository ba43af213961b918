/**
 * The documents Wingstage issues, as frozen data. An invoice or credit note is built once, at
 * issue, and stored whole (invoices.document, credit_notes.document); the PDF, the owner's page and
 * the e-mail all render this data, never the live job, so an issued document never changes.
 * Amounts are decimal strings in the document's currency; dates are ISO (YYYY-MM-DD).
 */

export interface DocumentParty {
  name: string;
  /** Address lines as printed, one per entry (no postcode). */
  addressLines: string[];
  postcode: string;
}

export interface DocumentSupplier extends DocumentParty {
  vatNumber: string;
  phone: string | null;
  email: string | null;
}

export interface DocumentJob {
  number: string;
  title: string;
  registration: string;
  /** Generic description of the aircraft, e.g. "two-seat flex-wing trike". */
  aircraft: string;
}

/** One line of a VAT invoice: every particular reg 14(1) asks of a line. */
export interface InvoiceDocumentLine {
  /** Where it came from: the inspection scope (the quote) or approved work (a finding's remedy). */
  stage: 'inspection' | 'approved';
  /** The finding's reference and title for approved work, else null. */
  finding: string | null;
  description: string;
  /** Quantity or extent (hours for labour), as a decimal string. */
  quantity: string;
  /** "h" for labour hours, "each" for parts, "" for a fixed amount. */
  unit: string;
  /** Unit price excluding VAT. */
  unitNet: string;
  /** Discount taken off this line (excluding VAT), "0.00" when none. */
  discount: string;
  /** VAT rate code and percentage, e.g. "standard" / "20". */
  vatRate: string;
  vatPercent: string;
  /** Amount excluding VAT, after any discount. */
  net: string;
  /** The line's own VAT when the workshop rounds per line, else null (VAT is then per rate). */
  vat: string | null;
}

export interface DocumentRateTotal {
  vatRate: string;
  vatPercent: string;
  net: string;
  vat: string;
}

/** A deposit received before the invoice, with its own tax point [VAT Act 1994 s6(4)]. */
export interface InvoiceDocumentDeposit {
  paymentId: string;
  /** The date received: the deposit's tax point. */
  receivedOn: string;
  /** Gross received, less anything refunded. */
  amount: string;
  /** VAT included in it, fixed at its tax point. */
  vat: string;
  method: string;
  reference: string | null;
}

export interface InvoiceDocument {
  version: 1;
  kind: 'invoice';
  number: string;
  issuedOn: string;
  /** The time of supply of the balance (the date the work was finished or the invoice date). */
  taxPoint: string;
  dueOn: string;
  supplier: DocumentSupplier;
  customer: DocumentParty & { email: string | null };
  job: DocumentJob;
  currency: string;
  /** The workshop's VAT rounding method as used on this invoice, and its words. */
  rounding: string;
  roundingLabel: string;
  lines: InvoiceDocumentLine[];
  byRate: DocumentRateTotal[];
  totals: { net: string; vat: string; gross: string };
  deposits: InvoiceDocumentDeposit[];
  /** VAT accounted for on the deposits, and on the balance (deposits + balance = total VAT). */
  depositsVat: string;
  balance: { net: string; vat: string; gross: string };
  /** What the owner still owes at issue. */
  balanceDue: string;
  /** Notes the law asks for (e.g. a zero-rated supply) and the payment terms. */
  notes: string[];
}

export interface CreditNoteDocumentLine {
  description: string;
  vatRate: string;
  vatPercent: string;
  net: string;
  vat: string;
}

/** A credit note [VAT Regulations 1995 reg 38; HMRC VATREC13040]. */
export interface CreditNoteDocument {
  version: 1;
  kind: 'credit_note';
  number: string;
  issuedOn: string;
  taxPoint: string;
  invoice: { number: string; issuedOn: string };
  supplier: DocumentSupplier;
  customer: DocumentParty & { email: string | null };
  job: DocumentJob;
  currency: string;
  reason: string;
  lines: CreditNoteDocumentLine[];
  byRate: DocumentRateTotal[];
  totals: { net: string; vat: string; gross: string };
  /** The refund paid with it, if any (a goodwill reduction may have none). */
  refund: { amount: string; method: string; paymentId: string } | null;
  notes: string[];
}

/**
 * A receipt for one payment received (a deposit or a balance, card or offline). A receipt for a
 * deposit is not a VAT invoice; it says so, and states the VAT the deposit carries at its tax point.
 */
export interface ReceiptDocument {
  version: 1;
  kind: 'receipt';
  /** The payment's id, shown as the receipt's reference. */
  paymentId: string;
  receivedOn: string;
  supplier: DocumentSupplier;
  customer: DocumentParty & { email: string | null };
  job: DocumentJob;
  currency: string;
  /** What it was for, in the owner's words (e.g. "Deposit: propeller overhaul ordered"). */
  description: string;
  amount: string;
  /** VAT included, fixed at the tax point for a deposit; null when not stated. */
  vat: string | null;
  method: string;
  /** The invoice it pays towards, if issued. */
  invoiceNumber: string | null;
  notes: string[];
}
