// GET /api/waste/summary against the running test app: its totals equal a direct SQL sum over the
// seeded ledger for the same period, and bad input answers 400 naming the field.
import { QueryTypes, type Sequelize } from "sequelize";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createSequelize } from "../../src/lib/server/db";
import { testEnv } from "../support/database";
import { client, type Client } from "../support/http";

const DAY = 86_400_000;
const iso = (d: Date) => d.toISOString().slice(0, 10);
// A period well in the past, so runs other tests log today do not move the figures under us.
const from = iso(new Date(Date.now() - 80 * DAY));
const to = iso(new Date(Date.now() - 21 * DAY));

let sql: Sequelize;
let safety: Client;

beforeAll(async () => {
  sql = createSequelize(testEnv());
  safety = await client("safety@demo.test");
});
afterAll(async () => {
  await sql.close();
});

describe("GET /api/waste/summary", () => {
  it("equals the ledger's run, draw and discard volumes for the period, stream by stream", async () => {
    const response = await safety.fetch(`/api/waste/summary?from=${from}&to=${to}`);
    expect(response.status).toBe(200);
    const body = (await response.json()) as { streams: { stream: string; volume_mL: number }[] };
    expect(Object.keys(body)).toEqual(["streams"]);

    const rows = await sql.query<{ stream: string; v: string }>(
      `SELECT waste_stream_id AS stream, SUM(volume_ml) AS v FROM ledger_entries
        WHERE kind IN ('run', 'draw', 'discard') AND occurred_at >= :start AND occurred_at < :end
        GROUP BY waste_stream_id`,
      {
        type: QueryTypes.SELECT,
        replacements: { start: new Date(`${from}T00:00:00Z`), end: new Date(new Date(`${to}T00:00:00Z`).getTime() + DAY) },
      },
    );
    expect(rows.length).toBeGreaterThan(0);
    const expected = Object.fromEntries(rows.map((r) => [r.stream, Number(r.v)]));
    const answered = Object.fromEntries(body.streams.filter((s) => s.volume_mL !== 0).map((s) => [s.stream, s.volume_mL]));
    expect(Object.keys(answered).sort()).toEqual(Object.keys(expected).sort());
    for (const [stream, v] of Object.entries(expected)) expect(answered[stream]).toBeCloseTo(v, 3);
    // Every stream of the site is listed, with 0 where nothing went to it.
    const streams = await sql.query<{ id: string }>("SELECT id FROM waste_streams", { type: QueryTypes.SELECT });
    for (const s of streams) expect(body.streams.map((x) => x.stream)).toContain(s.id);
  });

  it("counts a single day from its first to its last millisecond", async () => {
    const day = iso(new Date(Date.now() - 30 * DAY));
    const [row] = await sql.query<{ v: string | null }>(
      "SELECT SUM(volume_ml) AS v FROM ledger_entries WHERE kind IN ('run','draw','discard') AND DATE(occurred_at) = :day",
      { type: QueryTypes.SELECT, replacements: { day } },
    );
    const body = (await (await safety.fetch(`/api/waste/summary?from=${day}&to=${day}`)).json()) as { streams: { volume_mL: number }[] };
    expect(body.streams.reduce((a, s) => a + s.volume_mL, 0)).toBeCloseTo(Number(row?.v ?? 0), 3);
  });

  it.each([
    ["", /from/],
    [`from=${from}`, /to/],
    [`from=2026-13-01&to=2026-12-31`, /from: /],
    [`from=2026-02-30&to=2026-03-31`, /from: is not a calendar day/],
    [`from=${to}&to=${from}`, /to: must be on or after from/],
    [`from=${from}&to=${to}&groupBy=room`, /groupBy|Unrecognized/],
  ])("answers 400 naming the field for ?%s", async (query, message) => {
    const response = await safety.fetch(`/api/waste/summary?${query}`);
    expect(response.status).toBe(400);
    expect(((await response.json()) as { error: string }).error).toMatch(message);
  });

  it("is for signed-in roles with read:waste only", async () => {
    expect((await (await client()).fetch(`/api/waste/summary?from=${from}&to=${to}`)).status).toBe(401);
    const contact = await client("client@demo.test");
    const response = await contact.fetch(`/api/waste/summary?from=${from}&to=${to}`);
    expect(response.status).toBe(403);
    expect(((await response.json()) as { missingPermission: string }).missingPermission).toBe("read:waste");
  });

  it("keeps the settings from technicians and clients", async () => {
    for (const email of ["tech@demo.test", "client@demo.test"]) {
      const c = await client(email);
      expect((await c.fetch("/api/waste/settings")).status).toBe(403);
      const put = await c.fetch("/api/waste/settings", {
        method: "PUT",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ fullThreshold_percent: 50 }),
      });
      expect(put.status).toBe(403);
    }
  });

  it("tells the run form that a TFA mix does not belong in a non-halogenated container, and why", async () => {
    const tech = await client("tech@demo.test");
    const [wren] = await sql.query<{ id: number }>("SELECT id FROM waste_containers WHERE code = 'WC-0101'", { type: QueryTypes.SELECT });
    const response = await tech.fetch("/api/waste/route", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({
        containerId: wren!.id,
        parts: [
          { reagentId: "water", volume_mL: 499.5 },
          { reagentId: "acetonitrile", volume_mL: 499.5 },
          { reagentId: "trifluoroacetic-acid", volume_mL: 1 },
        ],
      }),
    });
    expect(response.status).toBe(200);
    const body = (await response.json()) as {
      assignment: { streamId: string };
      acceptance: { ok: boolean; code?: string; reason?: string };
    };
    expect(body.assignment.streamId).toBe("halogenated-organic");
    expect(body.acceptance).toMatchObject({ ok: false, code: "wrong-stream" });
    expect(body.acceptance.reason).toMatch(/does not take halogenated organic waste/);
    const bad = await tech.fetch("/api/waste/route", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ containerId: wren!.id, parts: [{ reagentId: "unobtainium", volume_mL: 5 }] }),
    });
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as { error: string }).error).toMatch(/^parts: unobtainium/);
  });

  it("serves the period report as CSV and PDF", async () => {
    const csv = await safety.fetch(`/api/waste/report?from=${from}&to=${to}&format=csv`);
    expect(csv.status).toBe(200);
    expect(csv.headers.get("content-type")).toMatch(/text\/csv/);
    expect((await csv.text()).split("\r\n")[0]).toBe("section,key,stream,volume_mL");
    const pdf = await safety.fetch(`/api/waste/report?from=${from}&to=${to}&format=pdf`);
    expect(pdf.status).toBe(200);
    expect(
      Buffer.from(await pdf.arrayBuffer())
        .subarray(0, 5)
        .toString(),
    ).toBe("%PDF-");
  });
});
