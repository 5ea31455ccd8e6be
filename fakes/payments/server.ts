// The local payments fake: a stand-in for the hosted payments API that the official `stripe`
// Node SDK talks to unchanged (`new Stripe(key, { host, port, protocol: "http" })`). It speaks the
// same wire format: form-encoded parameters with bracketed keys, JSON objects with prefixed ids
// and an `object` field, list objects, the usual error shape, Idempotency-Key replay, Bearer auth,
// and signed webhooks. State is kept in one JSON file, so a restart loses nothing.
// The control API for tests lives under /_fake/ (see fakes/README.md).
import { createHmac, createHash, randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from "node:fs";
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import { dirname, join } from "node:path";
import { decodeParams, mergeMetadata, ParamError, reader, type Params } from "./form";
import { hostedInvoicePage } from "./page";

const port = Number(process.env.FAKE_PORT ?? 12111);
const secretKey = process.env.PAYMENTS_SECRET_KEY;
const webhookSecret = process.env.PAYMENTS_WEBHOOK_SECRET;
const webhookUrl = process.env.PAYMENTS_WEBHOOK_URL;
const stateFile = process.env.PAYMENTS_FAKE_STATE ?? join(process.cwd(), ".data", "payments-fake", "state.json");
const API_VERSION = "2025-08-27.basil";
if (!secretKey) {
  console.error("payments fake: PAYMENTS_SECRET_KEY is missing (the test secret key clients must present).");
  process.exit(1);
}
const base = `http://127.0.0.1:${port}`;

// ── State ───────────────────────────────────────────────────────────────────────────────

type Obj = Record<string, unknown> & { id: string; object: string };
interface Customer extends Obj {
  email: string | null;
  name: string | null;
  description: string | null;
  metadata: Record<string, string>;
  invoice_prefix: string;
  created: number;
}
interface InvoiceItem extends Obj {
  customer: string;
  invoice: string | null;
  amount: number;
  currency: string;
  description: string | null;
  quantity: number;
  unit_amount_decimal: string;
  metadata: Record<string, string>;
  date: number;
  tax_rates: string[];
}
interface TaxRate extends Obj {
  display_name: string;
  percentage: number;
  inclusive: boolean;
  description: string | null;
  jurisdiction: string | null;
  metadata: Record<string, string>;
  active: boolean;
  created: number;
}
interface Invoice extends Obj {
  customer: string;
  status: "draft" | "open" | "paid" | "void" | "uncollectible";
  currency: string;
  collection_method: string;
  days_until_due: number | null;
  due_date: number | null;
  auto_advance: boolean;
  metadata: Record<string, string>;
  description: string | null;
  number: string | null;
  created: number;
  attempt_count: number;
  attempted: boolean;
  amount_paid: number;
  status_transitions: {
    finalized_at: number | null;
    paid_at: number | null;
    voided_at: number | null;
    marked_uncollectible_at: number | null;
  };
  last_payment_error: string | null;
}
interface WebhookEvent extends Obj {
  type: string;
  created: number;
  data: { object: Obj };
  delivery: { attempts: number; last_status: number | null; last_error: string | null; delivered: boolean };
}
interface Saved {
  method: string;
  path: string;
  digest: string;
  status: number;
  body: string;
}

interface State {
  customers: Record<string, Customer>;
  invoiceItems: Record<string, InvoiceItem>;
  invoices: Record<string, Invoice>;
  events: Record<string, WebhookEvent>;
  idempotency: Record<string, Saved>;
  invoiceSequence: Record<string, number>;
  taxRates: Record<string, TaxRate>;
}

function load(): State {
  const empty: State = { customers: {}, invoiceItems: {}, invoices: {}, events: {}, idempotency: {}, invoiceSequence: {}, taxRates: {} };
  if (!existsSync(stateFile)) return empty;
  try {
    return { ...empty, ...(JSON.parse(readFileSync(stateFile, "utf8")) as Partial<State>) };
  } catch (error) {
    console.error(`payments fake: ${stateFile} is unreadable (${(error as Error).message}); starting empty.`);
    return empty;
  }
}
const state = load();
function save() {
  mkdirSync(dirname(stateFile), { recursive: true });
  const temporary = `${stateFile}.${process.pid}.tmp`;
  writeFileSync(temporary, JSON.stringify(state));
  renameSync(temporary, stateFile);
}

const now = () => Math.floor(Date.now() / 1000);
const ALPHABET = "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789";
function newId(prefix: string, length = 24) {
  const bytes = randomBytes(length);
  return `${prefix}_${Array.from(bytes, (b) => ALPHABET[b % ALPHABET.length]).join("")}`;
}

// ── Errors and answers ──────────────────────────────────────────────────────────────────

class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly type: string,
    message: string,
    readonly code?: string,
    readonly param?: string,
  ) {
    super(message);
  }
}
const missing = (kind: string, id: string, param = "id") =>
  new ApiError(404, "invalid_request_error", `No such ${kind}: '${id}'`, "resource_missing", param);
const badState = (message: string, code = "invoice_unexpected_state") => new ApiError(400, "invalid_request_error", message, code);

interface Answer {
  status: number;
  body: unknown;
  headers?: Record<string, string>;
}
const ok = (body: unknown): Answer => ({ status: 200, body });

