/**
 * Billing: rates, statements, period locks, invoices through the payments provider's SDK, and the
 * provider's webhooks. Costing is pure (src/lib/billing); this module does the I/O around it.
 */
import { Op, QueryTypes, UniqueConstraintError, type Sequelize, type Transaction } from "sequelize";
import Stripe from "stripe";
import { formatMoney } from "../../billing/money";
import type { PriceList, Rate } from "../../billing/rates";
import {
  buildStatement,
  journalCsv,
  nextDay,
  quantityLabel,
  statementCsv,
  statementReference,
  type CountRow,
  type JournalStatement,
  type StatementComputation,
  type StatementLine,
  type UsageRow,
} from "../../billing/statement";
import type { RateInput } from "../../schemas/billing";
import { recordAudit } from "../audit";
import { getSequelize } from "../db";
import { getEnv } from "../env";
import type { SignedInUser } from "../guard";
import { HttpError } from "../http";
import { createTransport, escapeHtml } from "../mail";
import { Setting } from "../models/audit";
import { Invoice, PeriodLock, ProcessedEvent, RateRow, Statement, type InvoiceStatus } from "../models/billing";
import { Client, Project } from "../models/organisation";
import { getPayments, webhookSecret } from "../payments";
import { can } from "../../permissions";
import { renderStatementPdf } from "./statement-pdf";
import { inTransaction } from "./sql";

/** The Sequelize instance the models are bound to (a test's own database, or the app's). */
const db = (): Sequelize => Statement.sequelize ?? getSequelize();
const today = (now = new Date()) => now.toISOString().slice(0, 10);

async function setting<T>(key: string, fallback: T, transaction?: Transaction): Promise<T> {
  const row = await Setting.findByPk(key, { transaction });
  return row ? (row.value as T) : fallback;
}

// ── Rates ───────────────────────────────────────────────────────────────────────────────

export interface RateView extends Rate {
  reagentName: string | null;
  createdAt: string;
  /** "current" (in force today), "superseded" or "scheduled" (starts later). */
  state: "current" | "superseded" | "scheduled";
}

const toRate = (row: RateRow): Rate => ({
  id: row.id,
  kind: row.kind,
  reagentId: row.reagentId,
  grade: row.grade,
  priceList: row.priceList,
  unit: row.unit,
  amount_minor: row.amountMinor,
  currency: row.currency,
  effectiveFrom: String(row.effectiveFrom),
});

async function loadRates(priceList: PriceList, currency: string, transaction?: Transaction): Promise<Rate[]> {
  const rows = await RateRow.findAll({
    where: { priceList, currency },
    order: [
      ["effectiveFrom", "ASC"],
      ["id", "ASC"],
    ],
    transaction,
  });
  return rows.map(toRate);
}

export async function listRates(now = new Date()): Promise<RateView[]> {
  const rows = await RateRow.findAll({
    order: [
      ["priceList", "ASC"],
      ["kind", "ASC"],
      ["reagentId", "ASC"],
      ["grade", "ASC"],
      ["effectiveFrom", "DESC"],
      ["id", "DESC"],
    ],
  });
  const names = new Map(
    (await db().query<{ id: string; name: string }>("SELECT id, name FROM reagents", { type: QueryTypes.SELECT })).map((r) => [
      r.id,
      r.name,
    ]),
  );
  const day = today(now);
  // The newest rate started on or before today, per price list / kind / reagent / grade / currency, is current.
  const current = new Set<number>();
  const seen = new Set<string>();
  for (const row of rows) {
    const key = [row.priceList, row.kind, row.reagentId, row.grade, row.currency].join("|");
    if (String(row.effectiveFrom) <= day && !seen.has(key)) {
      seen.add(key);
      current.add(row.id);
    }
  }
  return rows.map((row) => ({
    ...toRate(row),
    reagentName: row.reagentId ? (names.get(row.reagentId) ?? row.reagentId) : null,
    createdAt: row.createdAt.toISOString(),
    state: current.has(row.id) ? "current" : String(row.effectiveFrom) > day ? "scheduled" : "superseded",
  }));
}

/** Adds a rate. Rates are never edited: a new effective-from supersedes the old price from that day. */
export async function addRate(input: RateInput, actor: SignedInUser, ip: string | null = null): Promise<RateView> {
  return inTransaction(db(), async (transaction) => {
    if (input.kind === "reagent") {
      const [reagent] = await db().query<{ unit: "mL" | "g"; grades: unknown }>("SELECT unit, grades FROM reagents WHERE id = :id", {
        type: QueryTypes.SELECT,
        replacements: { id: input.reagentId },
        transaction,
      });
      if (!reagent) throw new HttpError(400, `reagentId: no reagent "${input.reagentId}" in the catalogue`);
      const grades = (typeof reagent.grades === "string" ? JSON.parse(reagent.grades) : reagent.grades) as string[];
      if (input.grade && !grades.includes(input.grade)) throw new HttpError(400, `grade: ${input.reagentId} comes in ${grades.join(", ")}`);
      const expected = reagent.unit === "g" ? "g" : "L";
      if (input.unit !== expected) throw new HttpError(400, `unit: ${input.reagentId} is priced per ${expected}`);
    }
    // A price may not reach back into a period that has been issued: that period's figures are final.
    const [lock] = await db().query<{ last: string | null }>(
      `SELECT MAX(l.period_end) AS last FROM period_locks l JOIN clients c ON c.id = l.client_id WHERE c.kind = :kind AND c.currency = :currency`,
      { type: QueryTypes.SELECT, replacements: { kind: input.priceList, currency: input.currency }, transaction },
    );
    const lastLocked = lock?.last ? String(lock.last).slice(0, 10) : null;
    if (lastLocked && input.effectiveFrom <= lastLocked) {
      throw new HttpError(
        400,
        `effectiveFrom: ${input.priceList} statements up to ${lastLocked} are issued; a new price can start on ${nextDay(lastLocked)} at the earliest`,
      );
    }
    const row = await RateRow.create(
      {
        kind: input.kind,
        reagentId: input.kind === "reagent" ? input.reagentId! : null,
        grade: input.kind === "reagent" ? (input.grade ?? null) : null,
        priceList: input.priceList,
        unit: input.unit,
        amountMinor: input.amount_minor,
        currency: input.currency,
        effectiveFrom: input.effectiveFrom,
        createdBy: actor.id,
      },
      { transaction },
    );
    await recordAudit({ actorId: actor.id, action: "rate.add", entity: "rate", entityId: row.id, ip, after: toRate(row) }, transaction);
    return {
      ...toRate(row),
      reagentName: input.reagentId ?? null,
      createdAt: row.createdAt.toISOString(),
      state: input.effectiveFrom <= today() ? "current" : "scheduled",
    } as RateView;
  });
}

