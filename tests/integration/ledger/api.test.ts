// The ledger's HTTP face against the app that `npm test` started (its database seeded with the demo data).
import { QueryTypes } from "sequelize";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createSequelize } from "../../../src/lib/server/db";
import { testEnv } from "../../support/database";
import { client } from "../../support/http";

const DAY = 86_400_000;
const isoDay = (d: Date) => d.toISOString().slice(0, 10);
let sequelize: ReturnType<typeof createSequelize>;
beforeAll(() => {
  sequelize = createSequelize(testEnv());
});
afterAll(async () => {
  await sequelize.close();
});

interface UsageRow {
  projectCode: string;
  volumes_mL: Record<string, number>;
  cost: { amount: number; currency: string };
}

describe("GET /api/usage", () => {
  // A closed period in the seeded past; nothing in the test suite writes there.
  const from = isoDay(new Date(Date.now() - 80 * DAY));
  const to = isoDay(new Date(Date.now() - 50 * DAY));

  it("answers the contract, with totals equal to a direct SQL sum over the period", async () => {
    const manager = await client("manager@demo.test");
    const response = await manager.fetch(`/api/usage?from=${from}&to=${to}&groupBy=project`);
    expect(response.status).toBe(200);
    const body = (await response.json()) as { rows: UsageRow[] };
    const direct = await sequelize.query<{ code: string; reagent_id: string; v: string }>(
      `SELECT p.code, l.reagent_id, SUM(l.volume_ml) AS v FROM ledger_entries l JOIN projects p ON p.id = l.project_id
        WHERE l.occurred_at >= ? AND l.occurred_at < ? + INTERVAL 1 DAY GROUP BY p.code, l.reagent_id`,
      { type: QueryTypes.SELECT, replacements: [from, to] },
    );
    expect(direct.length).toBeGreaterThan(0);
    const expected: Record<string, Record<string, number>> = {};
    for (const d of direct) (expected[d.code] ??= {})[d.reagent_id] = Number(d.v);
    expect(Object.fromEntries(body.rows.map((r) => [r.projectCode, r.volumes_mL]))).toEqual(expected);
    for (const row of body.rows) {
      expect(Number.isInteger(row.cost.amount)).toBe(true);
      expect(row.cost.currency).toMatch(/^[A-Z]{3}$/);
    }
  });

  it("shows a client contact their own organisation's projects only", async () => {
    const contact = await client("client@demo.test");
    const response = await contact.fetch(
      `/api/usage?from=${isoDay(new Date(Date.now() - 95 * DAY))}&to=${isoDay(new Date())}&groupBy=project`,
    );
    expect(response.status).toBe(200);
    const { rows } = (await response.json()) as { rows: UsageRow[] };
    const own = (
      await sequelize.query<{ code: string }>(
        "SELECT p.code FROM projects p JOIN users u ON u.client_id = p.client_id WHERE u.email = 'client@demo.test'",
        { type: QueryTypes.SELECT },
      )
    ).map((p) => p.code);
    expect(rows.length).toBeGreaterThan(0);
    for (const r of rows) expect(own).toContain(r.projectCode);
    const all = (await (
      await (await client("manager@demo.test")).fetch(`/api/usage?from=${isoDay(new Date(Date.now() - 95 * DAY))}&to=${isoDay(new Date())}`)
    ).json()) as { rows: UsageRow[] };
    expect(all.rows.length).toBeGreaterThan(rows.length);
  });

  it.each(["client", "instrument", "reagent", "month"])(
    "groupBy=%s: a client contact's totals are their own organisation's, the manager's everyone's",
    async (groupBy) => {
      const period = `from=${isoDay(new Date(Date.now() - 95 * DAY))}&to=${isoDay(new Date())}`;
      const sumOf = (rows: { volumes_mL: Record<string, number> }[]) =>
        rows.reduce((a, r) => a + Object.values(r.volumes_mL).reduce((x, y) => x + y, 0), 0);
      const [own, all] = await sequelize
        .query<{ own: string; all: string }>(
          `SELECT SUM(IF(p.client_id = u.client_id, l.volume_ml, 0)) AS own, SUM(l.volume_ml) AS \`all\` FROM ledger_entries l JOIN projects p ON p.id = l.project_id
         JOIN users u ON u.email = 'client@demo.test' WHERE l.occurred_at >= ? AND l.occurred_at < ? + INTERVAL 1 DAY`,
          { type: QueryTypes.SELECT, replacements: [isoDay(new Date(Date.now() - 95 * DAY)), isoDay(new Date())] },
        )
        .then((r) => [Number(r[0]!.own), Number(r[0]!.all)]);
      const contact = await (await client("client@demo.test")).fetch(`/api/usage?${period}&groupBy=${groupBy}`);
      expect(contact.status).toBe(200);
      const mine = (await contact.json()) as { groupBy: string; rows: { key: string; volumes_mL: Record<string, number> }[] };
      expect(mine.groupBy).toBe(groupBy);
      expect(sumOf(mine.rows)).toBeCloseTo(own!, 2);
      const manager = (await (await (await client("manager@demo.test")).fetch(`/api/usage?${period}&groupBy=${groupBy}`)).json()) as {
        rows: { volumes_mL: Record<string, number> }[];
      };
      expect(sumOf(manager.rows)).toBeCloseTo(all!, 2);
      expect(all!).toBeGreaterThan(own!);
    },
  );

  it.each([
    ["from=2026-13-01&to=2026-12-31", /from: /],
    ["from=2026-12-01", /to: /],
    ["from=2026-12-10&to=2026-12-01", /to: must not be before from/],
    ["from=2026-12-01&to=2026-12-31&groupBy=colour", /groupBy: must be one of project, client, instrument, reagent, month/],
  ])("answers 400 naming the field for %s", async (query, message) => {
    const manager = await client("manager@demo.test");
    const response = await manager.fetch(`/api/usage?${query}`);
    expect(response.status).toBe(400);
    expect(((await response.json()) as { error: string }).error).toMatch(message);
  });

  it("needs a sign-in, and a role that may see usage", async () => {
    expect((await (await client()).fetch("/api/usage?from=2026-12-01&to=2026-12-31")).status).toBe(401);
    const tech = await client("tech@demo.test");
    const response = await tech.fetch("/api/usage?from=2026-12-01&to=2026-12-31");
    expect(response.status).toBe(403);
    expect(await response.json()).toMatchObject({ missingPermission: "read:usage" });
  });
});

