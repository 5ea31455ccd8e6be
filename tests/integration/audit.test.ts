// Every change to batches, the ledger, rates, invoices, waste containers and users, made through the
// API of a private app instance, leaves an audit line with its actor, time, before and after; and
// the audit log itself cannot be changed: no route writes it but through recordAudit, and the
// database refuses UPDATE and DELETE.
import { readdirSync, readFileSync, statSync } from "node:fs";
import { join } from "node:path";
import { QueryTypes } from "sequelize";
import { beforeAll, describe, expect, it } from "vitest";
import { useAppInstance } from "../support/app-instance";
import type { Client } from "../support/http";

const app = useAppInstance();
const unique = Math.random().toString(36).slice(2, 8);
let tech: Client;
let manager: Client;
let admin: Client;
let ids: Record<"tech" | "manager" | "admin", number>;

interface AuditRow {
  id: number;
  actor_id: number | null;
  action: string;
  entity: string;
  entity_id: string | null;
  before: unknown;
  after: unknown;
  created_at: Date;
}

const parse = (v: unknown) => (typeof v === "string" ? (JSON.parse(v) as unknown) : v);

async function auditSince(mark: number, action: string, entity: string, entityId?: string | number): Promise<AuditRow> {
  const rows = await app.sequelize.query<AuditRow>(
    `SELECT id, actor_id, action, entity, entity_id, \`before\`, \`after\`, created_at FROM audit_log WHERE id > :mark AND action = :action AND entity = :entity ${entityId === undefined ? "" : "AND entity_id = :entityId"} ORDER BY id DESC LIMIT 1`,
    { type: QueryTypes.SELECT, replacements: { mark, action, entity, entityId: entityId === undefined ? null : String(entityId) } },
  );
  const row = rows[0];
  if (!row) throw new Error(`no audit line ${action} on ${entity} ${entityId ?? ""}`);
  return { ...row, before: parse(row.before), after: parse(row.after) };
}

async function mark(): Promise<number> {
  const [row] = await app.sequelize.query<{ id: number | null }>("SELECT MAX(id) AS id FROM audit_log", { type: QueryTypes.SELECT });
  return Number(row?.id ?? 0);
}

