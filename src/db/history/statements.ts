/**
 * The demo year's bills: a statement per client and month with use, costed from the ledger as the
 * billing screens cost it (the pure `buildStatement`, at the rates in force each day, the mid-year
 * change included), issued after the month ends. External clients' statements are invoiced: the
 * older ones paid, one void, one open past its due day, last month's open. These invoices are
 * historical demo records: they were never sent to the payments service (no provider id), so the
 * invoices screen marks them and offers no provider actions on them.
 */
import type { Sequelize } from "sequelize";
import { monthBounds, buildStatement, nextDay, type CountRow, type UsageRow } from "../../lib/billing/statement";
import type { Rate } from "../../lib/billing/rates";
import { select } from "../../lib/server/query";
import { DAY_MS } from "../demo-time";
import type { Row } from "./simulate";

interface UsageSum {
  client_id: number;
  project_code: string;
  project_name: string;
  reagent_id: string;
  reagent_name: string;
  grade: string | null;
  day: string;
  volume_ml: number | null;
  mass_g: number | null;
}

const USAGE = `
  SELECT p.client_id, p.code AS project_code, p.name AS project_name, le.reagent_id, r.name AS reagent_name,
         (SELECT sl.grade FROM batch_components bc JOIN stock_lots sl ON sl.id = bc.stock_lot_id
           WHERE bc.batch_id = le.batch_id AND bc.reagent_id = le.reagent_id ORDER BY bc.id LIMIT 1) AS grade,
         DATE_FORMAT(le.occurred_at, '%Y-%m-%d') AS day, SUM(le.volume_ml) AS volume_ml, SUM(le.mass_g) AS mass_g
    FROM ledger_entries le JOIN projects p ON p.id = le.project_id JOIN reagents r ON r.id = le.reagent_id
   WHERE le.occurred_at >= :start AND le.occurred_at < :end AND le.kind <> 'preparation'
   GROUP BY p.client_id, p.code, p.name, le.reagent_id, r.name, grade, day`;

const INJECTIONS = `
  SELECT p.client_id, p.code AS project_code, p.name AS project_name, DATE_FORMAT(ru.started_at, '%Y-%m-%d') AS day,
         SUM(ru.injections) AS count
    FROM runs ru JOIN projects p ON p.id = ru.project_id
   WHERE ru.started_at >= :start AND ru.started_at < :end
   GROUP BY p.client_id, p.code, p.name, day`;

export interface BillingAnchors {
  now: Date;
  manager: number;
  nextStatementId: number;
  nextInvoiceId: number;
  clients: { id: number; name: string; kind: "internal" | "external"; currency: string }[];
  rates: Rate[];
  /** (client, period start) pairs that already have a statement: left alone. */
  existing: Set<string>;
}

const monthsBack = (now: Date, n: number) => {
  const d = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - n, 1));
  return d.toISOString().slice(0, 7);
};

export async function billYear(sequelize: Sequelize, anchors: BillingAnchors) {
  const { now } = anchors;
  const months = Array.from({ length: 11 }, (_, i) => monthsBack(now, 11 - i));
  const first = monthBounds(months[0]!).periodStart;
  const last = monthBounds(months.at(-1)!).periodEnd;
  const replacements = { start: first, end: nextDay(last) };
  const usage = await select<UsageSum>(USAGE, { replacements, sequelize });
  const injections = await select<CountRow & { client_id: number; project_code: string; project_name: string }>(INJECTIONS, {
    replacements,
    sequelize,
  });
  const statements: Row[] = [];
  const invoices: Row[] = [];
  const locks: Row[] = [];
  let statementId = anchors.nextStatementId;
  let invoiceId = anchors.nextInvoiceId;
  let invoiceNumber = 0;
  for (const [monthIndex, month] of months.entries()) {
    const { periodStart, periodEnd } = monthBounds(month);
    const monthsAgo = months.length - monthIndex;
    for (const client of anchors.clients) {
      if (anchors.existing.has(`${client.id}:${periodStart}`)) continue;
      const inMonth = (r: { client_id: number; day: string }) => r.client_id === client.id && r.day >= periodStart && r.day <= periodEnd;
      const rows: UsageRow[] = usage.filter(inMonth).map((u) => ({
        projectCode: u.project_code,
        projectName: u.project_name,
        reagentId: u.reagent_id,
        reagentName: u.reagent_name,
        grade: u.grade,
        day: u.day,
        volume_mL: u.volume_ml ?? 0,
        mass_g: u.mass_g,
      }));
      const counts = injections
        .filter(inMonth)
        .map((r) => ({ projectCode: r.project_code, projectName: r.project_name, day: r.day, count: r.count }));
      const computation = buildStatement({
        usage: rows,
        injections: counts,
        rates: anchors.rates.filter((r) => r.currency === client.currency),
        priceList: client.kind,
        currency: client.currency,
      });
      if (computation.total_minor <= 0) continue;
      // Issued on the second working morning after the month ends, or just now for last month.
      const issuedAt = new Date(Math.min(new Date(`${nextDay(periodEnd)}T09:30:00Z`).getTime() + DAY_MS, now.getTime() - 3_600_000));
      const id = statementId++;
      const voided = client.kind === "external" && monthsAgo === 6 && client.name.startsWith("Tarnbrook");
      statements.push({
        id,
        client_id: client.id,
        period_start: periodStart,
        period_end: periodEnd,
        status: voided ? "void" : "issued",
        lines: JSON.stringify(computation.lines),
        total_minor: computation.total_minor,
        currency: client.currency,
        issued_at: issuedAt,
        issued_by: anchors.manager,
        voided_at: voided ? new Date(issuedAt.getTime() + 9 * DAY_MS) : null,
        created_by: anchors.manager,
        created_at: issuedAt,
        updated_at: issuedAt,
      });
      locks.push({ client_id: client.id, period_start: periodStart, period_end: periodEnd, statement_id: id, created_at: issuedAt });
      if (client.kind !== "external") continue;
      const due = new Date(issuedAt.getTime() + 30 * DAY_MS);
      // Paid 12–27 days after sending, except last month's (open), one overdue, and the void one.
      const overdue = monthsAgo === 2 && client.name.startsWith("Corriebrae");
      const open = monthsAgo === 1 || overdue;
      const paidAt = open || voided ? null : new Date(issuedAt.getTime() + (12 + ((id * 7) % 16)) * DAY_MS);
      invoices.push({
        id: invoiceId++,
        statement_id: id,
        client_id: client.id,
        number: `HIST-${periodStart.slice(0, 4)}-${String(++invoiceNumber).padStart(4, "0")}`,
        status: voided ? "void" : open ? "open" : "paid",
        amount_minor: computation.total_minor,
        currency: client.currency,
        due_on: due.toISOString().slice(0, 10),
        sent_at: issuedAt,
        finalized_at: issuedAt,
        paid_at: paidAt,
        voided_at: voided ? new Date(issuedAt.getTime() + 9 * DAY_MS) : null,
        created_by: anchors.manager,
        created_at: issuedAt,
        updated_at: paidAt ?? issuedAt,
      });
    }
  }
  return { statements, invoices, locks };
}
