import { QueryTypes } from "sequelize";
import { describe, expect, it } from "vitest";
import { localDay, nextDay, startOfLocalDay } from "../../../src/lib/format";
import { HttpError } from "../../../src/lib/server/http";
import { LedgerEntry } from "../../../src/lib/server/models/ledger";
import { reverseEntries } from "../../../src/lib/server/services/ledger";
import { logDraw } from "../../../src/lib/server/services/draws";
import { logRun } from "../../../src/lib/server/services/runs";
import { usageByProject } from "../../../src/lib/server/services/usage";
import { runSchema, drawSchema } from "../../../src/lib/schemas/runs";
import { actor, useServiceDatabase } from "../../support/service-database";

const db = useServiceDatabase();
const tech = actor(3, "technician");
const HOUR = 3_600_000;

const q = <T extends object>(sql: string, replacements: unknown[] = []) =>
  db.sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements });
const remaining = async (batchId: number) =>
  Number((await q<{ r: string }>("SELECT remaining_ml AS r FROM batches WHERE id = ?", [batchId]))[0]!.r);
const count = async (table: string) => Number((await q<{ n: number }>(`SELECT COUNT(*) AS n FROM ${table}`))[0]!.n);

/** A run of the demo "Scout gradient" (method 1) on Wren (instrument 1) for PMG-ROOT-26 with batches 4 (A) and 5 (B). */
const scoutRun = (overrides: Record<string, unknown> = {}) =>
  runSchema.parse({
    instrumentId: 1,
    methodId: 1,
    projectId: 1,
    injections: 10,
    blanks: 2,
    purge_mL: 5,
    channelBatches: { A: 4, B: 5 },
    startedAt: new Date(Date.now() - HOUR).toISOString(),
    idempotencyKey: `k-${Math.random().toString(36).slice(2)}`,
    ...overrides,
  });