async function send(c: Client, method: string, path: string, body?: unknown): Promise<{ status: number; json: Record<string, unknown> }> {
  const response = await c.fetch(path, {
    method,
    headers: { "content-type": "application/json" },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  const text = await response.text();
  return { status: response.status, json: text ? (JSON.parse(text) as Record<string, unknown>) : {} };
}

/** Each change: the call, then the audit line it must leave. `created` changes have no "before". */
function expectLine(row: AuditRow, actorId: number, { created = false } = {}) {
  expect(row.actor_id).toBe(actorId);
  expect(Date.now() - new Date(row.created_at).getTime()).toBeLessThan(60_000);
  expect(row.after, `${row.action}: after`).toBeTruthy();
  if (!created) expect(row.before, `${row.action}: before`).toBeTruthy();
}

const figures: string[] = [];

beforeAll(async () => {
  tech = await app.client("tech@demo.test");
  manager = await app.client("manager@demo.test");
  admin = await app.client("admin@demo.test");
  const rows = await app.sequelize.query<{ id: number; email: string }>(
    "SELECT id, email FROM users WHERE email IN ('tech@demo.test', 'manager@demo.test', 'admin@demo.test')",
    { type: QueryTypes.SELECT },
  );
  const byEmail = new Map(rows.map((r) => [r.email, r.id]));
  ids = { tech: byEmail.get("tech@demo.test")!, manager: byEmail.get("manager@demo.test")!, admin: byEmail.get("admin@demo.test")! };
});

async function usableLot(reagent: string): Promise<number> {
  const body = (await (await tech.fetch(`/api/stock-lots?reagent=${reagent}`)).json()) as {
    items: { id: number; usable: boolean; remaining: number }[];
  };
  return body.items.filter((l) => l.usable).sort((a, b) => b.remaining - a.remaining)[0]!.id;
}

describe("every change has an audit line with actor, time, before and after", () => {
  let batchId = 0;

  it("batches: recording a batch and marking a bottle", async () => {
    const m = await mark();
    const made = await send(tech, "POST", "/api/batches", {
      idempotencyKey: `audit-batch-${unique}`,
      recipeVersionId: 1,
      volume_mL: 2000,
      bottles: 2,
      bottleSize_mL: 1000,
      temperature_C: 22,
      components: [
        { reagent: "water", stockLotId: await usableLot("water"), actualAmount: 2000 },
        { reagent: "formic-acid", stockLotId: await usableLot("formic-acid"), actualAmount: 2.0 },
      ],
    });
    expect(made.status, JSON.stringify(made.json)).toBe(201);
    batchId = (made.json.batch as { id: number }).id;
    expectLine(await auditSince(m, "record", "batch", batchId), ids.tech, { created: true });
    const bottle = await send(tech, "POST", `/api/batches/${batchId}/bottles/1`, { status: "in_use" });
    expect(bottle.status, JSON.stringify(bottle.json)).toBe(200);
    const line = await auditSince(m, "bottle-in_use", "batch", batchId);
    expectLine(line, ids.tech);
    expect(line.before).toMatchObject({ bottle: 1, status: "ready" });
    expect(line.after).toMatchObject({ bottle: 1, status: "in_use" });
    figures.push("batch.record", "batch.bottle");
  });

  it("ledger: a run, a draw and a correction", async () => {
    const m = await mark();
    const run = await send(tech, "POST", "/api/runs", {
      instrumentId: 1,
      methodId: 1,
      projectId: 1,
      injections: 1,
      channelBatches: { A: batchId, B: 5 },
      startedAt: new Date(Date.now() + 60_000).toISOString(),
      idempotencyKey: `audit-run-${unique}`,
    });
    expect(run.status, JSON.stringify(run.json)).toBe(201);
    const runId = (run.json.run as { id: number }).id;
    const runLine = await auditSince(m, "run.log", "run", runId);
    expectLine(runLine, ids.tech);
    const code = Object.keys((runLine.before as { remaining_mL: Record<string, number> }).remaining_mL)[0]!;
    expect((runLine.after as { remaining_mL: Record<string, number> }).remaining_mL[code]).toBeLessThan(
      (runLine.before as { remaining_mL: Record<string, number> }).remaining_mL[code]!,
    );

    const draw = await send(tech, "POST", "/api/draws", {
      batchId,
      volume_mL: 25,
      purpose: "wash",
      idempotencyKey: `audit-draw-${unique}`,
    });
    expect(draw.status, JSON.stringify(draw.json)).toBe(201);
    const drawLine = await auditSince(m, "draw.log", "batch", batchId);
    expectLine(drawLine, ids.tech);
    expect(
      (drawLine.before as { remaining_mL: number }).remaining_mL - (drawLine.after as { remaining_mL: number }).remaining_mL,
    ).toBeCloseTo(25, 3);

    const [entry] = await app.sequelize.query<{ id: number }>(
      "SELECT id FROM ledger_entries WHERE source_id = :source ORDER BY id LIMIT 1",
      { type: QueryTypes.SELECT, replacements: { source: `draw:audit-draw-${unique}` } },
    );
    const correction = await send(tech, "POST", "/api/ledger/corrections", {
      entryIds: [entry!.id],
      reason: "Logged against the wrong batch",
    });
    expect(correction.status, JSON.stringify(correction.json)).toBe(201);
    const correctionLine = await auditSince(m, "ledger.correct", "ledger_entry");
    expectLine(correctionLine, ids.tech);
    expect(correctionLine.before).toMatchObject({ entries: [entry!.id] });
    figures.push("run.log", "draw.log", "ledger.correct");
  });

  it("rates: adding a price", async () => {
    const m = await mark();
    const rate = await send(manager, "POST", "/api/rates", {
      kind: "reagent",
      reagentId: "methanol",
      priceList: "internal",
      unit: "L",
      amount_minor: 1234,
      currency: "EUR",
      effectiveFrom: "2030-01-01",
    });
    expect(rate.status, JSON.stringify(rate.json)).toBe(201);
    const line = await auditSince(m, "rate.add", "rate", (rate.json.rate as { id: number }).id);
    expectLine(line, ids.manager, { created: true });
    expect(line.after).toMatchObject({ amount_minor: 1234 });
    figures.push("rate.add");
  });

  it("invoices: sending one through the payments fake and voiding it", async () => {
    const m = await mark();
    const now = new Date();
    const month = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - 1, 1));
    const end = new Date(Date.UTC(month.getUTCFullYear(), month.getUTCMonth() + 1, 0));
    const [external] = await app.sequelize.query<{ id: number }>("SELECT id FROM clients WHERE kind = 'external' ORDER BY id LIMIT 1", {
      type: QueryTypes.SELECT,
    });
    const opened = await send(manager, "POST", "/api/statements", {
      clientId: external!.id,
      periodStart: month.toISOString().slice(0, 10),
      periodEnd: end.toISOString().slice(0, 10),
    });
    expect([200, 201], JSON.stringify(opened.json)).toContain(opened.status);
    const statementId = opened.json.id as number;
    const invoiced = await send(manager, "POST", `/api/statements/${statementId}/invoice`, {});
    expect([200, 201], JSON.stringify(invoiced.json)).toContain(invoiced.status);
    const invoiceId = (invoiced.json.invoice as { id: number }).id;
    expectLine(await auditSince(m, "invoice.send", "invoice", invoiceId), ids.manager, { created: true });
    const issued = await auditSince(m, "statement.issue", "statement", statementId);
    expectLine(issued, ids.manager);
    expect(issued.before).toMatchObject({ status: "draft" });
    const voided = await send(manager, "POST", `/api/invoices/${invoiceId}/void`);
    expect(voided.status, JSON.stringify(voided.json)).toBe(200);
    const line = await auditSince(m, "invoice.void", "invoice", invoiceId);
    expectLine(line, ids.manager);
    expect(line.before).toMatchObject({ status: "open" });
    expect(line.after).toMatchObject({ status: "void" });
    figures.push("statement.issue", "invoice.send", "invoice.void");
  });

  it("waste containers: editing, a level reading and a status change", async () => {
    const m = await mark();
    const current = (await send(admin, "GET", "/api/waste/containers/1")).json.container as {
      code: string;
      streamId: string;
      capacity_mL: number;
      room: string;
      locationKind: string;
      instrument: { id: number } | null;
    };
    const edit = await send(admin, "PUT", "/api/waste/containers/1", {
      code: current.code,
      streamId: current.streamId,
      capacity_mL: current.capacity_mL + 100,
      room: current.room,
      locationKind: current.locationKind,
      locationNote: `audit ${unique}`,
      instrumentId: current.instrument?.id ?? null,
    });
    expect(edit.status, JSON.stringify(edit.json)).toBe(200);
    const editLine = await auditSince(m, "waste.container.update", "waste_container", 1);
    expectLine(editLine, ids.admin);
    expect(JSON.stringify(editLine.before)).not.toBe(JSON.stringify(editLine.after));
    const reading = await send(admin, "POST", "/api/waste/containers/1/readings", { level_mL: 500 });
    expect(reading.status, JSON.stringify(reading.json)).toBe(201);
    expectLine(await auditSince(m, "waste.reading", "waste_container", 1), ids.admin);
    const full = await send(admin, "POST", "/api/waste/containers/1/status", { status: "full" });
    expect(full.status, JSON.stringify(full.json)).toBe(200);
    const statusLine = await auditSince(m, "waste.container.status", "waste_container", 1);
    expectLine(statusLine, ids.admin);
    expect(statusLine.after).toMatchObject({ status: "full" });
    figures.push("waste.container.update", "waste.reading", "waste.container.status");
  });

  it("users: inviting, changing the role and deactivating", async () => {
    const m = await mark();
    const invited = await send(manager, "POST", "/api/users", {
      email: `audit.${unique}@demo.test`,
      name: "Audit Person",
      role: "technician",
    });
    expect(invited.status, JSON.stringify(invited.json)).toBe(201);
    const userId = (invited.json.user as { id: number }).id;
    expectLine(await auditSince(m, "user-invited", "user", userId), ids.manager, { created: true });
    const role = await send(manager, "PATCH", `/api/users/${userId}`, { role: "safety" });
    expect(role.status, JSON.stringify(role.json)).toBe(200);
    const roleLine = await auditSince(m, "user-role-changed", "user", userId);
    expectLine(roleLine, ids.manager);
    expect(roleLine.before).toMatchObject({ role: "technician" });
    expect(roleLine.after).toMatchObject({ role: "safety" });
    const off = await send(manager, "PATCH", `/api/users/${userId}`, { active: false });
    expect(off.status, JSON.stringify(off.json)).toBe(200);
    const offLine = await auditSince(m, "user-deactivated", "user", userId);
    expectLine(offLine, ids.manager);
    expect(offLine.before).toMatchObject({ active: true });
    expect(offLine.after).toMatchObject({ active: false });
    figures.push("user.invite", "user.role", "user.deactivate");
    console.log(
      `audit: ${figures.length} kinds of change made through the API, each with an audit line (actor, time, before/after): ${figures.join(", ")}`,
    );
  });
});

