/**
 * Invoicing an external client's statement (/api/statements/[id]/invoice) through the payments
 * provider's SDK; once committed, the client is sent the invoice e-mail (invoice-mail.ts).
 */
import type { Transaction } from "sequelize";
import Stripe from "stripe";
import { addDays, invoiceLines, invoiceTax, type InvoiceDetails } from "../../../billing/invoice";
import { statementReference } from "../../../billing/statement";
import type { InvoiceStatus, InvoiceView } from "../../../billing/types";
import { recordAudit } from "../../audit";
import { getSequelize } from "../../db";
import type { SignedInUser } from "../../guard";
import { HttpError } from "../../http";
import { Invoice, Statement } from "../../models/billing";
import { Client } from "../../models/organisation";
import { getPayments } from "../../payments";
import { inTransaction } from "../sql";
import { mailInvoice } from "./invoice-mail";
import { invoiceView } from "./invoices";
import { fromUnix, providerError, statementKey } from "./provider";
import { ensureInvoiceSeries, takeInvoiceNumber } from "./invoice-numbers";
import { facilityDetails } from "./settings";
import { issueLocked } from "./statement-issue";

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
  await ensureInvoiceSeries((await facilityDetails()).invoicePrefix, now.getUTCFullYear());
  const result = await inTransaction(getSequelize(), async (transaction) => {
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
    const facility = await facilityDetails(transaction);
    const issuedOn = now.toISOString().slice(0, 10);
    // A number already committed to this invoice (a send whose answer was lost) is kept: no gap, no second number.
    const number = invoice.number ?? (await takeInvoiceNumber(facility.invoicePrefix, now.getUTCFullYear(), transaction));
    const tax = invoiceTax(client.taxTreatment, client.taxRatePercent, client.taxLabel);
    const totals = invoiceLines(statement.lines, tax);
    const details: InvoiceDetails = {
      number,
      statementReference: reference,
      periodStart: String(statement.periodStart),
      periodEnd: String(statement.periodEnd),
      issuedOn,
      dueOn: addDays(issuedOn, facility.paymentTermsDays),
      facility,
      client: {
        name: client.name,
        address: client.billingAddress ?? null,
        taxId: client.taxId ?? null,
        purchaseOrder: client.purchaseOrder ?? null,
        email: client.billingEmail,
      },
      tax,
      ...totals,
      currency: statement.currency,
    };
    // Keys carry the number: a send that rolled back gave its number back, and the retry's number is new.
    const sendKey = `${key}-${number}`;
    try {
      const customerId = await ensureCustomer(payments, client, key, transaction);
      const taxRate =
        tax.percent === null
          ? null
          : await payments.taxRates.create(
              {
                display_name: tax.label ?? "VAT",
                percentage: Number(tax.percent),
                inclusive: false,
                ...(tax.legend ? { description: tax.legend } : {}),
              },
              { idempotencyKey: `${sendKey}-tax` },
            );
      const draft = await payments.invoices.create(
        {
          customer: customerId,
          collection_method: "send_invoice",
          days_until_due: facility.paymentTermsDays,
          auto_advance: false,
          currency,
          number,
          pending_invoice_items_behavior: "exclude",
          description: `${facility.legalName}: invoice ${number} for statement ${reference}, ${statement.periodStart} to ${statement.periodEnd}`,
          ...(tax.legend ? { footer: tax.legend } : {}),
          metadata: {
            decant_statement_id: String(statement.id),
            decant_statement_ref: reference,
            decant_client_id: String(client.id),
            decant_invoice_number: number,
          },
        },
        { idempotencyKey: `${sendKey}-invoice` },
      );
      const providerId = draft.id!;
      for (const [index, line] of totals.lines.entries()) {
        await payments.invoiceItems.create(
          {
            customer: customerId,
            invoice: providerId,
            amount: line.amount_minor,
            currency,
            description: `${line.projectCode} · ${line.description}`,
            ...(taxRate ? { tax_rates: [taxRate.id] } : {}),
            metadata: { decant_statement_id: String(statement.id), project_code: line.projectCode },
          },
          { idempotencyKey: `${sendKey}-item-${index}` },
        );
      }
      const finalized = await payments.invoices.finalizeInvoice(
        providerId,
        { auto_advance: false },
        { idempotencyKey: `${sendKey}-finalize` },
      );
      const providerTax = finalized.total - (finalized.subtotal ?? finalized.total);
      if (finalized.total !== totals.total_minor || providerTax !== totals.tax_minor) {
        throw new HttpError(
          502,
          `The payments service totals ${finalized.total} (tax ${providerTax}) but invoice ${number} totals ${totals.total_minor} (tax ${totals.tax_minor}); nothing was sent.`,
        );
      }
      const sent = await payments.invoices.sendInvoice(providerId, {}, { idempotencyKey: `${sendKey}-send` });
      await invoice.update(
        {
          providerInvoiceId: providerId,
          providerCustomerId: customerId,
          number,
          hostedUrl: sent.hosted_invoice_url ?? null,
          status: (sent.status as InvoiceStatus | null) ?? "open",
          amountMinor: totals.total_minor,
          subtotalMinor: totals.subtotal_minor,
          taxMinor: totals.tax_minor,
          issuedOn,
          details,
          dueOn: details.dueOn,
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
