/**
 * The invoices screen (/invoices, /api/invoices): sent invoices as Decant mirrors them, and the
 * manager's follow-up on one (/api/invoices/[id]/void, /uncollectible) through the provider's SDK.
 */
import type Stripe from "stripe";
import { statementReference } from "../../../billing/statement";
import type { InvoiceView } from "../../../billing/types";
import { can } from "../../../permissions";
import { recordAudit } from "../../audit";
import { getSequelize } from "../../db";
import type { SignedInUser } from "../../guard";
import { HttpError } from "../../http";
import { Invoice, Statement } from "../../models/billing";
import { Client } from "../../models/organisation";
import { getPayments } from "../../payments";
import { inTransaction } from "../sql";
import { fromUnix, providerError, statementKey } from "./provider";

export function invoiceView(invoice: Invoice, client: Client, statement: Statement): InvoiceView {
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
    statementReference: statementReference(statement.id),
    subtotal_minor: invoice.subtotalMinor ?? null,
    tax_minor: invoice.taxMinor ?? null,
    issuedOn: invoice.issuedOn ? String(invoice.issuedOn) : null,
  };
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

/** One invoice; a client contact gets their organisation's only (404 otherwise, as for a missing one). */
export async function getInvoice(id: number, viewer: SignedInUser): Promise<InvoiceView> {
  const invoice = await Invoice.findByPk(id);
  if (!invoice || !(can(viewer.role, "read:invoice") || invoice.clientId === viewer.clientId))
    throw new HttpError(404, `No invoice ${id}.`);
  const [client, statement] = await Promise.all([Client.findByPk(invoice.clientId), Statement.findByPk(invoice.statementId)]);
  return invoiceView(invoice, client!, statement!);
}

async function invoiceAction(
  id: number,
  action: "void" | "uncollectible",
  actor: SignedInUser,
  ip: string | null,
  payments = getPayments(),
): Promise<InvoiceView> {
  return inTransaction(getSequelize(), async (transaction) => {
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

/** Cancels a sent invoice at the provider; the client can no longer pay it. */
export const voidInvoice = (id: number, actor: SignedInUser, ip: string | null = null, payments?: Stripe) =>
  invoiceAction(id, "void", actor, ip, payments);
/** Writes an open invoice off; it stays payable. */
export const markInvoiceUncollectible = (id: number, actor: SignedInUser, ip: string | null = null, payments?: Stripe) =>
  invoiceAction(id, "uncollectible", actor, ip, payments);
