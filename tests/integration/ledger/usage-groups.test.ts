// Usage grouped by client, instrument, reagent and month (issue 6 point 6), with mobile-phase
// volumes: every total is checked against a direct SQL sum over ledger_entries for the period.
import { QueryTypes } from "sequelize";
import { describe, expect, it } from "vitest";
import { usageByProject } from "../../../src/lib/server/services/usage";
import type { GroupedBy } from "../../../src/lib/ledger/types";
import { mobilePhasesByProject, usageGrouped } from "../../../src/lib/server/services/usage-groups";
import { useServiceDatabase } from "../../support/service-database";

const db = useServiceDatabase();
const DAY = 86_400_000;
const isoDay = (d: Date) => d.toISOString().slice(0, 10);
const q = <T extends object>(sql: string, replacements: unknown[] = []) =>
  db.sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements });
const from = isoDay(new Date(Date.now() - 95 * DAY));
const to = isoDay(new Date());
const PERIOD = "l.occurred_at >= ? AND l.occurred_at < ? + INTERVAL 1 DAY";

// The direct sums, written independently of the service: group → reagent → mL.
const DIRECT: Record<GroupedBy, string> = {
  client: `SELECT CAST(p.client_id AS CHAR) AS g, l.reagent_id AS x, SUM(l.volume_ml) AS v FROM ledger_entries l JOIN projects p ON p.id = l.project_id WHERE ${PERIOD} AND (? IS NULL OR p.client_id = ?) GROUP BY g, x`,
  instrument: `SELECT COALESCE(CAST(r.instrument_id AS CHAR), 'none') AS g, l.reagent_id AS x, SUM(l.volume_ml) AS v FROM ledger_entries l JOIN projects p ON p.id = l.project_id
                 LEFT JOIN runs r ON l.source_id = CONCAT('run:', r.id) WHERE ${PERIOD} AND (? IS NULL OR p.client_id = ?) GROUP BY g, x`,
  reagent: `SELECT l.reagent_id AS g, l.reagent_id AS x, SUM(l.volume_ml) AS v FROM ledger_entries l JOIN projects p ON p.id = l.project_id WHERE ${PERIOD} AND (? IS NULL OR p.client_id = ?) GROUP BY g, x`,
  month: `SELECT DATE_FORMAT(l.occurred_at, '%Y-%m') AS g, l.reagent_id AS x, SUM(l.volume_ml) AS v FROM ledger_entries l JOIN projects p ON p.id = l.project_id WHERE ${PERIOD} AND (? IS NULL OR p.client_id = ?) GROUP BY g, x`,
};
const PHASES = `SELECT %KEY% AS g, COALESCE(rc.code, 'none') AS x, SUM(l.volume_ml) AS v FROM ledger_entries l JOIN projects p ON p.id = l.project_id
  LEFT JOIN batches b ON b.id = l.batch_id LEFT JOIN recipe_versions rv ON rv.id = b.recipe_version_id LEFT JOIN recipes rc ON rc.id = rv.recipe_id
  LEFT JOIN runs r ON l.source_id = CONCAT('run:', r.id) WHERE ${PERIOD} AND (? IS NULL OR p.client_id = ?) GROUP BY g, x`;
const PHASE_KEY: Record<GroupedBy | "project", string> = {
  client: "CAST(p.client_id AS CHAR)",
  instrument: "COALESCE(CAST(r.instrument_id AS CHAR), 'none')",
  reagent: "l.reagent_id",
  month: "DATE_FORMAT(l.occurred_at, '%Y-%m')",
  project: "p.code",
};

async function direct(sql: string, clientId: number | null) {
  const rows = await q<{ g: string; x: string; v: string }>(sql, [from, to, clientId, clientId]);
  const out: Record<string, Record<string, number>> = {};
  for (const r of rows) (out[r.g] ??= {})[r.x] = Number(r.v);
  return out;
}

