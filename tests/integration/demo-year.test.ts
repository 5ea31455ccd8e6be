// The demo data: the small demo the tests read gives every batch its bottles, and the development
// profile's demo year (src/db/history) loads a plausible, self-consistent year on top of it.
import { QueryTypes } from "sequelize";
import { describe, expect, it } from "vitest";
import { loadDemoHistory } from "../../src/db/history/load";
import { useTestDatabase } from "../support/database";

const db = useTestDatabase();
const rows = <T extends object>(sql: string) => db.sequelize.query<T>(sql, { type: QueryTypes.SELECT });

describe("the small demo", () => {
  it("gives every batch as many bottle rows as it has bottles", async () => {
    const missing = await rows<{ code: string }>(
      `SELECT b.code FROM batches b LEFT JOIN batch_bottles bb ON bb.batch_id = b.id GROUP BY b.id, b.code, b.bottles
        HAVING COUNT(bb.id) <> b.bottles`,
    );
    expect(missing).toEqual([]);
  });
});

describe("the demo year", () => {
  it("loads a year of activity of the size the issue asks for, consistent with itself", async () => {
    const [small] = await rows<{ lastBatch: number }>("SELECT MAX(id) AS lastBatch FROM batches");
    const counts = await loadDemoHistory(db.sequelize.getQueryInterface(), new Date("2026-12-04T05:00:00Z"));
    expect(counts.runs).toBeGreaterThan(3_500);

    const [totals] = await rows<Record<string, number>>(`SELECT
      (SELECT COUNT(*) FROM clients) AS clients, (SELECT COUNT(*) FROM projects) AS projects,
      (SELECT COUNT(*) FROM instruments) AS instruments, (SELECT COUNT(*) FROM recipes) AS recipes,
      (SELECT COUNT(*) FROM batches) AS batches, (SELECT COUNT(*) FROM runs) AS runs,
      (SELECT COUNT(DISTINCT DATE_FORMAT(started_at, '%Y-%m')) FROM runs) AS months`);
    expect(totals!.clients).toBeGreaterThanOrEqual(6);
    expect(totals!.clients).toBeLessThanOrEqual(8);
    expect(totals!.projects).toBeGreaterThanOrEqual(25);
    expect(totals!.projects).toBeLessThanOrEqual(40);
    expect(totals!.instruments).toBe(4);
    expect(totals!.recipes).toBeGreaterThanOrEqual(14);
    expect(totals!.batches).toBeGreaterThanOrEqual(300);
    expect(totals!.runs).toBeGreaterThanOrEqual(3_800);
    expect(totals!.months).toBeGreaterThanOrEqual(12);

    // Every batch has its bottles; no run draws more from a year's batch than it held (the small demo's
    // three-month runs are illustrative and overdraw theirs); no lot goes below zero.
    expect(
      await rows(
        `SELECT b.id FROM batches b LEFT JOIN batch_bottles bb ON bb.batch_id = b.id GROUP BY b.id, b.bottles HAVING COUNT(bb.id) <> b.bottles`,
      ),
    ).toEqual([]);
    expect(
      await rows(`SELECT b.code FROM batches b JOIN ledger_entries le ON le.batch_id = b.id WHERE b.id > ${small!.lastBatch} GROUP BY b.id, b.code, b.volume_ml
                   HAVING SUM(le.volume_ml) > b.volume_ml + 0.01`),
    ).toEqual([]);
    expect(await rows("SELECT id FROM stock_lots WHERE remaining < 0 OR remaining > quantity")).toEqual([]);
    const [lots] = await rows<{ used_up: number }>("SELECT COUNT(*) AS used_up FROM stock_lots WHERE remaining < quantity * 0.05");
    expect(lots!.used_up).toBeGreaterThan(10);

    // Waste: collected containers carry their pickup, and none was filled past its capacity.
    expect(
      await rows("SELECT code FROM waste_containers WHERE status = 'collected' AND (pickup_id IS NULL OR collected_at IS NULL)"),
    ).toEqual([]);
    expect(await rows("SELECT code FROM waste_containers WHERE estimated_volume_ml > capacity_ml")).toEqual([]);
    const [waste] = await rows<{ n: number }>("SELECT COUNT(*) AS n FROM pickups WHERE status = 'collected'");
    expect(waste!.n).toBeGreaterThan(5);

    // Billing: a price change half a year ago, statements every month, invoices in every state.
    const [change] = await rows<{ n: number }>("SELECT COUNT(DISTINCT effective_from) AS n FROM rates WHERE reagent_id = 'acetonitrile'");
    expect(change!.n).toBe(2);
    const [bills] = await rows<{ months: number }>("SELECT COUNT(DISTINCT period_start) AS months FROM statements WHERE status = 'issued'");
    expect(bills!.months).toBe(11);
    const states = await rows<{ state: string }>(
      `SELECT DISTINCT IF(status = 'open' AND due_on < '2026-12-04', 'overdue', status) AS state FROM invoices`,
    );
    expect(states.map((s) => s.state).sort()).toEqual(["open", "overdue", "paid", "void"]);
    // Historical invoices never reached the payments service.
    expect(await rows("SELECT id FROM invoices WHERE provider_invoice_id IS NOT NULL")).toEqual([]);
    // Each issued statement's total is the sum of its lines.
    const statements = await rows<{ lines: string | object[]; total_minor: number }>("SELECT `lines`, total_minor FROM statements");
    for (const s of statements) {
      const lines = (typeof s.lines === "string" ? JSON.parse(s.lines) : s.lines) as { amount_minor: number }[];
      expect(lines.reduce((sum, l) => sum + l.amount_minor, 0)).toBe(s.total_minor);
    }
  });
});
