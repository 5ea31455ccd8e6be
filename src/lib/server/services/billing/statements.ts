/**
 * The statements screens (/statements, /statements/[id]) and their API (/api/statements,
 * /api/statements/[id]): the period overview, the statement list, one statement, and opening a
 * draft. A draft follows the ledger until it is issued (statement-issue.ts).
 */
import { Op } from "sequelize";
import { issueBlocker, statementReference, type StatementComputation } from "../../../billing/statement";
import type { InvoiceStatus, PeriodRow, StatementStatus, StatementSummary, StatementView } from "../../../billing/types";
import { can } from "../../../permissions";
import { getSequelize } from "../../db";
import type { SignedInUser } from "../../guard";
import { HttpError } from "../../http";
import { Invoice, Statement } from "../../models/billing";
import { Client } from "../../models/organisation";
import { select } from "../../query";
import { inTransaction } from "../sql";
import { invoiceView } from "./invoices";
import { computeStatement } from "./statement-lines";

/** What a statement shows of itself and its client: the screens and the PDF alike. */
export function statementFields(statement: Statement, client: Client) {
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
    issuedAt: statement.issuedAt?.toISOString() ?? null,
  } satisfies Partial<StatementView>;
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
  let computation: StatementComputation | null = null;
  if (statement.status === "draft") {
    // A draft always shows the ledger as it is now; issuing freezes it.
    computation = await computeStatement(client.id, String(statement.periodStart), String(statement.periodEnd));
    if (computation.total_minor !== statement.totalMinor || JSON.stringify(computation.lines) !== JSON.stringify(statement.lines)) {
      await statement.update({ lines: computation.lines, totalMinor: computation.total_minor });
    }
  }
  const invoice = await Invoice.findOne({ where: { statementId: id } });
  return {
    ...statementFields(statement, client),
    uncosted: computation?.uncosted ?? [],
    invoice: invoice ? invoiceView(invoice, client, statement) : null,
    blocker: computation ? issueBlocker(String(statement.periodEnd), computation, now.toISOString().slice(0, 10)) : null,
  };
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

interface StatementListRow {
  id: number;
  client_id: number;
  client_name: string;
  period_start: string;
  period_end: string;
  status: StatementStatus;
  total_minor: number;
  currency: string;
  issued_at: Date | null;
  invoice_status: InvoiceStatus | null;
  hosted_url: string | null;
}

/** Statements newest first; client contacts get their organisation's issued ones only. */
export async function listStatements(viewer: SignedInUser, limit = 100): Promise<StatementSummary[]> {
  const all = can(viewer.role, "read:statement");
  if (!all && viewer.clientId === null) return [];
  const rows = await select<StatementListRow>(
    `SELECT s.id, s.client_id, c.name AS client_name, DATE_FORMAT(s.period_start, '%Y-%m-%d') AS period_start, DATE_FORMAT(s.period_end, '%Y-%m-%d') AS period_end,
            s.status, s.total_minor, s.currency, s.issued_at, i.status AS invoice_status, i.hosted_url
       FROM statements s JOIN clients c ON c.id = s.client_id LEFT JOIN invoices i ON i.statement_id = s.id
      WHERE (:all OR (s.client_id = :clientId AND s.status <> 'draft'))
      ORDER BY s.period_start DESC, c.name ASC LIMIT :limit`,
    { replacements: { all, clientId: viewer.clientId ?? 0, limit } },
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

/** Opens the client's statement for a period: the existing one, or a new draft computed from the ledger. */
export async function openStatement(
  input: { clientId: number; periodStart: string; periodEnd: string },
  actor: SignedInUser,
): Promise<{ id: number; created: boolean }> {
  if (input.periodEnd < input.periodStart) throw new HttpError(400, "periodEnd: must be on or after periodStart");
  return inTransaction(getSequelize(), async (transaction) => {
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
