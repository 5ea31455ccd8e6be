import { QueryTypes } from "sequelize";
import { beforeAll, describe, expect, it } from "vitest";
import { RUN_LOG_HEADER } from "../../../src/lib/imports/run-log";
import { HttpError } from "../../../src/lib/server/http";
import { checkRunLog, commitRunLog } from "../../../src/lib/server/services/imports";
import { usageByProject } from "../../../src/lib/server/services/usage";
import { actor, useServiceDatabase } from "../../support/service-database";

const db = useServiceDatabase();
const tech = actor(3, "technician");
const DAY = 86_400_000;
const q = <T extends object>(sql: string, replacements: unknown[] | Record<string, unknown> = []) =>
  db.sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements });
const count = async (table: string) => Number((await q<{ n: number }>(`SELECT COUNT(*) AS n FROM ${table}`))[0]!.n);
const isoDay = (d: Date) => d.toISOString().slice(0, 10);

describe("GET /api/usage's service: usage per project for a period", () => {
  const from = isoDay(new Date(Date.now() - 45 * DAY));
  const to = isoDay(new Date(Date.now() - 15 * DAY));

  it("sums the same volumes as a direct SQL sum over the period", async () => {
    const answer = await usageByProject({ from, to, groupBy: "project" }, { clientId: null });
    const direct = await q<{ code: string; reagent_id: string; v: string }>(
      `SELECT p.code, l.reagent_id, SUM(l.volume_ml) AS v FROM ledger_entries l JOIN projects p ON p.id = l.project_id
        WHERE l.occurred_at >= ? AND l.occurred_at < ? + INTERVAL 1 DAY GROUP BY p.code, l.reagent_id`,
      [from, to],
    );
    expect(direct.length).toBeGreaterThan(5);
    const expected: Record<string, Record<string, number>> = {};
    for (const d of direct) (expected[d.code] ??= {})[d.reagent_id] = Number(d.v);
    expect(Object.fromEntries(answer.rows.map((r) => [r.projectCode, r.volumes_mL]))).toEqual(expected);
  });

  it("costs each project at its client's price list, matching the rate arithmetic done in SQL", async () => {
    const answer = await usageByProject({ from, to, groupBy: "project" }, { clientId: null });
    // The demo rates all start a year ago, so one rate per reagent and list applies: cost = Σ mL × price/L ÷ 1000, rounded once.
    const direct = await q<{ code: string; cost: string; currency: string }>(
      `SELECT p.code, ROUND(SUM(l.volume_ml * r.amount_minor) / 1000) AS cost, MAX(r.currency) AS currency
         FROM ledger_entries l JOIN projects p ON p.id = l.project_id JOIN clients c ON c.id = p.client_id
         JOIN rates r ON r.kind = 'reagent' AND r.reagent_id = l.reagent_id AND r.price_list = c.kind
        WHERE l.occurred_at >= ? AND l.occurred_at < ? + INTERVAL 1 DAY GROUP BY p.code`,
      [from, to],
    );
    expect(Object.fromEntries(answer.rows.map((r) => [r.projectCode, r.cost]))).toEqual(
      Object.fromEntries(direct.map((d) => [d.code, { amount: Number(d.cost), currency: d.currency }])),
    );
    // External clients pay the external list: QFT projects cost more per mL than internal ones.
    for (const row of answer.rows) expect(row.uncosted).toEqual([]);
  });

  it("a price change after the period never changes the period's cost", async () => {
    const before = await usageByProject({ from, to, groupBy: "project" }, { clientId: null });
    await db.sequelize.query(
      "INSERT INTO rates (kind, reagent_id, price_list, unit, amount_minor, currency, effective_from, created_at) VALUES ('reagent', 'acetonitrile', 'internal', 'L', 99999, 'EUR', ?, NOW())",
      { replacements: [isoDay(new Date(Date.now() - 10 * DAY))] },
    );
    const after = await usageByProject({ from, to, groupBy: "project" }, { clientId: null });
    expect(after.rows.map((r) => r.cost)).toEqual(before.rows.map((r) => r.cost));
  });

  it("a client contact's scope holds their own organisation's projects only", async () => {
    const answer = await usageByProject(
      { from: isoDay(new Date(Date.now() - 95 * DAY)), to: isoDay(new Date()), groupBy: "project" },
      { clientId: 4 },
    );
    expect(answer.rows.length).toBeGreaterThan(0);
    const own = (await q<{ code: string }>("SELECT code FROM projects WHERE client_id = 4")).map((p) => p.code);
    for (const row of answer.rows) expect(own).toContain(row.projectCode);
  });

  it("counts runs and injections per project", async () => {
    const answer = await usageByProject({ from, to, groupBy: "project" }, { clientId: null });
    const direct = await q<{ code: string; n: number; inj: string }>(
      "SELECT p.code, COUNT(*) AS n, SUM(r.injections) AS inj FROM runs r JOIN projects p ON p.id = r.project_id WHERE r.started_at >= ? AND r.started_at < ? + INTERVAL 1 DAY GROUP BY p.code",
      [from, to],
    );
    for (const d of direct)
      expect(answer.rows.find((r) => r.projectCode === d.code)).toMatchObject({ runs: Number(d.n), injections: Number(d.inj) });
  });
});