// ── Period locks ────────────────────────────────────────────────────────────────────────

const dayOf = (date: Date | string) => (typeof date === "string" ? date.slice(0, 10) : date.toISOString().slice(0, 10));

/** True when the client's statement covering that day has been issued (or invoiced). */
export async function isPeriodLocked(clientId: number, date: Date | string, transaction?: Transaction): Promise<boolean> {
  const day = dayOf(date);
  const count = await PeriodLock.count({ where: { clientId, periodStart: { [Op.lte]: day }, periodEnd: { [Op.gte]: day } }, transaction });
  return count > 0;
}

/**
 * Where an entry dated `date` for the client belongs: `date` itself while its period is open,
 * otherwise the first instant after the locked periods that cover it (the next open period).
 * The ledger service dates late corrections with this, so an issued statement never changes.
 */
export async function openDateFor(clientId: number, date: Date, transaction?: Transaction): Promise<Date> {
  let at = date;
  for (let guard = 0; guard < 1000; guard++) {
    const day = dayOf(at);
    const lock = await PeriodLock.findOne({
      where: { clientId, periodStart: { [Op.lte]: day }, periodEnd: { [Op.gte]: day } },
      order: [["periodEnd", "DESC"]],
      transaction,
    });
    if (!lock) return at;
    at = new Date(`${nextDay(String(lock.periodEnd))}T00:00:00.000Z`);
  }
  throw new Error("openDateFor: period locks form a loop");
}

/** The same for a project's entry (the ledger knows projects, not clients); null project → unchanged. */
export async function openDateForProject(projectId: number | null, date: Date, transaction?: Transaction): Promise<Date> {
  if (projectId === null) return date;
  const project = await Project.findByPk(projectId, { transaction });
  return project ? openDateFor(project.clientId, date, transaction) : date;
}

// ── Statements: computing ───────────────────────────────────────────────────────────────

/** Lines for a client and period from the ledger at the rates in force on each day. */
export async function computeStatement(
  clientId: number,
  periodStart: string,
  periodEnd: string,
  transaction?: Transaction,
): Promise<StatementComputation> {
  const client = await Client.findByPk(clientId, { transaction });
  if (!client) throw new HttpError(404, `clientId: no client ${clientId}`);
  const replacements = { clientId, start: periodStart, end: nextDay(periodEnd) };
  // Summed by the database per project, reagent, grade and day; rates change at most daily.
  const usage = await db().query<{
    project_code: string;
    project_name: string;
    reagent_id: string;
    reagent_name: string;
    grade: string | null;
    day: string;
    volume_ml: string;
    mass_g: string | null;
  }>(
    `SELECT u.project_code, u.project_name, u.reagent_id, u.reagent_name, u.grade, u.day,
            SUM(u.volume_ml) AS volume_ml, SUM(u.mass_g) AS mass_g
       FROM (SELECT p.code AS project_code, p.name AS project_name, le.reagent_id, r.name AS reagent_name,
                    (SELECT sl.grade FROM batch_components bc JOIN stock_lots sl ON sl.id = bc.stock_lot_id
                      WHERE bc.batch_id = le.batch_id AND bc.reagent_id = le.reagent_id ORDER BY bc.id LIMIT 1) AS grade,
                    DATE_FORMAT(le.occurred_at, '%Y-%m-%d') AS day, le.volume_ml, le.mass_g
               FROM ledger_entries le
               JOIN projects p ON p.id = le.project_id
               JOIN reagents r ON r.id = le.reagent_id
              WHERE p.client_id = :clientId AND le.occurred_at >= :start AND le.occurred_at < :end
                AND le.kind <> 'preparation') u
      GROUP BY u.project_code, u.project_name, u.reagent_id, u.reagent_name, u.grade, u.day`,
    { type: QueryTypes.SELECT, replacements, transaction },
  );
  const injections = await db().query<{ project_code: string; project_name: string; day: string; count: number | string }>(
    `SELECT p.code AS project_code, p.name AS project_name, DATE_FORMAT(ru.started_at, '%Y-%m-%d') AS day, SUM(ru.injections) AS count
       FROM runs ru JOIN projects p ON p.id = ru.project_id
      WHERE p.client_id = :clientId AND ru.started_at >= :start AND ru.started_at < :end
      GROUP BY p.code, p.name, day`,
    { type: QueryTypes.SELECT, replacements, transaction },
  );
  // A batch prepared for a project carries one preparation fee, on the day it was made.
  const preparations = await db().query<{ project_code: string; project_name: string; day: string; count: number | string }>(
    `SELECT b.project_code, b.project_name, b.day, COUNT(*) AS count FROM (
       SELECT p.code AS project_code, p.name AS project_name, le.batch_id, DATE_FORMAT(MIN(le.occurred_at), '%Y-%m-%d') AS day
         FROM ledger_entries le JOIN projects p ON p.id = le.project_id
        WHERE p.client_id = :clientId AND le.kind = 'preparation' AND le.batch_id IS NOT NULL
        GROUP BY p.code, p.name, le.batch_id) b
      WHERE b.day >= :start AND b.day < :end
      GROUP BY b.project_code, b.project_name, b.day`,
    { type: QueryTypes.SELECT, replacements, transaction },
  );
  const counts = (rows: typeof injections): CountRow[] =>
    rows.map((r) => ({ projectCode: r.project_code, projectName: r.project_name, day: r.day, count: Number(r.count) }));
  const rows: UsageRow[] = usage.map((u) => ({
    projectCode: u.project_code,
    projectName: u.project_name,
    reagentId: u.reagent_id,
    reagentName: u.reagent_name,
    grade: u.grade,
    day: u.day,
    volume_mL: u.volume_ml ?? "0",
    mass_g: u.mass_g,
  }));
  const rates = await loadRates(client.kind, client.currency, transaction);
  return buildStatement({
    usage: rows,
    injections: counts(injections),
    preparations: counts(preparations),
    rates,
    priceList: client.kind,
    currency: client.currency,
  });
}