function send(res: ServerResponse, answer: Answer, requestId: string) {
  const text = typeof answer.body === "string" ? answer.body : JSON.stringify(answer.body, null, 2);
  res.writeHead(answer.status, {
    "content-type": "application/json",
    "request-id": requestId,
    "stripe-version": API_VERSION,
    ...answer.headers,
  });
  res.end(text);
}
function errorBody(error: ApiError, requestId: string) {
  return {
    error: {
      type: error.type,
      message: error.message,
      ...(error.code ? { code: error.code } : {}),
      ...(error.param ? { param: error.param } : {}),
      request_log_url: `${base}/_fake/requests/${requestId}`,
    },
  };
}

function list<T>(url: string, all: T[], params: Params): { object: "list"; data: T[]; has_more: boolean; url: string } {
  const r = reader(params, Object.keys(params));
  const limit = Math.min(Math.max(r.int("limit") ?? 10, 1), 100);
  let items = all;
  const after = r.str("starting_after");
  if (after) {
    const index = items.findIndex((item) => (item as Obj).id === after);
    if (index < 0) throw new ApiError(400, "invalid_request_error", `No such object: '${after}'`, "resource_missing", "starting_after");
    items = items.slice(index + 1);
  }
  return { object: "list", data: items.slice(0, limit), has_more: items.length > limit, url };
}

// ── Views ───────────────────────────────────────────────────────────────────────────────

function itemsOf(invoiceId: string) {
  // Insertion order, which the JSON state file keeps.
  return Object.values(state.invoiceItems).filter((item) => item.invoice === invoiceId);
}

/**
 * Tax on one item at an exclusive rate, as the service computes it: per line, rounded to the
 * minor unit half away from zero (percentages with up to four decimals, in integers).
 */
function itemTaxes(item: InvoiceItem): { amount: number; tax_rate: string; inclusive: boolean }[] {
  return (item.tax_rates ?? []).map((id) => {
    const rate = state.taxRates[id]!;
    const exact = BigInt(item.amount) * BigInt(Math.round(rate.percentage * 10_000));
    const abs = exact < 0n ? -exact : exact;
    const rounded = abs / 1_000_000n + ((abs % 1_000_000n) * 2n >= 1_000_000n ? 1n : 0n);
    return { amount: Number(exact < 0n ? -rounded : rounded), tax_rate: id, inclusive: false };
  });
}

function invoiceView(invoice: Invoice): Obj {
  const items = itemsOf(invoice.id);
  const subtotal = items.reduce((sum, item) => sum + item.amount, 0);
  const byRate = new Map<string, number>();
  for (const item of items) for (const t of itemTaxes(item)) byRate.set(t.tax_rate, (byRate.get(t.tax_rate) ?? 0) + t.amount);
  const tax = [...byRate.values()].reduce((sum, amount) => sum + amount, 0);
  const total = subtotal + tax;
  const customer = state.customers[invoice.customer];
  const paid = invoice.status === "paid";
  const amountDue = invoice.status === "void" ? 0 : total;
  const finalized = invoice.status !== "draft";
  return {
    ...invoice,
    livemode: false,
    customer_email: customer?.email ?? null,
    customer_name: customer?.name ?? null,
    subtotal,
    tax,
    total_excluding_tax: subtotal,
    total,
    total_tax_amounts: [...byRate].map(([rate, amount]) => ({ amount, inclusive: false, tax_rate: rate })),
    amount_due: amountDue,
    amount_paid: paid ? total : 0,
    amount_remaining: paid || invoice.status === "void" ? 0 : amountDue,
    paid,
    hosted_invoice_url: finalized ? `${base}/i/${invoice.id}` : null,
    invoice_pdf: null,
    lines: {
      object: "list",
      has_more: false,
      url: `/v1/invoices/${invoice.id}/lines`,
      total_count: items.length,
      data: items.map((item) => ({
        id: `il_${item.id.slice(3)}`,
        object: "line_item",
        amount: item.amount,
        currency: item.currency,
        description: item.description,
        quantity: item.quantity,
        invoice: invoice.id,
        metadata: item.metadata,
        livemode: false,
        parent: { type: "invoice_item_details", invoice_item_details: { invoice_item: item.id, proration: false } },
        pricing: { type: "price_details", unit_amount_decimal: item.unit_amount_decimal },
        tax_amounts: itemTaxes(item),
        tax_rates: (item.tax_rates ?? []).map((id) => taxRateView(state.taxRates[id]!)),
      })),
    },
  };
}
const itemView = (item: InvoiceItem): Obj => ({
  ...item,
  tax_rates: (item.tax_rates ?? []).map((id) => taxRateView(state.taxRates[id]!)),
  livemode: false,
});
const taxRateView = (rate: TaxRate): Obj => ({ ...rate, livemode: false });
const customerView = (customer: Customer): Obj => ({ ...customer, livemode: false, currency: null, delinquent: false });

// ── Webhooks ────────────────────────────────────────────────────────────────────────────

const deliveryQueue: string[] = [];
let delivering = false;