const METHOD = "Scout gradient 5–95 % B, 12 min";
const row = (i: number, overrides: Partial<Record<string, string>> = {}) => {
  const values: Record<string, string> = {
    run_reference: `IMP-${String(i).padStart(5, "0")}`,
    instrument: "Wren",
    method: METHOD,
    project: "PMG-ROOT-26",
    started_at: new Date(Date.now() - 100 * DAY + i * 60_000).toISOString().slice(0, 16),
    injections: "1",
    blanks: "",
    purge_mL: "",
    batch_A: "B-BIG-A",
    batch_B: "B-BIG-B",
    batch_C: "",
    batch_D: "",
    operator: "",
    ...overrides,
  };
  return RUN_LOG_HEADER.map((c) => (values[c]!.includes(",") ? `"${values[c]}"` : values[c])).join(",");
};
const file = (rows: string[]) => `${RUN_LOG_HEADER.join(",")}\r\n${rows.join("\r\n")}\r\n`;
const remaining = async (code: string) =>
  Number((await q<{ r: string }>("SELECT remaining_ml AS r FROM batches WHERE code = ?", [code]))[0]!.r);

describe("importing run logs", () => {
  beforeAll(async () => {
    // Two large batches made 200 days ago that last a year, so historical runs may use them.
    for (const [id, code, version, solvent] of [
      [91, "B-BIG-A", 1, "water"],
      [92, "B-BIG-B", 2, "acetonitrile"],
    ] as const) {
      await db.sequelize.query(
        `INSERT INTO batches (id, code, recipe_version_id, spec_snapshot, volume_ml, remaining_ml, bottles, bottle_size_ml, prepared_by, prepared_at, expires_at, status, created_at, updated_at)
         VALUES (?, ?, ?, '{}', 1000000, 1000000, 250, 4000, 3, NOW() - INTERVAL 200 DAY, NOW() + INTERVAL 165 DAY, 'in_use', NOW(), NOW())`,
        { replacements: [id, code, version] },
      );
      await db.sequelize.query(
        "INSERT INTO batch_components (batch_id, reagent_id, role, unit, target_amount) VALUES (?, ?, 'solvent', 'mL', 999000), (?, 'formic-acid', 'additive', 'mL', 1000)",
        { replacements: [id, solvent, id] },
      );
    }
  });

  const good = Array.from({ length: 1000 }, (_, i) => row(i));

  it("names the 3 bad rows among 1,000 (row, column, what is wrong) and writes nothing", async () => {
    const bad = [...good];
    bad[99] = row(99, { injections: "many" }); // file row 101
    bad[499] = row(499, { batch_B: "B-NOPE" }); // file row 501: unknown batch (a database check)
    bad[899] = row(899, { project: "NO-SUCH-1" }); // file row 901
    const [runs, entries, left] = [await count("runs"), await count("ledger_entries"), await remaining("B-BIG-A")];
    const report = await checkRunLog(file(bad), "bad.csv", tech);
    expect(report.issues.map((i) => [i.row, i.column])).toEqual([[101, "injections"]]);
    // A row-level format problem stops the database checks; fix it and the others show.
    bad[99] = row(99);
    const second = await checkRunLog(file(bad), "bad.csv", tech);
    expect(second.issues).toEqual([
      { row: 501, column: "batch_B", message: 'no batch with code "B-NOPE"' },
      { row: 901, column: "project", message: 'no project with code "NO-SUCH-1"' },
    ]);
    bad[99] = row(99, { injections: "many" });
    const error = await commitRunLog(file(bad), "bad.csv", tech).then(
      () => null,
      (e: unknown) => e,
    );
    expect(error).toBeInstanceOf(HttpError);
    expect((error as HttpError).status).toBe(400);
    expect(await count("runs")).toBe(runs);
    expect(await count("ledger_entries")).toBe(entries);
    expect(await count("imports")).toBe(0);
    expect(await remaining("B-BIG-A")).toBe(left);
  });

  it("refuses rows whose batch had expired by the run's start, naming the row and channel", async () => {
    await db.sequelize.query(
      "UPDATE batches SET prepared_at = NOW() - INTERVAL 160 DAY, expires_at = NOW() - INTERVAL 150 DAY WHERE id = 6",
    ); // the demo's phosphate buffer
    const code = (await q<{ code: string }>("SELECT code FROM batches WHERE id = 6"))[0]!.code;
    const report = await checkRunLog(
      file([row(5000, { batch_A: code, started_at: new Date(Date.now() - 20 * DAY).toISOString().slice(0, 16) })]),
      "x.csv",
      tech,
    );
    expect(report.issues).toEqual([
      { row: 2, column: "batch_A", message: expect.stringMatching(new RegExp(`^batch ${code} expired .* UTC, before the run started$`)) },
    ]);
  });

  it("commits a good file in one go, and a second upload of it counts nothing twice", async () => {
    const [runs, entries, leftA, leftB] = [
      await count("runs"),
      await count("ledger_entries"),
      await remaining("B-BIG-A"),
      await remaining("B-BIG-B"),
    ];
    const report = await commitRunLog(file(good), "good.csv", tech);
    expect(report).toMatchObject({ rowCount: 1000, newRuns: 1000, alreadyRecorded: 0, entries: 4000, issues: [] });
    expect(await count("runs")).toBe(runs + 1000);
    expect(await count("ledger_entries")).toBe(entries + 4000);
    // One injection of the scout program: A 3.522 mL, B 2.478 mL (worked by hand, see runs-ledger.test.ts) × 1000 runs.
    expect(await remaining("B-BIG-A")).toBeCloseTo(leftA - 3522, 3);
    expect(await remaining("B-BIG-B")).toBeCloseTo(leftB - 2478, 3);
    const linked = await q<{ n: number }>("SELECT COUNT(*) AS n FROM runs WHERE import_id = ?", [report.importId]);
    expect(Number(linked[0]!.n)).toBe(1000);
    const audit = await q<{ action: string }>("SELECT action FROM audit_log WHERE entity = 'import' AND entity_id = ?", [
      String(report.importId),
    ]);
    expect(audit).toEqual([{ action: "import.commit" }]);

    const again = await commitRunLog(file(good), "good-again.csv", tech);
    expect(again).toMatchObject({ newRuns: 0, alreadyRecorded: 1000, entries: 0, previousImport: { id: report.importId } });
    expect(await count("runs")).toBe(runs + 1000);
    expect(await count("ledger_entries")).toBe(entries + 4000);
    expect(await remaining("B-BIG-A")).toBeCloseTo(leftA - 3522, 3);

    // A later file that repeats some rows and adds new ones: only the new ones are written.
    const mixed = await commitRunLog(file([...good.slice(0, 10), row(2000), row(2001)]), "mixed.csv", tech);
    expect(mixed).toMatchObject({ newRuns: 2, alreadyRecorded: 10 });
    expect(await count("runs")).toBe(runs + 1002);
  });

  it("answers a file that is not CSV with one clear message", async () => {
    const report = await checkRunLog("%PDF-1.4\n%\u0000\u0000 binary", "scan.pdf", tech);
    expect(report.issues).toEqual([{ row: 1, column: null, message: expect.stringMatching(/binary data, not text/) }]);
  });
});