// ── Statements: views ───────────────────────────────────────────────────────────────────

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
  status: "draft" | "issued" | "void";
  lines: StatementLine[];
  total_minor: number;
  currency: string;
  uncosted: string[];
  issuedAt: string | null;
  invoice: InvoiceView | null;
  /** Why the draft cannot be issued yet, if so. */
  blocker: string | null;
}

function invoiceView(invoice: Invoice, client: Client, statement: Statement): InvoiceView {
  return {
    id: invoice.id,
    statementId: invoice.statementId,
    clientId: invoice.clientId,
    clientName: client.name,
    number: invoice.number,
    providerInvoiceId: invoice.providerInvoiceId,
    hostedUrl: invoice.hostedUrl,
    status: invoice.status,
    amount_minor: invoice.amountMinor,
    currency: invoice.currency,
    dueOn: invoice.dueOn ? String(invoice.dueOn) : null,
    sentAt: invoice.sentAt?.toISOString() ?? null,
    paidAt: invoice.paidAt?.toISOString() ?? null,
    paymentFailedAt: invoice.paymentFailedAt?.toISOString() ?? null,
    lastPaymentError: invoice.lastPaymentError,
    periodStart: String(statement.periodStart),
    periodEnd: String(statement.periodEnd),
  };
}

function blockerOf(statement: { periodEnd: string; status: string }, computation: StatementComputation, now = new Date()): string | null {
  if (statement.status !== "draft") return null;
  if (statement.periodEnd >= today(now)) return `The period runs until ${statement.periodEnd}; issue it once it has ended.`;
  if (computation.uncosted.length)
    return `No rate in force for ${computation.uncosted.join(", ")} on some days of the period; add a rate first.`;
  if (computation.lines.length === 0 || computation.total_minor === 0) return "Nothing to charge in this period.";
  return null;
}

/** Client contacts see their own organisation's issued statements only; staff see all. */
function assertMaySee(viewer: SignedInUser, statement: Statement) {
  if (can(viewer.role, "read:statement")) return;
  if (viewer.clientId !== statement.clientId || statement.status === "draft") throw new HttpError(404, `No statement ${statement.id}.`);
}

export async function getStatement(id: number, viewer: SignedInUser, now = new Date()): Promise<StatementView> {
  const statement = await Statement.findByPk(id);
  if (!statement) throw new HttpError(404, `No statement ${id}.`);
  assertMaySee(viewer, statement);
  const client = (await Client.findByPk(statement.clientId))!;
  let uncosted: string[] = [];
  let computation: StatementComputation | null = null;
  if (statement.status === "draft") {
    // A draft always shows the ledger as it is now; issuing freezes it.
    computation = await computeStatement(client.id, String(statement.periodStart), String(statement.periodEnd));
    uncosted = computation.uncosted;
    if (computation.total_minor !== statement.totalMinor || JSON.stringify(computation.lines) !== JSON.stringify(statement.lines)) {
      await statement.update({ lines: computation.lines, totalMinor: computation.total_minor });
    }
  }
  const invoice = await Invoice.findOne({ where: { statementId: id } });
  return {
    id: statement.id,
    reference: statementReference(statement.id),
    clientId: client.id,
    clientName: client.name,
    clientKind: client.kind,
    costCentre: client.costCentre,
    billingEmail: client.billingEmail,
    periodStart: String(statement.periodStart),
    periodEnd: String(statement.periodEnd),
    status: statement.status,
    lines: statement.lines,
    total_minor: statement.totalMinor,
    currency: statement.currency,
    uncosted,
    issuedAt: statement.issuedAt?.toISOString() ?? null,
    invoice: invoice ? invoiceView(invoice, client, statement) : null,
    blocker: computation ? blockerOf({ periodEnd: String(statement.periodEnd), status: statement.status }, computation, now) : null,
  };
}

export interface PeriodRow {
  clientId: number;
  clientName: string;
  kind: "internal" | "external";
  costCentre: string | null;
  statementId: number | null;
  status: "none" | "draft" | "issued" | "void";
  total_minor: number;
  currency: string;
  invoiceStatus: InvoiceStatus | null;
}