describe("the audit log cannot be edited", () => {
  it("the database refuses UPDATE and DELETE on audit_log, even for the app's own database user", async () => {
    const [row] = await app.sequelize.query<{ id: number; action: string }>("SELECT id, action FROM audit_log ORDER BY id LIMIT 1", {
      type: QueryTypes.SELECT,
    });
    expect(row).toBeDefined();
    await expect(
      app.sequelize.query("UPDATE audit_log SET action = 'tampered' WHERE id = :id", { replacements: { id: row!.id } }),
    ).rejects.toThrow(/append-only/);
    await expect(app.sequelize.query("DELETE FROM audit_log WHERE id = :id", { replacements: { id: row!.id } })).rejects.toThrow(
      /append-only/,
    );
    await expect(app.sequelize.query("DELETE FROM audit_log")).rejects.toThrow(/append-only/);
    const [again] = await app.sequelize.query<{ action: string }>("SELECT action FROM audit_log WHERE id = :id", {
      type: QueryTypes.SELECT,
      replacements: { id: row!.id },
    });
    expect(again!.action).toBe(row!.action);
  });

  it("no code outside the audit module writes audit_log, and no route does more than append through it", () => {
    const walk = (dir: string): string[] =>
      readdirSync(dir).flatMap((n) => (statSync(join(dir, n)).isDirectory() ? walk(join(dir, n)) : [join(dir, n)]));
    const offenders = walk("src")
      .filter((f) => /\.(ts|tsx|astro)$/.test(f) && !f.endsWith(join("server", "audit.ts")) && !f.includes(join("db", "migrations")))
      .filter((f) => {
        const text = readFileSync(f, "utf8");
        return (
          /(UPDATE|DELETE\s+FROM|INSERT\s+INTO|TRUNCATE)\s+`?audit_log/i.test(text) ||
          /AuditEntry\.(update|destroy|upsert|bulkCreate|create|truncate)/.test(text)
        );
      });
    expect(offenders).toEqual([]);
  });
});
