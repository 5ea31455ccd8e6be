// Concurrency against the running test app: the same submission 20 times at once records one batch,
// one run and one invoice (idempotency keys and unique constraints in MariaDB, not timing), and 50
// simultaneous draws from one batch leave exactly initial − accepted in it, never below zero, with
// every refusal a clean 4xx.
import { QueryTypes } from "sequelize";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { monthBounds } from "../../src/lib/billing/statement";
import { createSequelize } from "../../src/lib/server/db";
import { getEnv } from "../../src/lib/server/env";
import { testEnv } from "../support/database";
import { client, type Client } from "../support/http";

const unique = `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}`;
let tech: Client;
let manager: Client;
let sequelize: ReturnType<typeof createSequelize>;

const postJson = (c: Client, path: string, body: unknown) =>
  c.fetch(path, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
const at = <T>(n: number, make: (i: number) => Promise<T>) => Promise.all(Array.from({ length: n }, (_, i) => make(i)));
const count = (statuses: number[]) => statuses.reduce<Record<number, number>>((m, s) => ({ ...m, [s]: (m[s] ?? 0) + 1 }), {});
async function one<T extends object>(query: string, replacements: unknown[]): Promise<T> {
  const [row] = await sequelize.query<T>(query, { type: QueryTypes.SELECT, replacements });
  return row as T;
}

beforeAll(async () => {
  sequelize = createSequelize(testEnv());
  // Signed in once per role: the throttle would lock the address after five failed sign-ins.
  tech = await client("tech@demo.test");
  manager = await client("manager@demo.test");
});
afterAll(async () => {
  await sequelize.close();
});

async function usableLot(reagent: string): Promise<number> {
  const body = (await (await tech.fetch(`/api/stock-lots?reagent=${reagent}`)).json()) as {
    items: { id: number; usable: boolean; remaining: number }[];
  };
  const lot = body.items.filter((l) => l.usable).sort((a, b) => b.remaining - a.remaining)[0];
  if (!lot) throw new Error(`no usable ${reagent} lot in the demo data`);
  return lot.id;
}

interface BatchAnswer {
  batch: { id: number; code: string; remaining_mL: number };
  created: boolean;
}

let waterBatch: BatchAnswer["batch"];
let organicBatch: BatchAnswer["batch"];

describe("20 identical submissions at once", () => {
  it("record one batch (one idempotency key): 1 × 201, 19 × 200 with the same batch", async () => {
    const payload = {
      idempotencyKey: `conc-batch-${unique}`,
      recipeVersionId: 1,
      volume_mL: 3000,
      bottles: 3,
      bottleSize_mL: 1000,
      temperature_C: 22,
      components: [
        { reagent: "water", stockLotId: await usableLot("water"), actualAmount: 3000 },
        { reagent: "formic-acid", stockLotId: await usableLot("formic-acid"), actualAmount: 3.0 },
      ],
    };
    const answers = await at(20, () => postJson(tech, "/api/batches", payload));
    const bodies = (await Promise.all(answers.map((a) => a.json()))) as BatchAnswer[];
    expect(count(answers.map((a) => a.status))).toEqual({ 201: 1, 200: 19 });
    const ids = new Set(bodies.map((b) => b.batch.id));
    expect(ids.size).toBe(1);
    waterBatch = bodies[0]!.batch;
    const rows = await one<{ n: number }>("SELECT COUNT(*) AS n FROM batches WHERE idempotency_key = ?", [payload.idempotencyKey]);
    expect(Number(rows.n)).toBe(1);
    const bottles = await one<{ n: number }>("SELECT COUNT(*) AS n FROM batch_bottles WHERE batch_id = ?", [waterBatch.id]);
    expect(Number(bottles.n)).toBe(3);
    const ledger = await one<{ n: number }>("SELECT COUNT(*) AS n FROM ledger_entries WHERE source_id = ?", [`batch:${waterBatch.id}`]);
    expect(Number(ledger.n)).toBe(2);
    console.log(
      `batch: 20 submissions → ${rows.n} batch recorded (${waterBatch.code}), ${bottles.n} bottles, ${ledger.n} preparation entries`,
    );
  });

  it("record one run (one idempotency key): 1 × 201, 19 replayed, the batches drawn once", async () => {
    const made = await postJson(tech, "/api/batches", {
      idempotencyKey: `conc-batch-b-${unique}`,
      recipeVersionId: 2,
      volume_mL: 2000,
      bottles: 2,
      bottleSize_mL: 1000,
      temperature_C: 22,
      components: [
        { reagent: "acetonitrile", stockLotId: await usableLot("acetonitrile"), actualAmount: 2000 },
        { reagent: "formic-acid", stockLotId: await usableLot("formic-acid"), actualAmount: 2.0 },
      ],
    });
    expect(made.status).toBe(201);
    organicBatch = ((await made.json()) as BatchAnswer).batch;
    const remaining = async (id: number) =>
      Number((await one<{ r: string }>("SELECT remaining_ml AS r FROM batches WHERE id = ?", [id])).r);
    const before = { A: await remaining(waterBatch.id), B: await remaining(organicBatch.id) };
    const payload = {
      instrumentId: 1,
      methodId: 1,
      projectId: 1,
      injections: 2,
      channelBatches: { A: waterBatch.id, B: organicBatch.id },
      startedAt: new Date(Date.now() + 60_000).toISOString(),
      idempotencyKey: `conc-run-${unique}`,
    };
    const answers = await at(20, () => postJson(tech, "/api/runs", payload));
    const bodies = (await Promise.all(answers.map((a) => a.json()))) as {
      run: { id: number; channelVolumes_mL: Record<string, number> };
      replayed: boolean;
    }[];
    expect(count(answers.map((a) => a.status))).toEqual({ 201: 1, 200: 19 });
    expect(new Set(bodies.map((b) => b.run.id)).size).toBe(1);
    expect(bodies.filter((b) => !b.replayed)).toHaveLength(1);
    const run = bodies[0]!.run;
    const rows = await one<{ n: number }>("SELECT COUNT(*) AS n FROM runs WHERE idempotency_key = ?", [payload.idempotencyKey]);
    expect(Number(rows.n)).toBe(1);
    const ledger = await one<{ v: string }>("SELECT SUM(volume_ml) AS v FROM ledger_entries WHERE source_id = ?", [`run:${run.id}`]);
    const pumped = run.channelVolumes_mL.A! + run.channelVolumes_mL.B!;
    expect(Number(ledger.v)).toBeCloseTo(pumped, 3);
    expect(before.A - (await remaining(waterBatch.id))).toBeCloseTo(run.channelVolumes_mL.A!, 3);
    expect(before.B - (await remaining(organicBatch.id))).toBeCloseTo(run.channelVolumes_mL.B!, 3);
    console.log(`run: 20 submissions → ${rows.n} run recorded, ${pumped.toFixed(2)} mL drawn once`);
  });

  it("send one invoice for a statement: 1 × 201, 19 × 200 with the same invoice, one at the payments service", async () => {
    // Three months back: a period of the seeded history that no other test invoices.
    const now = new Date();
    const month = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - 3, 1)).toISOString().slice(0, 7);
    const period = monthBounds(month);
    let chosen: { id: number; clientId: number; total: number } | null = null;
    for (const clientId of [5, 4]) {
      const opened = await postJson(manager, "/api/statements", { clientId, ...period });
      if (opened.status !== 200 && opened.status !== 201) continue;
      const { id } = (await opened.json()) as { id: number };
      const draft = (await (await manager.fetch(`/api/statements/${id}`)).json()) as {
        status: string;
        total_minor: number;
        blocker: string | null;
      };
      if (draft.status === "draft" && draft.blocker === null) {
        chosen = { id, clientId, total: draft.total_minor };
        break;
      }
    }
    expect(chosen, `an external client's draft for ${month} that can be invoiced`).not.toBeNull();
    const { id, total } = chosen!;
    const answers = await at(20, () => postJson(manager, `/api/statements/${id}/invoice`, { expectedTotal_minor: total }));
    const bodies = (await Promise.all(answers.map((a) => a.json()))) as {
      invoice: { id: number; providerInvoiceId: string; status: string; amount_minor: number };
    }[];
    expect(count(answers.map((a) => a.status))).toEqual({ 201: 1, 200: 19 });
    expect(new Set(bodies.map((b) => b.invoice.id)).size).toBe(1);
    const invoice = bodies[0]!.invoice;
    expect(invoice).toMatchObject({ status: "open", amount_minor: total });
    const rows = await one<{ n: number }>("SELECT COUNT(*) AS n FROM invoices WHERE statement_id = ?", [id]);
    expect(Number(rows.n)).toBe(1);
    const locks = await one<{ n: number }>("SELECT COUNT(*) AS n FROM period_locks WHERE statement_id = ?", [id]);
    expect(Number(locks.n)).toBe(1);
    // The payments fake serves every test database, whose statement ids overlap: this database's
    // invoices are the ones of the customer it stored.
    const stored = await one<{ customer: string }>("SELECT provider_customer_id AS customer FROM invoices WHERE statement_id = ?", [id]);
    const fake = `http://127.0.0.1:${getEnv().PAYMENTS_PORT}`;
    const listed = (await (
      await fetch(`${fake}/_fake/invoices?metadata[decant_statement_id]=${id}&metadata[decant_client_id]=${chosen!.clientId}`)
    ).json()) as { data: { id: string; customer: string }[] };
    const atProvider = listed.data.filter((i) => i.customer === stored.customer);
    expect(atProvider.map((i) => i.id)).toEqual([invoice.providerInvoiceId]);
    console.log(
      `invoice: 20 submissions → ${rows.n} invoice in Decant, ${atProvider.length} at the payments service, ${locks.n} period lock`,
    );
  });
});