/** Every active client for a period, with its statement if one exists (totals previewed otherwise). */
export async function periodOverview(periodStart: string, periodEnd: string): Promise<PeriodRow[]> {
  const clients = await Client.findAll({
    where: { active: true },
    order: [
      ["kind", "DESC"],
      ["name", "ASC"],
    ],
  });
  const statements = await Statement.findAll({ where: { periodStart, periodEnd } });
  const invoices = await Invoice.findAll({ where: { statementId: statements.map((s) => s.id) } });
  const rows: PeriodRow[] = [];
  for (const client of clients) {
    const statement = statements.find((s) => s.clientId === client.id);
    const invoice = statement ? invoices.find((i) => i.statementId === statement.id) : undefined;
    const live = !statement || statement.status === "draft" ? await computeStatement(client.id, periodStart, periodEnd) : null;
    rows.push({
      clientId: client.id,
      clientName: client.name,
      kind: client.kind,
      costCentre: client.costCentre,
      statementId: statement?.id ?? null,
      status: statement?.status ?? "none",
      total_minor: live ? live.total_minor : statement!.totalMinor,
      currency: client.currency,
      invoiceStatus: invoice?.status ?? null,
    });
  }
  return rows;
}

export interface StatementSummary {
  id: number;
  reference: string;
  clientId: number;
  clientName: string;
  periodStart: string;
  periodEnd: string;
  status: "draft" | "issued" | "void";
  total_minor: number;
  currency: string;
  issuedAt: string | null;
  invoiceStatus: InvoiceStatus | null;
  hostedUrl: string | null;
}

/** Statements newest first; client contacts get their organisation's issued ones only. */
export async function listStatements(viewer: SignedInUser, limit = 100): Promise<StatementSummary[]> {
  const all = can(viewer.role, "read:statement");
  if (!all && viewer.clientId === null) return [];
  const rows = await db().query<{
    id: number;
    client_id: number;
    client_name: string;
    period_start: string;
    period_end: string;
    status: "draft" | "issued" | "void";
    total_minor: number;
    currency: string;
    issued_at: Date | null;
    invoice_status: InvoiceStatus | null;
    hosted_url: string | null;
  }>(
    `SELECT s.id, s.client_id, c.name AS client_name, DATE_FORMAT(s.period_start, '%Y-%m-%d') AS period_start, DATE_FORMAT(s.period_end, '%Y-%m-%d') AS period_end,
            s.status, s.total_minor, s.currency, s.issued_at, i.status AS invoice_status, i.hosted_url
       FROM statements s JOIN clients c ON c.id = s.client_id LEFT JOIN invoices i ON i.statement_id = s.id
      WHERE (:all OR (s.client_id = :clientId AND s.status <> 'draft'))
      ORDER BY s.period_start DESC, c.name ASC LIMIT :limit`,
    { type: QueryTypes.SELECT, replacements: { all, clientId: viewer.clientId ?? 0, limit } },
  );
  return rows.map((r) => ({
    id: r.id,
    reference: statementReference(r.id),
    clientId: r.client_id,
    clientName: r.client_name,
    periodStart: r.period_start,
    periodEnd: r.period_end,
    status: r.status,
    total_minor: r.total_minor,
    currency: r.currency,
    issuedAt: r.issued_at ? new Date(r.issued_at).toISOString() : null,
    invoiceStatus: r.invoice_status,
    hostedUrl: r.hosted_url,
  }));
}

/** Invoices newest first; client contacts get their organisation's only. */
export async function listInvoices(viewer: SignedInUser): Promise<InvoiceView[]> {
  const where = can(viewer.role, "read:invoice") ? {} : { clientId: viewer.clientId ?? -1 };
  const invoices = await Invoice.findAll({
    where,
    order: [
      ["createdAt", "DESC"],
      ["id", "DESC"],
    ],
  });
  const clients = new Map((await Client.findAll()).map((c) => [c.id, c]));
  const statements = new Map((await Statement.findAll({ where: { id: invoices.map((i) => i.statementId) } })).map((s) => [s.id, s]));
  return invoices.map((i) => invoiceView(i, clients.get(i.clientId)!, statements.get(i.statementId)!));
}

// ── Statements: drafting and issuing ────────────────────────────────────────────────────

/** Opens the client's statement for a period: the existing one, or a new draft computed from the ledger. */
export async function openStatement(
  input: { clientId: number; periodStart: string; periodEnd: string },
  actor: SignedInUser,
): Promise<{ id: number; created: boolean }> {
  if (input.periodEnd < input.periodStart) throw new HttpError(400, "periodEnd: must be on or after periodStart");
  return inTransaction(db(), async (transaction) => {
    const client = await Client.findByPk(input.clientId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!client) throw new HttpError(400, `clientId: no client ${input.clientId}`);
    const existing = await Statement.findOne({
      where: { clientId: client.id, periodStart: input.periodStart, periodEnd: input.periodEnd },
      transaction,
    });
    if (existing) return { id: existing.id, created: false };
    const overlapping = await Statement.findOne({
      where: {
        clientId: client.id,
        status: { [Op.ne]: "void" },
        periodStart: { [Op.lte]: input.periodEnd },
        periodEnd: { [Op.gte]: input.periodStart },
      },
      transaction,
    });
    if (overlapping)
      throw new HttpError(
        409,
        `periodStart: ${statementReference(overlapping.id)} already covers ${overlapping.periodStart} – ${overlapping.periodEnd} for ${client.name}`,
      );
    const computation = await computeStatement(client.id, input.periodStart, input.periodEnd, transaction);
    const statement = await Statement.create(
      {
        clientId: client.id,
        periodStart: input.periodStart,
        periodEnd: input.periodEnd,
        lines: computation.lines,
        totalMinor: computation.total_minor,
        currency: client.currency,
        issuedAt: null,
        issuedBy: null,
        voidedAt: null,
        createdBy: actor.id,
      },
      { transaction },
    );
    return { id: statement.id, created: true };
  });
}

