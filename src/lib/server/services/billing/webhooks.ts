/**
 * The payments provider's webhooks (/api/webhooks/payments): each signed event once, moving the
 * mirrored invoice only along the transitions below.
 */
import { UniqueConstraintError } from "sequelize";
import type Stripe from "stripe";
import type { InvoiceStatus } from "../../../billing/types";
import { recordAudit } from "../../audit";
import { getSequelize } from "../../db";
import { HttpError } from "../../http";
import { Invoice, ProcessedEvent, Statement } from "../../models/billing";
import { getPayments, webhookSecret } from "../../payments";
import { inTransaction } from "../sql";
import { fromUnix } from "./provider";

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
  return inTransaction(getSequelize(), async (transaction) => {
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
