/**
 * Invoices, pure: Decant's own invoice numbers, tax per line, and the frozen document an invoice
 * prints (both parties' details, lines, tax, totals, terms). The same lines and tax go to the
 * payments provider, so what the client pays equals what the PDF says.
 */
import { quantityLabel, type StatementLine } from "./statement";

/** How a client's invoices are taxed. */
export type TaxTreatment = "none" | "standard" | "zero_rated" | "reverse_charge";

/**
 * The legend printed beside a zero tax. Common wording, from memory (EU VAT practice); the
 * institution's finance office decides the exact text its jurisdiction requires.
 */
export const TAX_LEGEND: Record<TaxTreatment, string | null> = {
  none: null,
  standard: null,
  zero_rated: "Zero-rated supply: tax charged at 0 %.",
  reverse_charge: "Reverse charge: the customer accounts for the tax.",
};

/** The facility as it appears on its invoices (settings "facility.*", "invoices.*"). */
export interface FacilityDetails {
  legalName: string;
  address: string;
  taxId: string;
  /** Letters and digits that start every invoice number, e.g. "VSC". */
  invoicePrefix: string;
  /** Days a client has to pay. */
  paymentTermsDays: number;
  /** Where to pay: bank, account, reference instructions. */
  remitTo: string;
  /** Printed at the foot of every invoice (e.g. late-payment terms). */
  note: string;
}

export interface BilledParty {
  name: string;
  address: string | null;
  taxId: string | null;
  purchaseOrder: string | null;
  email: string | null;
}

export interface InvoiceTax {
  treatment: TaxTreatment;
  /** "VAT", "GST", "Sales tax"; null without tax. */
  label: string | null;
  /** Percentage as text ("21", "7.5"); "0" for zero-rated and reverse charge; null without tax. */
  percent: string | null;
  legend: string | null;
}

export interface InvoiceLine {
  projectCode: string;
  description: string;
  quantity: string;
  unitPrice_minor: number | null;
  rateUnit: string | null;
  amount_minor: number;
  tax_minor: number;
}

/** Everything an invoice prints, frozen when it is sent. */
export interface InvoiceDetails {
  number: string;
  statementReference: string;
  periodStart: string;
  periodEnd: string;
  issuedOn: string;
  dueOn: string;
  facility: FacilityDetails;
  client: BilledParty;
  tax: InvoiceTax;
  lines: InvoiceLine[];
  subtotal_minor: number;
  tax_minor: number;
  total_minor: number;
  currency: string;
}

/** "VSC-2026-00042": the facility's prefix, the year of issue, a gap-free sequence within the year. */
export function invoiceNumber(prefix: string, year: number, sequence: number): string {
  return `${prefix}-${year}-${String(sequence).padStart(5, "0")}`;
}

/** The counter an invoice number is drawn from: one per prefix and year. */
export const invoiceSeries = (prefix: string, year: number) => `${prefix}-${year}`;

/**
 * Tax on one line at an exclusive percentage (up to four decimals), rounded half away from zero
 * to the minor unit. Per-line rounding, as the payments provider does; the total tax is the sum.
 *
 * @example taxOnAmount(7900, 21) // → 1659
 * @example taxOnAmount(-250, 21) // → -53
 */
export function taxOnAmount(amount_minor: number, percent: number): number {
  const exact = BigInt(amount_minor) * BigInt(Math.round(percent * 10_000));
  const abs = exact < 0n ? -exact : exact;
  const rounded = abs / 1_000_000n + ((abs % 1_000_000n) * 2n >= 1_000_000n ? 1n : 0n);
  return Number(exact < 0n ? -rounded : rounded);
}

/** The tax an invoice applies for a client's treatment and rate. */
export function invoiceTax(treatment: TaxTreatment, ratePercent: number | null, label: string | null): InvoiceTax {
  if (treatment === "none") return { treatment, label: null, percent: null, legend: null };
  const percent = treatment === "standard" ? String(ratePercent ?? 0) : "0";
  return { treatment, label: label || "VAT", percent, legend: TAX_LEGEND[treatment] };
}

/** The invoice's lines from a statement's (zero lines left out) with their tax, and the totals. */
export function invoiceLines(
  lines: readonly StatementLine[],
  tax: InvoiceTax,
): { lines: InvoiceLine[]; subtotal_minor: number; tax_minor: number; total_minor: number } {
  const percent = tax.percent === null ? 0 : Number(tax.percent);
  const out = lines
    .filter((line) => line.amount_minor !== 0)
    .map((line) => ({
      projectCode: line.projectCode,
      description: `${line.description}: ${quantityLabel(line)}`,
      quantity: line.quantity,
      unitPrice_minor: line.unitPrice_minor,
      rateUnit: line.rateUnit,
      amount_minor: line.amount_minor,
      tax_minor: taxOnAmount(line.amount_minor, percent),
    }));
  const subtotal_minor = out.reduce((sum, line) => sum + line.amount_minor, 0);
  const tax_minor = out.reduce((sum, line) => sum + line.tax_minor, 0);
  return { lines: out, subtotal_minor, tax_minor, total_minor: subtotal_minor + tax_minor };
}

/** The day `days` after a UTC day (YYYY-MM-DD). */
export function addDays(day: string, days: number): string {
  return new Date(Date.parse(`${day}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);
}