describe("50 simultaneous draws from one batch", () => {
  it("leave exactly initial − accepted, never below zero; every refusal a 400 naming volume_mL", async () => {
    const initial = Number((await one<{ r: string }>("SELECT remaining_ml AS r FROM batches WHERE id = ?", [waterBatch.id])).r);
    // 50 × 80 mL asks for more than the batch holds, so some must be refused.
    const volume = 80;
    expect(50 * volume).toBeGreaterThan(initial);
    const answers = await at(50, (i) =>
      postJson(tech, "/api/draws", {
        batchId: waterBatch.id,
        volume_mL: volume,
        purpose: "transfer",
        note: `concurrency ${i}`,
        idempotencyKey: `conc-draw-${unique}-${i}`,
      }),
    );
    const bodies = (await Promise.all(answers.map((a) => a.json()))) as {
      remaining_mL?: number;
      error?: string;
      fields?: Record<string, string>;
    }[];
    const statuses = answers.map((a) => a.status);
    expect(
      statuses.filter((s) => s >= 500),
      JSON.stringify(bodies.filter((_, i) => statuses[i]! >= 500)),
    ).toEqual([]);
    const accepted = statuses.filter((s) => s === 201).length;
    const refused = answers.map((a, i) => ({ status: a.status, body: bodies[i]! })).filter((a) => a.status !== 201);
    for (const r of refused) {
      expect(r.status).toBe(400);
      expect(r.body.error).toMatch(/^volume_mL: batch \S+ has [\d.]+ mL left/);
      expect(r.body.fields).toHaveProperty("volume_mL");
    }
    expect(accepted).toBe(Math.floor(initial / volume + 1e-9));
    const final = Number((await one<{ r: string }>("SELECT remaining_ml AS r FROM batches WHERE id = ?", [waterBatch.id])).r);
    expect(final).toBeCloseTo(initial - accepted * volume, 4);
    expect(final).toBeGreaterThanOrEqual(0);
    const drawn = await one<{ v: string; n: number }>(
      "SELECT COALESCE(SUM(volume_ml), 0) AS v, COUNT(DISTINCT source_id) AS n FROM ledger_entries WHERE kind = 'draw' AND source_id LIKE ?",
      [`draw:conc-draw-${unique}-%`],
    );
    expect(Number(drawn.n)).toBe(accepted);
    expect(Number(drawn.v)).toBeCloseTo(accepted * volume, 3);
    console.log(
      `draws: 50 at once from ${initial} mL → ${accepted} accepted (${accepted * volume} mL), ${refused.length} refused with 400, ${final} mL left = ${initial} − ${accepted * volume}; 5xx: 0`,
    );
  });
});
