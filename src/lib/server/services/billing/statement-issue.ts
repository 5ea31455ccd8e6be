/**
 * Issuing a statement (/api/statements/[id]/issue): the draft is recomputed, compared with what
 * the manager reviewed, frozen, and its period locked for the client. Invoicing an external
 * client's statement (statement-invoice.ts) issues it the same way first.
 */
import type { Transaction } from "sequelize";
import { formatMoney } from "../../../billing/money";
import { issueBlocker, statementReference } from "../../../billing/statement";
import { recordAudit } from "../../audit";
import { getSequelize } from "../../db";
import type { SignedInUser } from "../../guard";
import { HttpError } from "../../http";
import { PeriodLock, Statement } from "../../models/billing";
import { Client } from "../../models/organisation";
import { inTransaction } from "../sql";
import { computeStatement } from "./statement-lines";

/** Freezes a draft inside the caller's transaction (which holds the statement's row lock). */
export async function issueLocked(
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
  const blocker = issueBlocker(String(statement.periodEnd), computation, now.toISOString().slice(0, 10));
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

/** Issues an internal client's chargeback statement; an external client's statement is invoiced instead. */
export async function issueStatement(
  id: number,
  options: { expectedTotal_minor?: number | undefined },
  actor: SignedInUser,
  ip: string | null = null,
  now = new Date(),
): Promise<void> {
  await inTransaction(getSequelize(), async (transaction) => {
    const statement = await Statement.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!statement) throw new HttpError(404, `No statement ${id}.`);
    const client = (await Client.findByPk(statement.clientId, { transaction }))!;
    if (client.kind === "external") throw new HttpError(409, `${client.name} is an external client: invoice the statement instead.`);
    await issueLocked(statement, client, options.expectedTotal_minor, actor, ip, transaction, now);
  });
}