describe("the run, draw, correction and import routes", () => {
  it("answer bad input with 400 naming the field, never 500", async () => {
    const tech = await client("tech@demo.test");
    const post = (path: string, body: unknown) =>
      tech.fetch(path, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
    const run = await post("/api/runs", {
      instrumentId: 1,
      methodId: 1,
      projectId: 1,
      injections: "many",
      channelBatches: { A: 4, B: 5 },
      startedAt: "yesterday",
      idempotencyKey: "api-test-000001",
    });
    expect(run.status).toBe(400);
    const runBody = (await run.json()) as { error: string; fields: Record<string, string> };
    expect(Object.keys(runBody.fields)).toEqual(expect.arrayContaining(["injections", "startedAt"]));
    const draw = await post("/api/draws", { batchId: 4, volume_mL: -3, purpose: "spill", idempotencyKey: "api-test-000002" });
    expect(draw.status).toBe(400);
    expect(((await draw.json()) as { error: string }).error).toMatch(/volume_mL/);
    const correction = await post("/api/ledger/corrections", { entryIds: [], reason: "" });
    expect(correction.status).toBe(400);
    expect(((await correction.json()) as { error: string }).error).toMatch(/reason/);
    const missing = await post("/api/ledger/corrections", { entryIds: [999999999], reason: "no such entry" });
    expect(missing.status).toBe(404);
    const notCsv = await tech.fetch("/api/imports?mode=check&fileName=a.json", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: "{}",
    });
    expect(notCsv.status).toBe(415);
    const badMode = await tech.fetch("/api/imports?mode=maybe", { method: "POST", headers: { "content-type": "text/csv" }, body: "a,b" });
    expect(badMode.status).toBe(400);
    expect(((await badMode.json()) as { error: string }).error).toMatch(/mode/);
  });

  it.each(["0001-01-01T00:00Z", "+010000-01-01T00:00Z", "1969-12-31T23:59Z", "2200-01-01T00:00Z"])(
    "refuses a draw dated %s, outside the years a ledger entry can hold, with 400 naming occurredAt",
    async (occurredAt) => {
      const tech = await client("tech@demo.test");
      const draw = await tech.fetch("/api/draws", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({
          batchId: 4,
          volume_mL: 1,
          purpose: "spill",
          occurredAt,
          idempotencyKey: `api-test-date-${occurredAt.replace(/[^0-9]/g, "")}`,
        }),
      });
      expect(draw.status).toBe(400);
      expect(((await draw.json()) as { error: string }).error).toMatch(/occurredAt: must be in (1970 or later|2199 or earlier)/);
    },
  );

  it("a check of a file that is not a run log answers one clear message and writes nothing", async () => {
    const tech = await client("tech@demo.test");
    const [before] = await sequelize.query<{ n: number }>("SELECT COUNT(*) AS n FROM imports", { type: QueryTypes.SELECT });
    const response = await tech.fetch("/api/imports?mode=commit&fileName=notes.txt", {
      method: "POST",
      headers: { "content-type": "text/plain" },
      body: "meeting notes\nnothing tabular here\n",
    });
    expect(response.status).toBe(400);
    const body = (await response.json()) as { issues: { row: number; column: string | null; message: string }[] };
    expect(body.issues).toEqual([{ row: 1, column: null, message: expect.stringMatching(/does not look like a CSV file/) }]);
    const [after] = await sequelize.query<{ n: number }>("SELECT COUNT(*) AS n FROM imports", { type: QueryTypes.SELECT });
    expect(Number(after!.n)).toBe(Number(before!.n));
  });

  it("the template downloads as CSV", async () => {
    const tech = await client("tech@demo.test");
    const response = await tech.fetch("/api/imports/template.csv");
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toMatch(/text\/csv/);
    expect((await response.text()).split("\r\n")[0]).toBe(
      "run_reference,instrument,method,project,started_at,injections,blanks,purge_mL,batch_A,batch_B,batch_C,batch_D,operator",
    );
  });
});