function emit(type: string, invoice: Invoice) {
  const event: WebhookEvent = {
    id: newId("evt"),
    object: "event",
    api_version: API_VERSION,
    created: now(),
    type,
    livemode: false,
    pending_webhooks: webhookUrl ? 1 : 0,
    request: { id: null, idempotency_key: null },
    data: { object: invoiceView(invoice) },
    delivery: { attempts: 0, last_status: null, last_error: null, delivered: false },
  };
  state.events[event.id] = event;
  if (webhookUrl) deliveryQueue.push(event.id);
  return event;
}

/** `t=<unix>,v1=<hex HMAC-SHA256 of "t.payload">`, the scheme `webhooks.constructEvent` verifies. */
function signature(payload: string, timestamp = now()) {
  const v1 = createHmac("sha256", webhookSecret ?? "")
    .update(`${timestamp}.${payload}`, "utf8")
    .digest("hex");
  return `t=${timestamp},v1=${v1}`;
}

function payloadOf(event: WebhookEvent) {
  const { delivery: _delivery, ...wire } = event;
  return JSON.stringify(wire, null, 2);
}

async function deliver(eventId: string): Promise<boolean> {
  const event = state.events[eventId];
  if (!event || !webhookUrl) return false;
  const payload = payloadOf(event);
  event.delivery.attempts += 1;
  try {
    const response = await fetch(webhookUrl, {
      method: "POST",
      headers: {
        "content-type": "application/json; charset=utf-8",
        "stripe-signature": signature(payload),
        "user-agent": "decant-payments-fake/1",
      },
      body: payload,
      signal: AbortSignal.timeout(10_000),
    });
    await response.arrayBuffer().catch(() => undefined);
    event.delivery.last_status = response.status;
    event.delivery.last_error = response.ok ? null : `HTTP ${response.status}`;
    event.delivery.delivered = response.ok;
  } catch (error) {
    event.delivery.last_status = null;
    event.delivery.last_error = (error as Error).message;
  }
  event.pending_webhooks = event.delivery.delivered ? 0 : 1;
  save();
  return event.delivery.delivered;
}

/** Delivers events one at a time, in the order they happened; retries with back-off, like the real service. */
async function pump() {
  if (delivering) return;
  delivering = true;
  try {
    while (deliveryQueue.length) {
      const id = deliveryQueue[0]!;
      for (let attempt = 0; attempt < 5; attempt++) {
        if (await deliver(id)) break;
        await new Promise((r) => setTimeout(r, 500 * 2 ** attempt));
      }
      deliveryQueue.shift();
    }
  } finally {
    delivering = false;
  }
}

// ── Invoice transitions (shared by the API, the hosted page and the control API) ────────

function findInvoice(id: string) {
  const invoice = state.invoices[id];
  if (!invoice) throw missing("invoice", id);
  return invoice;
}

function finalize(invoice: Invoice) {
  if (invoice.status !== "draft") throw badState(`This invoice is already finalized, you can't re-finalize a non-draft invoice.`);
  const customer = state.customers[invoice.customer]!;
  // A number the caller set is kept, as the real service does; otherwise the customer's prefix and a sequence.
  // Unique per customer here (each test database has its own customers at one shared fake).
  const taken = (o: Invoice) =>
    o.id !== invoice.id && o.customer === invoice.customer && o.status !== "draft" && o.number === invoice.number;
  if (invoice.number && Object.values(state.invoices).some(taken))
    throw badState(`Invoice number ${invoice.number} is already in use.`, "invoice_duplicate_number");
  if (!invoice.number) {
    const sequence = (state.invoiceSequence[customer.id] ?? 0) + 1;
    state.invoiceSequence[customer.id] = sequence;
    invoice.number = `${customer.invoice_prefix}-${String(sequence).padStart(4, "0")}`;
  }
  invoice.status = "open";
  invoice.status_transitions.finalized_at = now();
  if (invoice.collection_method === "send_invoice" && invoice.days_until_due != null)
    invoice.due_date = now() + invoice.days_until_due * 86_400;
  emit("invoice.finalized", invoice);
  // Nothing to collect: the service settles a zero invoice on finalizing.
  if (invoiceView(invoice).total === 0) markPaid(invoice);
}

function markPaid(invoice: Invoice) {
  if (invoice.status === "paid") throw badState("Invoice is already paid.", "invoice_already_paid");
  if (invoice.status !== "open" && invoice.status !== "uncollectible")
    throw badState(`You can only pay an invoice that is open or uncollectible; this one is ${invoice.status}.`);
  invoice.status = "paid";
  invoice.attempted = true;
  invoice.attempt_count += 1;
  invoice.last_payment_error = null;
  invoice.status_transitions.paid_at = now();
  emit("invoice.payment_succeeded", invoice);
  emit("invoice.paid", invoice);
}

function failPayment(invoice: Invoice, reason = "Your card was declined.") {
  if (invoice.status !== "open") throw badState(`Only an open invoice can have a failed payment; this one is ${invoice.status}.`);
  invoice.attempted = true;
  invoice.attempt_count += 1;
  invoice.last_payment_error = reason;
  emit("invoice.payment_failed", invoice);
}

function voidInvoice(invoice: Invoice) {
  if (invoice.status !== "open" && invoice.status !== "uncollectible")
    throw badState(`You can only void an open or uncollectible invoice; this one is ${invoice.status}.`);
  invoice.status = "void";
  invoice.status_transitions.voided_at = now();
  emit("invoice.voided", invoice);
}

