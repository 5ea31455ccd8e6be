/** The invoice e-mail to an external client, the statement PDF attached. */
import { renderStatementPdf } from "../../../billing/statement-pdf";
import { formatMoney } from "../../../billing/money";
import { statementReference } from "../../../billing/statement";
import type { InvoiceView } from "../../../billing/types";
import { getEnv } from "../../env";
import { createTransport, escapeHtml } from "../../mail";
import type { Statement } from "../../models/billing";
import type { Client } from "../../models/organisation";
import { facilityName } from "./settings";
import { statementFields } from "./statements";

/** The invoice e-mail to the client's billing address, the statement PDF attached. */
export async function mailInvoice(invoice: InvoiceView, client: Client, statement: Statement) {
  if (!client.billingEmail || !invoice.hostedUrl) return;
  const env = getEnv();
  const facility = await facilityName();
  const amount = formatMoney({ amount: invoice.amount_minor, currency: invoice.currency });
  const pdf = await renderStatementPdf({ ...statementFields(statement, client), facility, invoice });
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
