/**
 * What billing hands to pages, islands and API clients: rates, statements and invoices as the
 * screens show them. Plain data (instants as ISO 8601 text, days as YYYY-MM-DD, money in integer
 * minor units), so the services that build them and the screens that show them share one type.
 */
import type { Rate, RateState } from "./rates";
import type { StatementLine } from "./statement";

export type StatementStatus = "draft" | "issued" | "void";

/** The payments provider's invoice states, mirrored. Paid and void are final. */
export type InvoiceStatus = "draft" | "open" | "paid" | "void" | "uncollectible";

/** A rate on the rates screen. */
export interface RateView extends Rate {
  reagentName: string | null;
  createdAt: string;
  /** Its state today. */
  state: RateState;
}

/** A reagent a rate can be set for, with its unit and grades (the rate form's choices). */
export interface RateReagent {
  id: string;
  name: string;
  unit: "mL" | "g";
  grades: string[];
}

export interface InvoiceView {
  id: number;
  statementId: number;
  clientId: number;
  clientName: string;
  number: string | null;
  providerInvoiceId: string | null;
  hostedUrl: string | null;
  status: InvoiceStatus;
  amount_minor: number;
  currency: string;
  dueOn: string | null;
  sentAt: string | null;
  paidAt: string | null;
  paymentFailedAt: string | null;
  lastPaymentError: string | null;
  periodStart: string;
  periodEnd: string;
  statementReference: string;
  /** Before tax and the tax, minor units; null on invoices sent before tax was kept. */
  subtotal_minor: number | null;
  tax_minor: number | null;
  issuedOn: string | null;
}

export interface StatementView {
  id: number;
  reference: string;
  clientId: number;
  clientName: string;
  clientKind: "internal" | "external";
  costCentre: string | null;
  billingEmail: string | null;
  periodStart: string;
  periodEnd: string;
  status: StatementStatus;
  lines: StatementLine[];
  total_minor: number;
  currency: string;
  uncosted: string[];
  issuedAt: string | null;
  invoice: InvoiceView | null;
  /** Why the draft cannot be issued yet, if so. */
  blocker: string | null;
}

/** One active client on the period overview, with its statement if one exists. */
export interface PeriodRow {
  clientId: number;
  clientName: string;
  kind: "internal" | "external";
  costCentre: string | null;
  statementId: number | null;
  status: "none" | StatementStatus;
  total_minor: number;
  currency: string;
  invoiceStatus: InvoiceStatus | null;
}

export interface StatementSummary {
  id: number;
  reference: string;
  clientId: number;
  clientName: string;
  periodStart: string;
  periodEnd: string;
  status: StatementStatus;
  total_minor: number;
  currency: string;
  issuedAt: string | null;
  invoiceStatus: InvoiceStatus | null;
  hostedUrl: string | null;
}