describe.each([
  ["every client", null],
  ["one client's scope (Quillfeather, id 4)", 4],
] as const)("usage grouped, %s", (_name, clientId) => {
  it.each(["client", "instrument", "reagent", "month"] as const)(
    "groupBy=%s: reagent and mobile-phase totals equal a direct SQL sum",
    async (groupBy) => {
      const answer = await usageGrouped({ from, to, groupBy }, { clientId });
      const expected = await direct(DIRECT[groupBy], clientId);
      expect(Object.keys(expected).length).toBeGreaterThan(0);
      expect(Object.fromEntries(answer.rows.map((r) => [r.key, r.volumes_mL]))).toEqual(expected);
      const phases = await direct(PHASES.replace("%KEY%", PHASE_KEY[groupBy]), clientId);
      expect(Object.fromEntries(answer.rows.map((r) => [r.key, r.mobilePhases_mL]))).toEqual(phases);
    },
  );
});

describe("usage grouped: scope, costs and counts", () => {
  it("a client contact's scope has their own organisation only, in every grouping", async () => {
    const foreign = (await q<{ id: number }>("SELECT id FROM projects WHERE client_id <> 4")).map((p) => p.id);
    expect(foreign.length).toBeGreaterThan(0);
    const byClient = await usageGrouped({ from, to, groupBy: "client" }, { clientId: 4 });
    expect(byClient.rows.map((r) => r.key)).toEqual(["4"]);
    // Nothing of another organisation's projects counts in any grouping's total.
    const [own] = await q<{ v: string }>(
      `SELECT SUM(l.volume_ml) AS v FROM ledger_entries l JOIN projects p ON p.id = l.project_id WHERE ${PERIOD} AND p.client_id = 4`,
      [from, to],
    );
    for (const groupBy of ["client", "instrument", "reagent", "month"] as const) {
      const answer = await usageGrouped({ from, to, groupBy }, { clientId: 4 });
      const sum = answer.rows.reduce((a, r) => a + Object.values(r.volumes_mL).reduce((x, y) => x + y, 0), 0);
      expect(sum).toBeCloseTo(Number(own!.v), 3);
    }
  });

  it("the client grouping costs each client what its projects cost in the project grouping", async () => {
    const projects = await usageByProject({ from, to, groupBy: "project" }, { clientId: null });
    const clients = await usageGrouped({ from, to, groupBy: "client" }, { clientId: null });
    const clientOf = new Map(
      (await q<{ code: string; client_id: number }>("SELECT code, client_id FROM projects")).map((p) => [p.code, String(p.client_id)]),
    );
    const expected = new Map<string, number>();
    for (const p of projects.rows)
      expected.set(clientOf.get(p.projectCode)!, (expected.get(clientOf.get(p.projectCode)!) ?? 0) + p.cost.amount);
    for (const c of clients.rows) expect(c.cost?.amount).toBe(expected.get(c.key));
    expect(clients.rows.some((c) => (c.cost?.amount ?? 0) > 0)).toBe(true);
  });

  it("counts runs and injections per instrument and per month", async () => {
    const byInstrument = await usageGrouped({ from, to, groupBy: "instrument" }, { clientId: null });
    const runs = await q<{ g: string; n: number; inj: string }>(
      "SELECT CAST(instrument_id AS CHAR) AS g, COUNT(*) AS n, SUM(injections) AS inj FROM runs WHERE started_at >= ? AND started_at < ? + INTERVAL 1 DAY GROUP BY g",
      [from, to],
    );
    expect(runs.length).toBeGreaterThan(0);
    for (const r of runs)
      expect(byInstrument.rows.find((x) => x.key === r.g)).toMatchObject({ runs: Number(r.n), injections: Number(r.inj) });
    const byReagent = await usageGrouped({ from, to, groupBy: "reagent" }, { clientId: null });
    for (const r of byReagent.rows) expect(r.runs).toBeNull();
  });

  it("adds each project's mobile-phase volumes, equal to a direct SQL sum", async () => {
    const { byProject, mobilePhases } = await mobilePhasesByProject({ from, to, groupBy: "project" }, { clientId: null });
    expect(Object.fromEntries(byProject)).toEqual(await direct(PHASES.replace("%KEY%", PHASE_KEY.project), null));
    const recipes = await q<{ code: string; name: string }>("SELECT code, name FROM recipes");
    for (const [code, name] of Object.entries(mobilePhases)) if (code !== "none") expect(recipes).toContainEqual({ code, name });
  });
});
