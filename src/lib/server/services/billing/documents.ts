/**
 * A statement's files (/api/statements/[id]/statement.pdf, statement.csv) and the finance
 * office's chargeback journal (/api/statements/journal.csv). The layouts are pure
 * (src/lib/billing); this file loads what they show.
 */
import { Op } from "sequelize";
import { journalCsv, statementCsv, statementReference, type JournalStatement } from "../../../billing/statement";
import { renderStatementPdf } from "../../../billing/statement-pdf";
import type { SignedInUser } from "../../guard";
import { Statement } from "../../models/billing";
import { Client } from "../../models/organisation";
import { facilityName } from "./settings";
import { getStatement } from "./statements";

export async function statementPdf(id: number, viewer: SignedInUser): Promise<{ bytes: Uint8Array; fileName: string }> {
  const view = await getStatement(id, viewer); // scopes and refreshes a draft
  return { bytes: await renderStatementPdf({ ...view, facility: await facilityName() }), fileName: `${view.reference}.pdf` };
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