function markUncollectible(invoice: Invoice) {
  if (invoice.status !== "open") throw badState(`You can only mark an open invoice uncollectible; this one is ${invoice.status}.`);
  invoice.status = "uncollectible";
  invoice.status_transitions.marked_uncollectible_at = now();
  emit("invoice.marked_uncollectible", invoice);
}

// ── The API ─────────────────────────────────────────────────────────────────────────────

const CURRENCY = /^[a-z]{3}$/;

function createCustomer(params: Params): Answer {
  const r = reader(params, ["email", "name", "description", "metadata", "preferred_locales"]);
  const customer: Customer = {
    id: newId("cus", 14),
    object: "customer",
    email: r.str("email") ?? null,
    name: r.str("name") ?? null,
    description: r.str("description") ?? null,
    metadata: r.metadata() ?? {},
    invoice_prefix: Array.from(randomBytes(8), (b) => "ABCDEFGHJKLMNPQRSTUVWXYZ"[b % 24]).join(""),
    created: now(),
  };
  state.customers[customer.id] = customer;
  return ok(customerView(customer));
}

function updateCustomer(id: string, params: Params): Answer {
  const customer = state.customers[id];
  if (!customer) throw missing("customer", id);
  const r = reader(params, ["email", "name", "description", "metadata"]);
  const email = r.str("email");
  const name = r.str("name");
  const description = r.str("description");
  if (email !== undefined) customer.email = email || null;
  if (name !== undefined) customer.name = name || null;
  if (description !== undefined) customer.description = description || null;
  customer.metadata = mergeMetadata(customer.metadata, r.metadata());
  return ok(customerView(customer));
}

function createInvoiceItem(params: Params): Answer {
  const r = reader(params, [
    "customer",
    "amount",
    "currency",
    "description",
    "invoice",
    "metadata",
    "quantity",
    "unit_amount_decimal",
    "price_data",
    "period",
    "discountable",
    "tax_rates",
  ]);
  const customerId = r.str("customer", true)!;
  if (!state.customers[customerId]) throw missing("customer", customerId, "customer");
  const currency = r.str("currency", true)!.toLowerCase();
  if (!CURRENCY.test(currency))
    throw new ApiError(400, "invalid_request_error", `Invalid currency: ${currency}.`, "parameter_invalid", "currency");
  const invoiceId = r.str("invoice");
  if (invoiceId) {
    const invoice = state.invoices[invoiceId];
    if (!invoice) throw missing("invoice", invoiceId, "invoice");
    if (invoice.status !== "draft") throw badState("You can only add invoice items to draft invoices.", "invoice_not_editable");
    if (invoice.customer !== customerId)
      throw new ApiError(400, "invalid_request_error", "The invoice belongs to another customer.", "parameter_invalid", "invoice");
    if (invoice.currency !== currency)
      throw new ApiError(
        400,
        "invalid_request_error",
        `The invoice is in ${invoice.currency}; this item is in ${currency}.`,
        "parameter_invalid",
        "currency",
      );
  }
  const amount = r.int("amount");
  const quantity = r.int("quantity", { min: 0 });
  const unitDecimal = r.decimal("unit_amount_decimal");
  const priceData = r.object("price_data");
  let unitAmount: number | undefined;
  if (priceData) {
    const p = reader(priceData, ["currency", "product", "unit_amount", "unit_amount_decimal", "tax_behavior"], "price_data.");
    unitAmount =
      p.int("unit_amount") ?? (p.decimal("unit_amount_decimal") !== undefined ? Number(p.decimal("unit_amount_decimal")) : undefined);
    if (unitAmount === undefined)
      throw new ApiError(
        400,
        "invalid_request_error",
        "Missing required param: price_data[unit_amount].",
        "parameter_missing",
        "price_data[unit_amount]",
      );
  } else if (unitDecimal !== undefined) unitAmount = Number(unitDecimal);
  if (amount !== undefined && unitAmount !== undefined)
    throw new ApiError(
      400,
      "invalid_request_error",
      "You may only specify one of these parameters: amount, unit_amount_decimal, price_data.",
      "parameter_invalid",
      "amount",
    );
  let total: number;
  if (amount !== undefined) {
    if (quantity !== undefined && quantity !== 1)
      throw new ApiError(
        400,
        "invalid_request_error",
        "When amount is given, quantity must be 1 or left out.",
        "parameter_invalid",
        "quantity",
      );
    total = amount;
  } else if (unitAmount !== undefined) {
    total = Math.round(unitAmount * (quantity ?? 1));
  } else {
    throw new ApiError(400, "invalid_request_error", "Missing required param: amount.", "parameter_missing", "amount");
  }
  const taxRates = params.tax_rates === undefined || params.tax_rates === "" ? [] : params.tax_rates;
  if (!Array.isArray(taxRates) || taxRates.some((id) => typeof id !== "string" || !state.taxRates[id]))
    throw new ApiError(400, "invalid_request_error", "tax_rates must list existing tax rate ids.", "parameter_invalid", "tax_rates");
  const item: InvoiceItem = {
    tax_rates: taxRates as string[],
    id: newId("ii"),
    object: "invoiceitem",
    customer: customerId,
    invoice: invoiceId ?? null,
    amount: total,
    currency,
    description: r.str("description") ?? null,
    quantity: amount !== undefined ? 1 : (quantity ?? 1),
    unit_amount_decimal: String(amount !== undefined ? amount : unitAmount),
    metadata: r.metadata() ?? {},
    date: now(),
    discountable: true,
  };
  state.invoiceItems[item.id] = item;
  return ok(itemView(item));
}