async function expectRefused(promise: Promise<unknown>, status: number, pattern: RegExp) {
  const error = await promise.then(
    () => null,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(HttpError);
  expect((error as HttpError).status).toBe(status);
  expect((error as HttpError).message).toMatch(pattern);
}

describe("logging a run", () => {
  it("writes the volumes worked by hand, split by each batch's composition, and lowers the batches' remaining volume", async () => {
    const before = { a: await remaining(4), b: await remaining(5) };
    const { run, replayed } = await logRun(scoutRun(), tech);
    expect(replayed).toBe(false);
    // Worked by hand for the scout program (0.4 mL/min; 5→95 % B over 0–10 min, 95 % to 11, back to 5 % at 11.1, hold to 15):
    //   B per injection = 10×0.4×0.50 + 1×0.4×0.95 + 0.1×0.4×0.50 + 3.9×0.4×0.05 = 2.0 + 0.38 + 0.02 + 0.078 = 2.478 mL
    //   A per injection = 15×0.4 − 2.478 = 3.522 mL
    //   12 programs (10 injections + 2 blanks) + 5 mL purge per channel: A = 47.264 mL, B = 34.736 mL
    expect(run.channelVolumes_mL).toEqual({ A: 47.264, B: 34.736 });
    const entries = await q<{
      reagent_id: string;
      channel: string;
      volume_ml: string;
      kind: string;
      batch_id: number;
      waste_container_id: number;
      waste_stream_id: string;
      project_id: number;
      author_id: number;
      source_kind: string;
    }>("SELECT * FROM ledger_entries WHERE source_id = ? ORDER BY channel, reagent_id", [`run:${run.id}`]);
    // Batch 4 = 4000 mL water + 4 mL formic acid; batch 5 = 4000 mL acetonitrile + 4 mL formic acid (demo seeder).
    // A: formic acid 47.264 × 4/4004 = 0.0472 mL, water the rest 47.2168 mL. B: formic acid 34.736 × 4/4004 = 0.0347, acetonitrile 34.7013 (by hand).
    expect(entries.map((e) => [e.channel, e.reagent_id, Number(e.volume_ml), e.batch_id, e.waste_stream_id])).toEqual([
      ["A", "formic-acid", 0.0472, 4, "acidic-corrosive"],
      ["A", "water", 47.2168, 4, "aqueous"],
      ["B", "acetonitrile", 34.7013, 5, "non-halogenated-organic"],
      ["B", "formic-acid", 0.0347, 5, "acidic-corrosive"],
    ]);
    for (const e of entries)
      expect(e).toMatchObject({ kind: "run", waste_container_id: 1, project_id: 1, author_id: 3, source_kind: "run" });
    expect(await remaining(4)).toBeCloseTo(before.a - 47.264, 4);
    expect(await remaining(5)).toBeCloseTo(before.b - 34.736, 4);
  });

  it("records a double submit once, even when both arrive at the same moment", async () => {
    const input = scoutRun({ injections: 3, blanks: 0, purge_mL: 0 });
    const [runsBefore, entriesBefore, left] = [await count("runs"), await count("ledger_entries"), await remaining(4)];
    const [first, second] = await Promise.all([logRun(input, tech), logRun(input, tech)]);
    const third = await logRun(input, tech);
    expect(first.run.id).toBe(second.run.id);
    expect(third.run.id).toBe(first.run.id);
    expect([first.replayed, second.replayed].sort()).toEqual([false, true]);
    expect(third.replayed).toBe(true);
    expect(await count("runs")).toBe(runsBefore + 1);
    expect(await count("ledger_entries")).toBe(entriesBefore + 4);
    expect(await remaining(4)).toBeCloseTo(left - 3 * 3.522, 4);
  });

  it("refuses an expired batch and writes nothing", async () => {
    await db.sequelize.query(
      `INSERT INTO batches (id, code, recipe_version_id, spec_snapshot, volume_ml, remaining_ml, bottles, bottle_size_ml, prepared_by, prepared_at, expires_at, status, created_at, updated_at)
       VALUES (90, 'B-EXPIRED', 1, '{}', 1000, 1000, 1, 1000, 3, NOW() - INTERVAL 40 DAY, NOW() - INTERVAL 10 DAY, 'in_use', NOW(), NOW())`,
    );
    await db.sequelize.query(
      "INSERT INTO batch_components (batch_id, reagent_id, role, unit, target_amount) VALUES (90, 'water', 'solvent', 'mL', 1000)",
    );
    const [runs, entries] = [await count("runs"), await count("ledger_entries")];
    await expectRefused(logRun(scoutRun({ channelBatches: { A: 90, B: 5 } }), tech), 400, /channelBatches\.A: batch B-EXPIRED expired/);
    expect(await count("runs")).toBe(runs);
    expect(await count("ledger_entries")).toBe(entries);
    expect(await remaining(90)).toBe(1000);
  });

  it("refuses a used-up batch, a run that would take a batch below zero, and a channel without a batch", async () => {
    await expectRefused(logRun(scoutRun({ channelBatches: { A: 1, B: 5 } }), tech), 400, /channelBatches\.A: batch B26-0901 is used up/);
    await expectRefused(
      logRun(scoutRun({ injections: 1000 }), tech),
      400,
      /batch B26-1103 has [\d.]+ mL left; this run needs 3534\.044 mL/,
    ); // (1000 + 2) × 3.522 + 5 = 3534.044, by hand
    await expectRefused(
      logRun(scoutRun({ channelBatches: { A: 4 } }), tech),
      400,
      /channelBatches\.B: .* pumps channel B: choose the batch on it/,
    );
    await expectRefused(logRun(scoutRun({ channelBatches: { A: 4, B: 5, C: 6 } }), tech), 400, /channelBatches\.C: Wren has no channel C/);
  });

  it("a draw takes its volume from the batch with a reason, once per key", async () => {
    const left = await remaining(4);
    const input = drawSchema.parse({
      batchId: 4,
      projectId: 2,
      volume_mL: 12.5,
      purpose: "wash",
      note: "column flush",
      idempotencyKey: "draw-key-0001",
    });
    const first = await logDraw(input, tech);
    const again = await logDraw(input, tech);
    expect(first).toMatchObject({ batchCode: "B26-1103", volume_mL: 12.5, replayed: false });
    expect(again.replayed).toBe(true);
    expect(await remaining(4)).toBeCloseTo(left - 12.5, 4);
    const rows = await q<{ reason: string; volume_ml: string; kind: string }>(
      "SELECT reason, volume_ml, kind FROM ledger_entries WHERE source_id = 'draw:draw-key-0001'",
    );
    expect(rows.map((r) => r.reason)).toEqual(["wash: column flush", "wash: column flush"]);
    expect(rows.reduce((a, r) => a + Number(r.volume_ml), 0)).toBeCloseTo(12.5, 4);
  });
});

describe("corrections", () => {
  it("reverse an entry with a reason: the sum nets to zero, the original stays, the batch gets its volume back", async () => {
    const { run } = await logRun(scoutRun({ startedAt: new Date(Date.now() - 2 * HOUR).toISOString() }), tech);
    const originals = await q<{ id: number; volume_ml: string }>(
      "SELECT id, volume_ml FROM ledger_entries WHERE source_id = ? ORDER BY id",
      [`run:${run.id}`],
    );
    const runDay = run.startedAt.slice(0, 10);
    const usageBefore = await usageByProject({ from: runDay, to: runDay, groupBy: "project" }, { clientId: null });
    const left = await remaining(4);

    const { corrections } = await reverseEntries({ entryIds: [], runId: run.id, reason: "logged on the wrong project" }, tech);
    expect(corrections).toHaveLength(originals.length);
    for (const c of corrections) {
      expect(c.kind).toBe("correction");
      expect(c.reason).toBe("logged on the wrong project");
      expect(c.author).toBe("Rowan Ellery");
    }
    const net = await q<{ v: string }>(
      "SELECT SUM(volume_ml) AS v FROM ledger_entries WHERE id IN (:ids) OR reverses_id IN (:ids)".replace(
        /:ids/g,
        originals.map((o) => o.id).join(","),
      ),
    );
    expect(Number(net[0]!.v)).toBe(0);
    // The originals are untouched.
    const still = await q<{ id: number; volume_ml: string }>(
      `SELECT id, volume_ml FROM ledger_entries WHERE id IN (${originals.map((o) => o.id).join(",")}) ORDER BY id`,
    );
    expect(still).toEqual(originals);
    expect(await remaining(4)).toBeCloseTo(left + run.channelVolumes_mL.A!, 4);

    // Usage over the period equals the usage without the reversed entries.
    const usageAfter = await usageByProject({ from: runDay, to: runDay, groupBy: "project" }, { clientId: null });
    const before = usageBefore.rows.find((r) => r.projectCode === "PMG-ROOT-26")!;
    const after = usageAfter.rows.find((r) => r.projectCode === "PMG-ROOT-26")!;
    expect(after.volumes_mL.water).toBeCloseTo(before.volumes_mL.water! - 47.2168, 4);
    expect(after.volumes_mL.acetonitrile).toBeCloseTo(before.volumes_mL.acetonitrile! - 34.7013, 4);

    const audit = await q<{ action: string; entity_id: string; after: string }>(
      "SELECT action, entity_id, `after` FROM audit_log WHERE action = 'ledger.correct' ORDER BY id DESC LIMIT 1",
    );
    expect(audit[0]).toMatchObject({ action: "ledger.correct", entity_id: String(run.id) });

    await expectRefused(reverseEntries({ entryIds: [originals[0]!.id], reason: "again" }, tech), 409, /already reversed/);
    await expectRefused(reverseEntries({ entryIds: [corrections[0]!.id], reason: "undo the undo" }, tech), 400, /is itself a correction/);
    await expectRefused(reverseEntries({ entryIds: [987654321], reason: "no such entry" }, tech), 404, /no ledger entry 987654321/);
  });

  it("the ledger cannot be updated or deleted through the app's models either", async () => {
    const entry = await LedgerEntry.findOne({ order: [["id", "DESC"]] });
    expect(entry).not.toBeNull();
    await expect(LedgerEntry.update({ volumeMl: 0 }, { where: { id: entry!.id } })).rejects.toThrow(/append-only/);
    await expect(entry!.destroy()).rejects.toThrow(/append-only/);
  });
});

describe("the waste container an instrument drains to", () => {
  it("refuses a run whose mix does not belong in it, with the reason, and writes nothing", async () => {
    // Point Wren at the aqueous carboy (WC-0104): an acetonitrile mix does not belong there.
    await db.sequelize.query("UPDATE instruments SET waste_container_id = 4 WHERE id = 1");
    const [runs, entries, left] = [await count("runs"), await count("ledger_entries"), await remaining(5)];
    try {
      await expectRefused(logRun(scoutRun(), tech), 400, /instrumentId: .*WC-0104.*aqueous/i);
    } finally {
      await db.sequelize.query("UPDATE instruments SET waste_container_id = 1 WHERE id = 1");
    }
    expect([await count("runs"), await count("ledger_entries"), await remaining(5)]).toEqual([runs, entries, left]);
  });
});

describe("corrections and invoiced periods", () => {
  it("dates a correction of an entry in a locked period at the start of the next open period", async () => {
    const { run } = await logRun(
      scoutRun({ injections: 1, blanks: 0, purge_mL: 0, startedAt: new Date(Date.now() - 5 * 24 * HOUR).toISOString() }),
      tech,
    );
    const day = localDay(new Date(Date.now() - 5 * 24 * HOUR), "Europe/Berlin");
    // PMG-ROOT-26 belongs to client 1; lock the run's day as if that period were already charged back.
    await db.sequelize.query("INSERT INTO period_locks (client_id, period_start, period_end, created_at) VALUES (1, ?, ?, NOW())", {
      replacements: [day, day],
    });
    const { corrections } = await reverseEntries({ entryIds: [], runId: run.id, reason: "logged on the wrong project" }, tech);
    const dates = await q<{ occurred_at: Date }>("SELECT occurred_at FROM ledger_entries WHERE reverses_id IS NOT NULL AND source_id = ?", [
      `run:${run.id}`,
    ]);
    expect(corrections.length).toBe(dates.length);
    // The next local day's midnight in the demo's Europe/Berlin.
    const next = startOfLocalDay(nextDay(day), "Europe/Berlin");
    for (const d of dates) expect(new Date(d.occurred_at).toISOString()).toBe(next.toISOString());
  });
});

describe("the time an entry is stored at", () => {
  it("is the UTC time of the run, whatever time zone the server process runs in", async () => {
    // The ledger's bulk writes hand dates to the driver, which on its own would write the process's local time.
    const zone = process.env.TZ;
    process.env.TZ = "America/New_York";
    try {
      const startedAt = "2026-11-30T23:30:00.000Z"; // 18:30 on the 30th in New York, the 1st of December nowhere
      const { run } = await logRun(scoutRun({ injections: 1, blanks: 0, purge_mL: 0, startedAt }), tech);
      const rows = await q<{ at: string }>(
        "SELECT DATE_FORMAT(occurred_at, '%Y-%m-%d %H:%i:%s') AS at FROM ledger_entries WHERE source_id = ?",
        [`run:${run.id}`],
      );
      expect(rows.length).toBeGreaterThan(0);
      for (const r of rows) expect(r.at).toBe("2026-11-30 23:30:00");
    } finally {
      if (zone === undefined) delete process.env.TZ;
      else process.env.TZ = zone;
    }
  });
});