/** Freezes a draft inside the caller's transaction: recomputed, compared with what the manager reviewed, locked. */
async function issueLocked(
  statement: Statement,
  client: Client,
  expectedTotal: number | undefined,
  actor: SignedInUser,
  ip: string | null,
  transaction: Transaction,
  now: Date,
) {
  if (statement.status !== "draft") throw new HttpError(409, `${statementReference(statement.id)} is already ${statement.status}.`);
  const computation = await computeStatement(client.id, String(statement.periodStart), String(statement.periodEnd), transaction);
  const blocker = blockerOf({ periodEnd: String(statement.periodEnd), status: "draft" }, computation, now);
  if (blocker) throw new HttpError(409, blocker);
  if (expectedTotal !== undefined && expectedTotal !== computation.total_minor) {
    throw new HttpError(
      409,
      `expectedTotal_minor: the ledger changed since this draft was opened; the total is now ${formatMoney({ amount: computation.total_minor, currency: client.currency })}. Review it again.`,
      { total_minor: computation.total_minor },
    );
  }
  const before = { status: statement.status, total_minor: statement.totalMinor };
  await statement.update(
    { status: "issued", lines: computation.lines, totalMinor: computation.total_minor, issuedAt: now, issuedBy: actor.id },
    { transaction },
  );
  await PeriodLock.create(
    { clientId: client.id, periodStart: String(statement.periodStart), periodEnd: String(statement.periodEnd), statementId: statement.id },
    { transaction },
  );
  await recordAudit(
    {
      actorId: actor.id,
      action: "statement.issue",
      entity: "statement",
      entityId: statement.id,
      ip,
      before,
      after: { status: "issued", total_minor: computation.total_minor, currency: client.currency, lines: computation.lines.length },
    },
    transaction,
  );
}

/** Issues an internal client's chargeback statement (or an external one without invoicing it). */
export async function issueStatement(
  id: number,
  options: { expectedTotal_minor?: number | undefined },
  actor: SignedInUser,
  ip: string | null = null,
  now = new Date(),
): Promise<void> {
  await inTransaction(db(), async (transaction) => {
    const statement = await Statement.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!statement) throw new HttpError(404, `No statement ${id}.`);
    const client = (await Client.findByPk(statement.clientId, { transaction }))!;
    if (client.kind === "external") throw new HttpError(409, `${client.name} is an external client: invoice the statement instead.`);
    await issueLocked(statement, client, options.expectedTotal_minor, actor, ip, transaction, now);
  });
}

/** The idempotency keys of a statement's provider calls: stable across retries, unique across databases. */
export function statementKey(statement: Pick<Statement, "id" | "createdAt" | "revision">) {
  return `decant-statement-${statement.id}-${statement.createdAt.getTime()}-r${statement.revision}`;
}

function providerError(error: unknown): never {
  if (error instanceof Stripe.errors.StripeIdempotencyError) {
    throw new HttpError(
      409,
      `The payments service holds an earlier attempt for this statement with different contents (${error.message}).`,
    );
  }
  if (error instanceof Stripe.errors.StripeError) {
    throw new HttpError(502, `The payments service refused the request: ${error.message}`, { providerCode: error.code ?? null });
  }
  throw error;
}

/** The client's customer at the provider: reused by its stored id, else created under the statement's key. */
async function ensureCustomer(payments: Stripe, client: Client, key: string, transaction: Transaction): Promise<string> {
  if (client.paymentsCustomerId) {
    try {
      const existing = await payments.customers.retrieve(client.paymentsCustomerId);
      if (!("deleted" in existing && existing.deleted)) {
        if (existing.email !== client.billingEmail || existing.name !== client.name) {
          await payments.customers.update(existing.id, { email: client.billingEmail ?? "", name: client.name });
        }
        return existing.id;
      }
    } catch (error) {
      if (!(error instanceof Stripe.errors.StripeInvalidRequestError && error.code === "resource_missing")) throw error;
    }
  }
  const customer = await payments.customers.create(
    {
      name: client.name,
      ...(client.billingEmail ? { email: client.billingEmail } : {}),
      metadata: { decant_client_id: String(client.id) },
    },
    // Keyed by the statement being invoiced: a retry of this run finds the same customer.
    { idempotencyKey: `${key}-customer` },
  );
  await client.update({ paymentsCustomerId: customer.id }, { transaction });
  return customer.id;
}

const fromUnix = (seconds: number | null | undefined) => (seconds ? new Date(seconds * 1000) : null);

/**
 * Invoices an external client's statement through the payments provider, in one transaction:
 * issue the draft (period locked), create or reuse the customer, create the invoice, add one item
 * per line, finalize and send. Every provider call carries a key derived from the statement, so a
 * retry or a double click reaches the same provider objects and never bills twice.
 */