function createTaxRate(params: Params): Answer {
  const r = reader(params, ["display_name", "percentage", "inclusive", "description", "jurisdiction", "country", "tax_type", "metadata"]);
  const percentage = r.decimal("percentage");
  if (percentage === undefined)
    throw new ApiError(400, "invalid_request_error", "Missing required param: percentage.", "parameter_missing", "percentage");
  if (Number(percentage) < 0 || Number(percentage) > 100 || !/^\d+(\.\d{1,4})?$/.test(percentage))
    throw new ApiError(
      400,
      "invalid_request_error",
      "percentage must be between 0 and 100, four decimals at most.",
      "parameter_invalid",
      "percentage",
    );
  const inclusive = r.bool("inclusive");
  if (inclusive === undefined)
    throw new ApiError(400, "invalid_request_error", "Missing required param: inclusive.", "parameter_missing", "inclusive");
  if (inclusive)
    throw new ApiError(400, "invalid_request_error", "This fake supports exclusive tax rates only.", "parameter_invalid", "inclusive");
  const rate: TaxRate = {
    id: newId("txr"),
    object: "tax_rate",
    display_name: r.str("display_name", true)!,
    percentage: Number(percentage),
    inclusive,
    description: r.str("description") ?? null,
    jurisdiction: r.str("jurisdiction") ?? null,
    metadata: r.metadata() ?? {},
    active: true,
    created: now(),
  };
  state.taxRates[rate.id] = rate;
  return ok(taxRateView(rate));
}

function createInvoice(params: Params): Answer {
  const r = reader(params, [
    "customer",
    "collection_method",
    "days_until_due",
    "due_date",
    "auto_advance",
    "metadata",
    "description",
    "currency",
    "pending_invoice_items_behavior",
    "footer",
    "number",
  ]);
  const customerId = r.str("customer", true)!;
  if (!state.customers[customerId]) throw missing("customer", customerId, "customer");
  const method = r.oneOf("collection_method", ["charge_automatically", "send_invoice"] as const, "charge_automatically")!;
  const daysUntilDue = r.int("days_until_due", { min: 0 });
  if (method === "send_invoice" && daysUntilDue === undefined && r.int("due_date") === undefined) {
    throw new ApiError(400, "invalid_request_error", "Missing required param: days_until_due.", "parameter_missing", "days_until_due");
  }
  if (method === "charge_automatically" && daysUntilDue !== undefined) {
    throw new ApiError(
      400,
      "invalid_request_error",
      "You can only set days_until_due when collection_method is send_invoice.",
      "parameter_invalid",
      "days_until_due",
    );
  }
  const currency = (r.str("currency") ?? "eur").toLowerCase();
  if (!CURRENCY.test(currency))
    throw new ApiError(400, "invalid_request_error", `Invalid currency: ${currency}.`, "parameter_invalid", "currency");
  const behaviour = r.oneOf("pending_invoice_items_behavior", ["exclude", "include"] as const, "exclude");
  const invoice: Invoice = {
    id: newId("in"),
    object: "invoice",
    customer: customerId,
    status: "draft",
    currency,
    collection_method: method,
    days_until_due: daysUntilDue ?? null,
    due_date: r.int("due_date") ?? null,
    auto_advance: r.bool("auto_advance") ?? method === "charge_automatically",
    metadata: r.metadata() ?? {},
    description: r.str("description") ?? null,
    footer: r.str("footer") ?? null,
    number: r.str("number") || null,
    created: now(),
    attempt_count: 0,
    attempted: false,
    amount_paid: 0,
    status_transitions: { finalized_at: null, paid_at: null, voided_at: null, marked_uncollectible_at: null },
    last_payment_error: null,
  };
  state.invoices[invoice.id] = invoice;
  if (behaviour === "include") {
    for (const item of Object.values(state.invoiceItems))
      if (item.customer === customerId && item.invoice === null && item.currency === currency) item.invoice = invoice.id;
  }
  return ok(invoiceView(invoice));
}

function updateInvoice(id: string, params: Params): Answer {
  const invoice = findInvoice(id);
  const r = reader(params, ["metadata", "description", "days_until_due", "auto_advance", "footer"]);
  const changesContent = ["description", "days_until_due", "footer"].some((key) => params[key] !== undefined);
  if (changesContent && invoice.status !== "draft")
    throw badState("Finalized invoices can't be updated in this way.", "invoice_not_editable");
  invoice.metadata = mergeMetadata(invoice.metadata, r.metadata());
  const description = r.str("description");
  if (description !== undefined) invoice.description = description || null;
  const days = r.int("days_until_due", { min: 0 });
  if (days !== undefined) invoice.days_until_due = days;
  const advance = r.bool("auto_advance");
  if (advance !== undefined) invoice.auto_advance = advance;
  return ok(invoiceView(invoice));
}

