/**
 * A statement's files (/api/statements/[id]/statement.pdf, statement.csv) and the finance
 * office's chargeback journal (/api/statements/journal.csv). The layouts are pure
 * (src/lib/billing); this file loads what they show.
 */
import { Op } from "sequelize";
import { journalCsv, statementCsv, statementReference, type JournalStatement } from "../../../billing/statement";
import type { InvoiceDetails } from "../../../billing/invoice";
import { renderInvoicePdf } from "../../../billing/invoice-pdf";
import { renderStatementPdf } from "../../../billing/statement-pdf";
import { can } from "../../../permissions";
import type { SignedInUser } from "../../guard";
import { HttpError } from "../../http";
import { Invoice, Statement } from "../../models/billing";
import { jsonColumn } from "../../query";
import { Client } from "../../models/organisation";
import { facilityName } from "./settings";
import { getStatement } from "./statements";

export async function statementPdf(id: number, viewer: SignedInUser): Promise<{ bytes: Uint8Array; fileName: string }> {
  const view = await getStatement(id, viewer); // scopes and refreshes a draft
  return { bytes: await renderStatementPdf({ ...view, facility: await facilityName() }), fileName: `${view.reference}.pdf` };
}

/** An invoice's own PDF, from the details frozen when it was sent; client contacts get their organisation's only. */
export async function invoicePdf(id: number, viewer: SignedInUser): Promise<{ bytes: Uint8Array; fileName: string }> {
  const invoice = await Invoice.findByPk(id);
  const visible = invoice && (can(viewer.role, "read:invoice") || invoice.clientId === viewer.clientId);
  if (!invoice || !visible || !invoice.details) throw new HttpError(404, `No invoice ${id}.`);
  const details = jsonColumn<InvoiceDetails>(invoice.details);
  return { bytes: await renderInvoicePdf({ details, status: invoice.status }), fileName: `${details.number}.pdf` };
}

export async function statementCsvFile(id: number, viewer: SignedInUser): Promise<{ text: string; fileName: string }> {
  const view = await getStatement(id, viewer);
  return { text: statementCsv(view, view.lines), fileName: `${view.reference}.csv` };
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