export async function invoiceStatement(
  id: number,
  options: { expectedTotal_minor?: number | undefined },
  actor: SignedInUser,
  ip: string | null = null,
  deps: { payments?: Stripe; now?: Date } = {},
): Promise<{ invoice: InvoiceView; created: boolean }> {
  const now = deps.now ?? new Date();
  const payments = deps.payments ?? getPayments();
  const result = await inTransaction(db(), async (transaction) => {
    const statement = await Statement.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!statement) throw new HttpError(404, `No statement ${id}.`);
    const client = (await Client.findByPk(statement.clientId, { transaction, lock: transaction.LOCK.UPDATE }))!;
    if (client.kind !== "external") throw new HttpError(409, `${client.name} is an internal client: issue a chargeback statement instead.`);
    let invoice = await Invoice.findOne({ where: { statementId: statement.id }, transaction, lock: transaction.LOCK.UPDATE });
    if (invoice && invoice.status !== "draft") return { invoice: invoiceView(invoice, client, statement), created: false, mail: null };
    if (statement.status === "void") throw new HttpError(409, `${statementReference(statement.id)} is void.`);
    if (statement.status === "draft") await issueLocked(statement, client, options.expectedTotal_minor, actor, ip, transaction, now);
    if (!client.billingEmail) throw new HttpError(409, `${client.name} has no billing e-mail; add one before invoicing.`);
    invoice ??= await Invoice.create(
      {
        statementId: statement.id,
        clientId: client.id,
        providerInvoiceId: null,
        providerCustomerId: null,
        number: null,
        hostedUrl: null,
        amountMinor: statement.totalMinor,
        currency: statement.currency,
        dueOn: null,
        finalizedAt: null,
        sentAt: null,
        paidAt: null,
        voidedAt: null,
        uncollectibleAt: null,
        paymentFailedAt: null,
        lastPaymentError: null,
        createdBy: actor.id,
      },
      { transaction },
    );
    const key = statementKey(statement);
    const reference = statementReference(statement.id);
    const currency = statement.currency.toLowerCase();
    const daysUntilDue = Number(await setting("invoices.daysUntilDue", 30, transaction));
    try {
      const customerId = await ensureCustomer(payments, client, key, transaction);
      const draft = await payments.invoices.create(
        {
          customer: customerId,
          collection_method: "send_invoice",
          days_until_due: daysUntilDue,
          auto_advance: false,
          currency,
          pending_invoice_items_behavior: "exclude",
          description: `LC core facility use, ${statement.periodStart} to ${statement.periodEnd} (${reference})`,
          metadata: { decant_statement_id: String(statement.id), decant_statement_ref: reference, decant_client_id: String(client.id) },
        },
        { idempotencyKey: `${key}-invoice` },
      );
      const providerId = draft.id!;
      const lines = statement.lines.filter((line) => line.amount_minor !== 0);
      for (const [index, line] of lines.entries()) {
        await payments.invoiceItems.create(
          {
            customer: customerId,
            invoice: providerId,
            amount: line.amount_minor,
            currency,
            description: `${line.projectCode} · ${line.description}: ${quantityLabel(line)}`,
            metadata: { decant_statement_id: String(statement.id), project_code: line.projectCode },
          },
          { idempotencyKey: `${key}-item-${index}` },
        );
      }
      const finalized = await payments.invoices.finalizeInvoice(providerId, { auto_advance: false }, { idempotencyKey: `${key}-finalize` });
      if (finalized.total !== statement.totalMinor) {
        throw new HttpError(
          502,
          `The payments service totals ${finalized.total} but the statement totals ${statement.totalMinor}; nothing was sent.`,
        );
      }
      const sent = await payments.invoices.sendInvoice(providerId, {}, { idempotencyKey: `${key}-send` });
      await invoice.update(
        {
          providerInvoiceId: providerId,
          providerCustomerId: customerId,
          number: sent.number ?? null,
          hostedUrl: sent.hosted_invoice_url ?? null,
          status: (sent.status as InvoiceStatus | null) ?? "open",
          amountMinor: sent.total,
          dueOn: sent.due_date ? new Date(sent.due_date * 1000).toISOString().slice(0, 10) : null,
          finalizedAt: fromUnix(sent.status_transitions?.finalized_at) ?? now,
          sentAt: now,
          paidAt: sent.status === "paid" ? (fromUnix(sent.status_transitions?.paid_at) ?? now) : null,
        },
        { transaction },
      );
    } catch (error) {
      if (error instanceof HttpError) throw error;
      providerError(error);
    }
    await recordAudit(
      {
        actorId: actor.id,
        action: "invoice.send",
        entity: "invoice",
        entityId: invoice.id,
        ip,
        after: {
          providerInvoiceId: invoice.providerInvoiceId,
          number: invoice.number,
          amount_minor: invoice.amountMinor,
          currency: invoice.currency,
        },
      },
      transaction,
    );
    return { invoice: invoiceView(invoice, client, statement), created: true, mail: { client, statement } };
  });
  if (result.mail)
    await mailInvoice(result.invoice, result.mail.client, result.mail.statement).catch((error) =>
      console.error(`invoice mail for ${result.invoice.number}: ${(error as Error).message}`),
    );
  return { invoice: result.invoice, created: result.created };
}

/** The invoice e-mail to the client's billing address, the statement PDF attached. */
async function mailInvoice(invoice: InvoiceView, client: Client, statement: Statement) {
  if (!client.billingEmail || !invoice.hostedUrl) return;
  const env = getEnv();
  const facility = await setting("facility.name", "Decant");
  const amount = formatMoney({ amount: invoice.amount_minor, currency: invoice.currency });
  const pdf = await renderStatementPdf(await pdfInput(statement.id));
  const subject = `Invoice ${invoice.number ?? ""} from ${facility}: ${amount}${invoice.dueOn ? `, due ${invoice.dueOn}` : ""}`;
  const text = [
    `Hello,`,
    ``,
    `${facility} has invoiced ${client.name} ${amount} for instrument and solvent use from ${invoice.periodStart} to ${invoice.periodEnd}${invoice.dueOn ? `, due on ${invoice.dueOn}` : ""}.`,
    `The statement with every line is attached (${statementReference(statement.id)}).`,
    ``,
    `Pay or download the invoice here: ${invoice.hostedUrl}`,
  ].join("\n");
  const html = `<p>Hello,</p><p>${escapeHtml(facility)} has invoiced ${escapeHtml(client.name)} <strong>${escapeHtml(amount)}</strong> for instrument and solvent use from ${invoice.periodStart} to ${invoice.periodEnd}${invoice.dueOn ? `, due on ${invoice.dueOn}` : ""}.</p><p>The statement with every line is attached (${statementReference(statement.id)}).</p><p><a href="${escapeHtml(invoice.hostedUrl)}">Pay or download the invoice</a></p>`;
  mailTransport ??= createTransport(env);
  await mailTransport.sendMail({
    from: env.MAIL_FROM,
    to: client.billingEmail,
    subject,
    text,
    html,
    attachments: [{ filename: `${statementReference(statement.id)}.pdf`, content: Buffer.from(pdf), contentType: "application/pdf" }],
  });
}
let mailTransport: ReturnType<typeof createTransport> | undefined;