type Handler = (match: RegExpMatchArray, params: Params, path: string) => Answer;
const routes: { method: string; pattern: RegExp; handler: Handler; mutates?: boolean }[] = [
  { method: "POST", pattern: /^\/v1\/customers$/, handler: (_m, p) => createCustomer(p), mutates: true },
  {
    method: "GET",
    pattern: /^\/v1\/customers$/,
    handler: (_m, p, path) => {
      const email = typeof p.email === "string" ? p.email : undefined;
      const all = Object.values(state.customers)
        .filter((c) => !email || c.email === email)
        .sort((a, b) => b.created - a.created);
      return ok(list(path, all.map(customerView), { ...p, email: "" }));
    },
  },
  {
    method: "GET",
    pattern: /^\/v1\/customers\/([\w]+)$/,
    handler: (m) => {
      const customer = state.customers[m[1]!];
      if (!customer) throw missing("customer", m[1]!);
      return ok(customerView(customer));
    },
  },
  { method: "POST", pattern: /^\/v1\/customers\/([\w]+)$/, handler: (m, p) => updateCustomer(m[1]!, p), mutates: true },
  { method: "POST", pattern: /^\/v1\/tax_rates$/, handler: (_m, p) => createTaxRate(p), mutates: true },
  {
    method: "GET",
    pattern: /^\/v1\/tax_rates\/(txr_[\w]+)$/,
    handler: (m) => {
      const rate = state.taxRates[m[1]!];
      if (!rate) throw missing("tax_rate", m[1]!);
      return ok(taxRateView(rate));
    },
  },
  { method: "POST", pattern: /^\/v1\/invoiceitems$/, handler: (_m, p) => createInvoiceItem(p), mutates: true },
  {
    method: "GET",
    pattern: /^\/v1\/invoiceitems$/,
    handler: (_m, p, path) => {
      const invoice = typeof p.invoice === "string" ? p.invoice : undefined;
      const customer = typeof p.customer === "string" ? p.customer : undefined;
      const all = Object.values(state.invoiceItems).filter(
        (i) => (!invoice || i.invoice === invoice) && (!customer || i.customer === customer),
      );
      return ok(list(path, all.map(itemView), { ...p, invoice: "", customer: "" }));
    },
  },
  {
    method: "GET",
    pattern: /^\/v1\/invoiceitems\/([\w]+)$/,
    handler: (m) => {
      const item = state.invoiceItems[m[1]!];
      if (!item) throw missing("invoiceitem", m[1]!);
      return ok(itemView(item));
    },
  },
  { method: "POST", pattern: /^\/v1\/invoices$/, handler: (_m, p) => createInvoice(p), mutates: true },
  {
    method: "GET",
    pattern: /^\/v1\/invoices$/,
    handler: (_m, p, path) => {
      const customer = typeof p.customer === "string" ? p.customer : undefined;
      const status = typeof p.status === "string" ? p.status : undefined;
      const all = Object.values(state.invoices)
        .filter((i) => (!customer || i.customer === customer) && (!status || i.status === status))
        .sort((a, b) => b.created - a.created || b.id.localeCompare(a.id));
      return ok(list(path, all.map(invoiceView), { ...p, customer: "", status: "" }));
    },
  },
  { method: "GET", pattern: /^\/v1\/invoices\/(in_[\w]+)$/, handler: (m) => ok(invoiceView(findInvoice(m[1]!))) },
  { method: "POST", pattern: /^\/v1\/invoices\/(in_[\w]+)$/, handler: (m, p) => updateInvoice(m[1]!, p), mutates: true },
  {
    method: "DELETE",
    pattern: /^\/v1\/invoices\/(in_[\w]+)$/,
    handler: (m) => {
      const invoice = findInvoice(m[1]!);
      if (invoice.status !== "draft") throw badState("You can only delete draft invoices.");
      delete state.invoices[invoice.id];
      for (const item of itemsOf(invoice.id)) delete state.invoiceItems[item.id];
      return ok({ id: invoice.id, object: "invoice", deleted: true });
    },
    mutates: true,
  },
  {
    method: "GET",
    pattern: /^\/v1\/invoices\/(in_[\w]+)\/lines$/,
    handler: (m, p, path) => ok(list(path, (invoiceView(findInvoice(m[1]!)).lines as { data: unknown[] }).data, p)),
  },
  {
    method: "POST",
    pattern: /^\/v1\/invoices\/(in_[\w]+)\/finalize$/,
    handler: (m, p) => {
      reader(p, ["auto_advance"]);
      const invoice = findInvoice(m[1]!);
      finalize(invoice);
      return ok(invoiceView(invoice));
    },
    mutates: true,
  },
  {
    method: "POST",
    pattern: /^\/v1\/invoices\/(in_[\w]+)\/send$/,
    handler: (m, p) => {
      reader(p, []);
      const invoice = findInvoice(m[1]!);
      if (invoice.collection_method !== "send_invoice")
        throw badState("You can only send invoices whose collection_method is send_invoice.");
      if (invoice.status !== "open") throw badState(`You can only send an open invoice; this one is ${invoice.status}.`);
      emit("invoice.sent", invoice);
      return ok(invoiceView(invoice));
    },
    mutates: true,
  },
  {
    method: "POST",
    pattern: /^\/v1\/invoices\/(in_[\w]+)\/void$/,
    handler: (m, p) => {
      reader(p, []);
      const invoice = findInvoice(m[1]!);
      voidInvoice(invoice);
      return ok(invoiceView(invoice));
    },
    mutates: true,
  },
  {
    method: "POST",
    pattern: /^\/v1\/invoices\/(in_[\w]+)\/mark_uncollectible$/,
    handler: (m, p) => {
      reader(p, []);
      const invoice = findInvoice(m[1]!);
      markUncollectible(invoice);
      return ok(invoiceView(invoice));
    },
    mutates: true,
  },
  {
    method: "POST",
    pattern: /^\/v1\/invoices\/(in_[\w]+)\/pay$/,
    handler: (m, p) => {
      reader(p, ["paid_out_of_band", "payment_method", "source", "forgive", "off_session"]);
      const invoice = findInvoice(m[1]!);
      markPaid(invoice);
      return ok(invoiceView(invoice));
    },
    mutates: true,
  },
  {
    method: "GET",
    pattern: /^\/v1\/events$/,
    handler: (_m, p, path) => {
      const type = typeof p.type === "string" ? p.type : undefined;
      const all = Object.values(state.events)
        .filter((e) => !type || e.type === type)
        .sort((a, b) => b.created - a.created);
      return ok(
        list(
          path,
          all.map((e) => JSON.parse(payloadOf(e))),
          { ...p, type: "" },
        ),
      );
    },
  },
  {
    method: "GET",
    pattern: /^\/v1\/events\/(evt_[\w]+)$/,
    handler: (m) => {
      const event = state.events[m[1]!];
      if (!event) throw missing("event", m[1]!);
      return ok(JSON.parse(payloadOf(event)));
    },
  },
];