// ── Invoices: manager actions ───────────────────────────────────────────────────────────

async function invoiceAction(
  id: number,
  action: "void" | "uncollectible",
  actor: SignedInUser,
  ip: string | null,
  payments = getPayments(),
): Promise<InvoiceView> {
  return inTransaction(db(), async (transaction) => {
    const invoice = await Invoice.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!invoice || !invoice.providerInvoiceId) throw new HttpError(404, `No sent invoice ${id}.`);
    const statement = (await Statement.findByPk(invoice.statementId, { transaction, lock: transaction.LOCK.UPDATE }))!;
    const client = (await Client.findByPk(invoice.clientId, { transaction }))!;
    const allowed = action === "void" ? ["open", "uncollectible"] : ["open"];
    if (!allowed.includes(invoice.status))
      throw new HttpError(
        409,
        `Invoice ${invoice.number} is ${invoice.status}; it cannot be ${action === "void" ? "voided" : "marked uncollectible"}.`,
      );
    const before = { status: invoice.status };
    let remote: Stripe.Invoice;
    try {
      remote =
        action === "void"
          ? await payments.invoices.voidInvoice(invoice.providerInvoiceId, {}, { idempotencyKey: `${statementKey(statement)}-void` })
          : await payments.invoices.markUncollectible(
              invoice.providerInvoiceId,
              {},
              { idempotencyKey: `${statementKey(statement)}-uncollectible` },
            );
    } catch (error) {
      providerError(error);
    }
    if (action === "void") {
      await invoice.update({ status: "void", voidedAt: fromUnix(remote.status_transitions?.voided_at) ?? new Date() }, { transaction });
      // The period stays closed: anything still owed goes on the next period's statement.
      await statement.update({ status: "void", voidedAt: new Date() }, { transaction });
    } else {
      await invoice.update(
        { status: "uncollectible", uncollectibleAt: fromUnix(remote.status_transitions?.marked_uncollectible_at) ?? new Date() },
        { transaction },
      );
    }
    await recordAudit(
      {
        actorId: actor.id,
        action: `invoice.${action}`,
        entity: "invoice",
        entityId: invoice.id,
        ip,
        before,
        after: { status: invoice.status },
      },
      transaction,
    );
    return invoiceView(invoice, client, statement);
  });
}

export const voidInvoice = (id: number, actor: SignedInUser, ip: string | null = null, payments?: Stripe) =>
  invoiceAction(id, "void", actor, ip, payments);
export const markInvoiceUncollectible = (id: number, actor: SignedInUser, ip: string | null = null, payments?: Stripe) =>
  invoiceAction(id, "uncollectible", actor, ip, payments);

// ── Webhooks ────────────────────────────────────────────────────────────────────────────

/** Which stored status an event may move an invoice to, from which. Paid and void are final. */
const TRANSITIONS: Record<string, { to: InvoiceStatus; from: InvoiceStatus[] } | undefined> = {
  "invoice.paid": { to: "paid", from: ["draft", "open", "uncollectible"] },
  "invoice.voided": { to: "void", from: ["draft", "open", "uncollectible"] },
  "invoice.marked_uncollectible": { to: "uncollectible", from: ["open"] },
  "invoice.finalized": { to: "open", from: ["draft"] },
  "invoice.sent": { to: "open", from: ["draft"] },
};

export interface WebhookOutcome {
  eventId: string;
  type: string;
  outcome: "applied" | "duplicate" | "ignored";
  invoiceId?: number;
}

/**
 * Verifies and applies one provider event. The signature is checked on the raw body with the
 * endpoint secret (400 and nothing changed when it fails); the event id is recorded in the same
 * transaction as its effect, so a replay is recognised and changes nothing.
 */
export async function handlePaymentsWebhook(
  rawBody: string,
  signatureHeader: string | null,
  deps: { payments?: Stripe; secret?: string } = {},
): Promise<WebhookOutcome> {
  if (!signatureHeader) throw new HttpError(400, "Stripe-Signature: the header is missing; the request is not signed.");
  const payments = deps.payments ?? getPayments();
  let event: Stripe.Event;
  try {
    event = payments.webhooks.constructEvent(rawBody, signatureHeader, deps.secret ?? webhookSecret());
  } catch (error) {
    throw new HttpError(400, `Stripe-Signature: ${(error as Error).message.split("\n")[0]}`);
  }
  return inTransaction(db(), async (transaction) => {
    try {
      await ProcessedEvent.create({ id: event.id, type: event.type }, { transaction });
    } catch (error) {
      if (error instanceof UniqueConstraintError) return { eventId: event.id, type: event.type, outcome: "duplicate" as const };
      throw error;
    }
    if (!event.type.startsWith("invoice.")) return { eventId: event.id, type: event.type, outcome: "ignored" as const };
    const remote = event.data.object as Stripe.Invoice;
    let invoice = remote.id
      ? await Invoice.findOne({ where: { providerInvoiceId: remote.id }, transaction, lock: transaction.LOCK.UPDATE })
      : null;
    const statementId = Number(remote.metadata?.decant_statement_id);
    if (!invoice && Number.isInteger(statementId))
      invoice = await Invoice.findOne({ where: { statementId }, transaction, lock: transaction.LOCK.UPDATE });
    if (!invoice) return { eventId: event.id, type: event.type, outcome: "ignored" as const };
    const before = { status: invoice.status };
    if (event.type === "invoice.payment_failed") {
      if (invoice.status !== "open") return { eventId: event.id, type: event.type, outcome: "ignored" as const, invoiceId: invoice.id };
      const reason = (remote as unknown as { last_payment_error?: unknown }).last_payment_error;
      await invoice.update(
        {
          paymentFailedAt: fromUnix(event.created) ?? new Date(),
          lastPaymentError: typeof reason === "string" ? reason.slice(0, 255) : "The payment failed.",
        },
        { transaction },
      );
    } else {
      const transition = TRANSITIONS[event.type];
      if (!transition || !transition.from.includes(invoice.status))
        return { eventId: event.id, type: event.type, outcome: "ignored" as const, invoiceId: invoice.id };
      const changes: Partial<Invoice> = { status: transition.to };
      if (transition.to === "paid")
        Object.assign(changes, { paidAt: fromUnix(remote.status_transitions?.paid_at) ?? fromUnix(event.created), lastPaymentError: null });
      if (transition.to === "void")
        Object.assign(changes, { voidedAt: fromUnix(remote.status_transitions?.voided_at) ?? fromUnix(event.created) });
      if (transition.to === "uncollectible")
        Object.assign(changes, {
          uncollectibleAt: fromUnix(remote.status_transitions?.marked_uncollectible_at) ?? fromUnix(event.created),
        });
      if (transition.to === "open" && remote.hosted_invoice_url)
        Object.assign(changes, { hostedUrl: remote.hosted_invoice_url, number: remote.number ?? invoice.number });
      await invoice.update(changes, { transaction });
      if (transition.to === "void")
        await Statement.update({ status: "void", voidedAt: new Date() }, { where: { id: invoice.statementId }, transaction });
    }
    await recordAudit(
      {
        actorId: null,
        action: event.type,
        entity: "invoice",
        entityId: invoice.id,
        before,
        after: { status: invoice.status, event: event.id },
      },
      transaction,
    );
    return { eventId: event.id, type: event.type, outcome: "applied" as const, invoiceId: invoice.id };
  });
}