function authorise(req: IncomingMessage) {
  const header = req.headers.authorization ?? "";
  const match = /^Bearer (.+)$/.exec(header);
  let key = match?.[1];
  if (!key && header.startsWith("Basic ")) key = Buffer.from(header.slice(6), "base64").toString("utf8").replace(/:$/, "");
  if (!key)
    throw new ApiError(
      401,
      "invalid_request_error",
      "You did not provide an API key. Provide it in the Authorization header, using Bearer auth.",
    );
  if (key !== secretKey)
    throw new ApiError(
      401,
      "invalid_request_error",
      `Invalid API Key provided: ${key.slice(0, 8)}${"*".repeat(Math.max(0, key.length - 12))}${key.slice(-4)}`,
      "api_key_invalid",
    );
  return key;
}

function handleApi(req: IncomingMessage, path: string, query: string, body: string): Answer {
  const key = authorise(req);
  const method = req.method ?? "GET";
  const route = routes.find((r) => r.method === method && r.pattern.test(path));
  if (!route) throw new ApiError(404, "invalid_request_error", `Unrecognized request URL (${method}: ${path}).`);
  const params = decodeParams(method === "GET" || method === "DELETE" ? query : body);
  const header = req.headers["idempotency-key"];
  const idempotencyKey = typeof header === "string" && header !== "" ? header : null;
  const slot = idempotencyKey !== null && method === "POST" ? `${key}:${idempotencyKey}` : null;
  const digest = createHash("sha256").update(`${method} ${path}\n${body}`).digest("hex");
  if (slot) {
    if (idempotencyKey!.length > 255)
      throw new ApiError(
        400,
        "invalid_request_error",
        "Idempotency keys can be at most 255 characters.",
        "parameter_invalid",
        "Idempotency-Key",
      );
    const saved = state.idempotency[slot];
    if (saved) {
      if (saved.digest !== digest) {
        throw new ApiError(
          400,
          "idempotency_error",
          `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${idempotencyKey}' if you meant to execute a different request.`,
        );
      }
      return { status: saved.status, body: saved.body, headers: { "idempotent-replayed": "true", "idempotency-key": idempotencyKey! } };
    }
  }
  let answer: Answer;
  try {
    answer = route.handler(path.match(route.pattern)!, params, path);
  } catch (error) {
    if (!(error instanceof ApiError) && !(error instanceof ParamError)) throw error;
    const apiError =
      error instanceof ParamError ? new ApiError(400, "invalid_request_error", error.message, error.code, error.param) : error;
    answer = { status: apiError.status, body: errorBody(apiError, "req") };
  }
  if (slot && answer.status < 500) {
    state.idempotency[slot] = { method, path, digest, status: answer.status, body: JSON.stringify(answer.body, null, 2) };
    answer = { ...answer, headers: { "idempotency-key": idempotencyKey! } };
  }
  if (route.mutates || slot) save();
  void pump();
  return answer;
}

// ── Control API for tests and the hosted page ───────────────────────────────────────────