// ── Documents ───────────────────────────────────────────────────────────────────────────

/** What the statement PDF shows: the statement as the screens see it, plus the facility's name. */
export type StatementPdfInput = Pick<
  StatementView,
  | "reference"
  | "clientName"
  | "clientKind"
  | "costCentre"
  | "billingEmail"
  | "periodStart"
  | "periodEnd"
  | "status"
  | "issuedAt"
  | "lines"
  | "total_minor"
  | "currency"
> & {
  facility: string;
  invoice: Pick<InvoiceView, "number" | "dueOn" | "hostedUrl" | "status"> | null;
};

async function pdfInput(id: number): Promise<StatementPdfInput> {
  const statement = (await Statement.findByPk(id))!;
  const client = (await Client.findByPk(statement.clientId))!;
  const invoice = await Invoice.findOne({ where: { statementId: id } });
  return {
    facility: await setting("facility.name", "Decant"),
    reference: statementReference(statement.id),
    clientName: client.name,
    clientKind: client.kind,
    costCentre: client.costCentre,
    billingEmail: client.billingEmail,
    periodStart: String(statement.periodStart),
    periodEnd: String(statement.periodEnd),
    status: statement.status,
    issuedAt: statement.issuedAt?.toISOString() ?? null,
    lines: statement.lines,
    total_minor: statement.totalMinor,
    currency: statement.currency,
    invoice: invoice
      ? {
          number: invoice.number,
          dueOn: invoice.dueOn ? String(invoice.dueOn) : null,
          hostedUrl: invoice.hostedUrl,
          status: invoice.status,
        }
      : null,
  };
}

export async function statementPdf(id: number, viewer: SignedInUser): Promise<{ bytes: Uint8Array; fileName: string }> {
  const view = await getStatement(id, viewer); // scopes and refreshes a draft
  return { bytes: await renderStatementPdf(await pdfInput(id)), fileName: `${view.reference}.pdf` };
}

export async function statementCsvFile(id: number, viewer: SignedInUser): Promise<{ text: string; fileName: string }> {
  const view = await getStatement(id, viewer);
  return {
    text: statementCsv(
      {
        reference: view.reference,
        clientName: view.clientName,
        periodStart: view.periodStart,
        periodEnd: view.periodEnd,
        currency: view.currency,
      },
      view.lines,
    ),
    fileName: `${view.reference}.csv`,
  };
}

/** The chargeback journal for the finance office: every issued internal statement within the dates. */
export async function chargebackJournal(from: string, to: string): Promise<{ text: string; fileName: string; statements: number }> {
  const statements = await Statement.findAll({
    where: { status: "issued", periodStart: { [Op.gte]: from }, periodEnd: { [Op.lte]: to } },
    order: [
      ["periodStart", "ASC"],
      ["id", "ASC"],
    ],
  });
  const clients = new Map((await Client.findAll({ where: { kind: "internal" } })).map((c) => [c.id, c]));
  const rows: JournalStatement[] = statements
    .filter((s) => clients.has(s.clientId))
    .map((s) => {
      const client = clients.get(s.clientId)!;
      return {
        reference: statementReference(s.id),
        clientName: client.name,
        costCentre: client.costCentre ?? "",
        periodStart: String(s.periodStart),
        periodEnd: String(s.periodEnd),
        currency: s.currency,
        lines: s.lines,
      };
    });
  return { text: journalCsv(rows), fileName: `chargeback-journal-${from}-to-${to}.csv`, statements: rows.length };
}

/** Reagents a rate can be set for, with their unit and grades. */
export async function rateReagents(): Promise<{ id: string; name: string; unit: "mL" | "g"; grades: string[] }[]> {
  const rows = await db().query<{ id: string; name: string; unit: "mL" | "g"; grades: unknown }>(
    "SELECT id, name, unit, grades FROM reagents WHERE active = 1 ORDER BY name",
    { type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    unit: r.unit,
    grades: (typeof r.grades === "string" ? JSON.parse(r.grades) : r.grades) as string[],
  }));
}