function handleControl(method: string, path: string, query: URLSearchParams): Answer {
  let m: RegExpMatchArray | null;
  if (method === "GET" && path === "/_fake/health")
    return ok({
      ok: true,
      invoices: Object.keys(state.invoices).length,
      events: Object.keys(state.events).length,
      webhookUrl: webhookUrl ?? null,
    });
  if (method === "GET" && path === "/_fake/events") {
    const type = query.get("type");
    const invoice = query.get("invoice");
    const events = Object.values(state.events)
      .filter((e) => (!type || e.type === type) && (!invoice || e.data.object.id === invoice))
      .sort((a, b) => a.created - b.created);
    return ok({ object: "list", data: events });
  }
  if (method === "GET" && path === "/_fake/invoices") {
    const filters = [...query.entries()].map(([k, v]) => [/^metadata\[(.+)\]$/.exec(k)?.[1], v] as const);
    const invoices = Object.values(state.invoices).filter((inv) => filters.every(([k, v]) => !k || inv.metadata[k] === v));
    return ok({ object: "list", data: invoices.map(invoiceView) });
  }
  if (method === "GET" && (m = path.match(/^\/_fake\/events\/(evt_\w+)\/payload$/))) {
    const event = state.events[m[1]!];
    if (!event) throw missing("event", m[1]!);
    const payload = payloadOf(event);
    return { status: 200, body: JSON.stringify({ payload, signature: signature(payload) }) };
  }
  if (method === "POST" && (m = path.match(/^\/_fake\/events\/(evt_\w+)\/redeliver$/))) {
    const event = state.events[m[1]!];
    if (!event) throw missing("event", m[1]!);
    if (!webhookUrl) throw new ApiError(400, "invalid_request_error", "PAYMENTS_WEBHOOK_URL is not set; nothing to deliver to.");
    deliveryQueue.push(event.id);
    void pump();
    return ok({ queued: event.id });
  }
  if (method === "POST" && (m = path.match(/^\/_fake\/invoices\/(in_\w+)\/(pay|fail)$/))) {
    const invoice = findInvoice(m[1]!);
    if (m[2] === "pay") markPaid(invoice);
    else failPayment(invoice, query.get("reason") ?? undefined);
    save();
    void pump();
    return ok(invoiceView(invoice));
  }
  if (method === "POST" && path === "/_fake/flush") return ok({ pending: deliveryQueue.length });
  throw new ApiError(404, "invalid_request_error", `Unrecognized control URL (${method}: ${path}).`);
}

function readBody(req: IncomingMessage, limit = 1024 * 1024): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    req.on("data", (chunk: Buffer) => {
      size += chunk.length;
      if (size > limit) {
        reject(new ApiError(413, "invalid_request_error", "Request body too large."));
        req.destroy();
      } else chunks.push(chunk);
    });
    req.on("end", () => resolve(Buffer.concat(chunks).toString("utf8")));
    req.on("error", reject);
  });
}

const server = createServer(async (req, res) => {
  const requestId = newId("req", 14);
  const url = new URL(req.url ?? "/", base);
  const method = req.method ?? "GET";
  try {
    const body = await readBody(req);
    if (url.pathname.startsWith("/v1/")) return send(res, handleApi(req, url.pathname, url.search.slice(1), body), requestId);
    if (url.pathname.startsWith("/_fake/")) return send(res, handleControl(method, url.pathname, url.searchParams), requestId);
    let m: RegExpMatchArray | null;
    if ((m = url.pathname.match(/^\/i\/(in_\w+)$/)) && method === "GET") {
      const invoice = state.invoices[m[1]!];
      if (!invoice || invoice.status === "draft") {
        res.writeHead(404, { "content-type": "text/html; charset=utf-8" });
        return res.end("<!doctype html><title>Not found</title><p>This invoice does not exist or is not finalized yet.</p>");
      }
      res.writeHead(200, { "content-type": "text/html; charset=utf-8", "cache-control": "no-store" });
      return res.end(hostedInvoicePage(invoiceView(invoice) as never, state.customers[invoice.customer]!, url.searchParams.get("note")));
    }
    if ((m = url.pathname.match(/^\/i\/(in_\w+)\/(pay|fail)$/)) && method === "POST") {
      const invoice = findInvoice(m[1]!);
      let note = m[2] === "pay" ? "paid" : "failed";
      try {
        if (m[2] === "pay") markPaid(invoice);
        else failPayment(invoice);
      } catch (error) {
        note = error instanceof ApiError ? error.message : "error";
      }
      save();
      void pump();
      res.writeHead(303, { location: `/i/${invoice.id}?note=${encodeURIComponent(note)}` });
      return res.end();
    }
    send(
      res,
      {
        status: 404,
        body: errorBody(new ApiError(404, "invalid_request_error", `Unrecognized request URL (${method}: ${url.pathname}).`), requestId),
      },
      requestId,
    );
  } catch (error) {
    if (error instanceof ApiError) return send(res, { status: error.status, body: errorBody(error, requestId) }, requestId);
    console.error("payments fake:", error);
    send(res, { status: 500, body: errorBody(new ApiError(500, "api_error", "The fake failed; see its log."), requestId) }, requestId);
  }
});

// Events still waiting from before a restart are delivered again.
for (const event of Object.values(state.events).sort((a, b) => a.created - b.created)) {
  if (!event.delivery.delivered && event.delivery.attempts > 0 && webhookUrl) deliveryQueue.push(event.id);
}
server.listen(port, "127.0.0.1", () => {
  console.log(
    `payments fake listening on ${base}, state in ${stateFile}${webhookUrl ? `, webhooks to ${webhookUrl}` : ", webhooks off (PAYMENTS_WEBHOOK_URL unset)"}`,
  );
  void pump();
});
for (const signal of ["SIGINT", "SIGTERM"] as const) {
  process.on(signal, () => {
    save();
    server.close(() => process.exit(0));
    setTimeout(() => process.exit(0), 1000).unref();
  });
}
