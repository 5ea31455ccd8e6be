/**
 * Looks up what the small demo holds (by name, so a development database with its own changes
 * still works), inserts the catalogue's new rows, the simulated year and its bills. Used by the
 * development profile's seeder (src/db/dev-seeders/) and by the benchmark that times it.
 */
import type { QueryInterface, Sequelize } from "sequelize";
import type { Rate } from "../../lib/billing/rates";
import { hashPassword } from "../../lib/server/auth/password";
import { execute, select } from "../../lib/server/query";
import { DAY_MS } from "../demo-time";
import { DEMO_CLIENTS, INSTRUMENTS, NEW_CLIENTS, NEW_PROJECTS, NEW_RECIPES, NEW_USERS, type InstrumentKey } from "./catalogue";
import { billYear } from "./statements";
import { simulateYear, type Row } from "./simulate";

const DEMO_PASSWORD = "decant-demo";

async function insert(qi: QueryInterface, table: string, rows: Row[]) {
  for (let i = 0; i < rows.length; i += 1000) await qi.bulkInsert(table, rows.slice(i, i + 1000));
}

export async function loadDemoHistory(qi: QueryInterface, now = new Date()): Promise<Record<string, number>> {
  const sequelize = qi.sequelize as Sequelize;
  const q = <T extends object>(sql: string, replacements?: Record<string, unknown>) => select<T>(sql, { sequelize, replacements });
  const nextId = async (table: string) => ((await q<{ n: number | null }>(`SELECT MAX(id) AS n FROM ${table}`))[0]?.n ?? 0) + 1;
  const byName = async (table: string, column: string) =>
    Object.fromEntries((await q<{ id: number; k: string }>(`SELECT id, ${column} AS k FROM ${table}`)).map((r) => [r.k, r.id]));
  const t0 = new Date(now.getTime() - 366 * DAY_MS);
  const stamp = { created_at: t0, updated_at: t0 };

  const users = await byName("users", "email");
  const instruments = await byName("instruments", "name");
  const water = (await q<{ id: number }>("SELECT id FROM stock_lots WHERE lot_number = 'UPW-SYSTEM'"))[0];
  if (
    !users["tech@demo.test"] ||
    !users["manager@demo.test"] ||
    !instruments.Wren ||
    !instruments.Kestrel ||
    !instruments.Heron ||
    !water
  ) {
    console.log("decant: the small demo's people, instruments or water lot are missing; the demo year is not added.");
    return {};
  }

  // New clients, people, the fourth instrument and its method, projects and recipes.
  let clientId = await nextId("clients");
  const clients: Record<string, number> = {};
  for (const [key, name] of Object.entries(DEMO_CLIENTS)) clients[key] = (await byName("clients", "name"))[name]!;
  const clientRows = NEW_CLIENTS.map((c) => {
    clients[c.key] = clientId;
    return {
      id: clientId++,
      name: c.name,
      kind: c.kind,
      cost_centre: c.costCentre ?? null,
      billing_email: c.billingEmail ?? null,
      currency: "EUR",
      ...stamp,
    };
  });
  await insert(qi, "clients", clientRows);
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  await insert(
    qi,
    "users",
    NEW_USERS.map((u) => ({
      email: u.email,
      name: u.name,
      role: u.role,
      client_id: "client" in u ? clients[u.client] : null,
      password_hash: passwordHash,
      ...stamp,
    })),
  );
  const containerId = await nextId("waste_containers");
  await insert(qi, "instruments", [
    { name: "Sandpiper", kind: "HPLC, binary pump, fluorescence detector", room: "B2.16", channels: JSON.stringify(["A", "B"]), ...stamp },
  ]);
  const program = [
    [0, 1.0, 20],
    [8, 1.0, 80],
    [9, 1.0, 80],
    [9.1, 1.0, 20],
    [14, 1.0, 20],
  ].map(([time_min, flow_mL_min, b]) => ({ time_min, flow_mL_min, composition: { A: 100 - b!, B: b } }));
  await insert(qi, "methods", [
    {
      name: "Fluorescence gradient 20–80 % B, 10 min",
      description: "Derivatised amines, 4.6 mm column.",
      program: JSON.stringify(program),
      re_equilibration_min: 4.9,
      run_time_min: 14,
      ...stamp,
    },
  ]);
  const projectsStart = await nextId("projects");
  await insert(
    qi,
    "projects",
    NEW_PROJECTS.map((p, i) => ({
      id: projectsStart + i,
      code: p.code,
      name: p.name,
      client_id: clients[p.client],
      contact_name: p.contact,
      contact_email: `${p.contact
        .replace(/^Dr\. /, "")
        .toLowerCase()
        .replace(/[^a-z]+/g, ".")}@${p.client}.test`,
      status: p.until > 0 ? "closed" : "active",
      created_at: new Date(now.getTime() - p.from * DAY_MS),
      updated_at: new Date(now.getTime() - p.until * DAY_MS),
    })),
  );
  const tech = users["tech@demo.test"]!;
  const manager = users["manager@demo.test"]!;
  const recipeStart = await nextId("recipes");
  await insert(
    qi,
    "recipes",
    NEW_RECIPES.map((r, i) => ({
      id: recipeStart + i,
      code: r.code,
      name: r.name,
      channel: r.channel,
      status: r.status,
      created_by: tech,
      ...stamp,
    })),
  );
  await insert(
    qi,
    "recipe_versions",
    NEW_RECIPES.map((r, i) => ({
      recipe_id: recipeStart + i,
      version: 1,
      spec: JSON.stringify(r.spec),
      detection_nm: r.detectionNm,
      storage: r.storage,
      created_by: tech,
      approved_by: manager,
      approved_at: t0,
      created_at: t0,
    })),
  );
  const versions = await q<{ code: string; id: number }>(
    "SELECT r.code, MAX(v.id) AS id FROM recipes r JOIN recipe_versions v ON v.recipe_id = r.id WHERE v.approved_at IS NOT NULL GROUP BY r.code",
  );

  // Each instrument's carboys of the small demo, which the year leaves in place.
  const windows = await q<{ note: string; started: Date; collected: Date | null }>(
    "SELECT location_note AS note, accumulation_started_at AS started, collected_at AS collected FROM waste_containers WHERE location_kind = 'instrument'",
  );
  const instrumentIds = await byName("instruments", "name");
  const keyed = Object.fromEntries(INSTRUMENTS.map((p) => [p.key, instrumentIds[p.name]!])) as Record<InstrumentKey, number>;
  const instrumentContainers = Object.fromEntries(
    INSTRUMENTS.map((p) => [
      p.key,
      windows
        .filter((w) => w.note?.startsWith(`Under ${p.name}`))
        .map((w) => ({ from: new Date(w.started), to: w.collected ? new Date(w.collected) : null })),
    ]),
  ) as Record<InstrumentKey, { from: Date; to: Date | null }[]>;

  const year = simulateYear({
    now,
    next: {
      batch: await nextId("batches"),
      stockLot: await nextId("stock_lots"),
      run: await nextId("runs"),
      wasteContainer: containerId,
      pickup: await nextId("pickups"),
    },
    technicians: [tech, users["ines.halvorsen@demo.test"] ?? tech, users["hana.vesely@demo.test"] ?? tech],
    safetyOfficer: users["safety@demo.test"] ?? manager,
    instruments: keyed,
    instrumentContainers,
    methods: await byName("methods", "name"),
    recipeVersions: Object.fromEntries(versions.map((v) => [v.code, v.id])),
    projects: await byName("projects", "code"),
    waterLotId: water.id,
    takenBatchCodes: (await q<{ code: string }>("SELECT code FROM batches")).map((r) => r.code),
  });
  await insert(qi, "stock_lots", year.stockLots);
  await insert(qi, "pickups", year.pickups);
  await insert(qi, "waste_containers", year.wasteContainers);
  await insert(qi, "batches", year.batches);
  await insert(qi, "batch_components", year.batchComponents);
  await insert(qi, "batch_bottles", year.batchBottles);
  await insert(qi, "runs", year.runs);
  await insert(qi, "ledger_entries", year.ledger);
  if (year.currentContainer.sandpiper)
    await execute("UPDATE instruments SET waste_container_id = :c WHERE id = :i", {
      sequelize,
      replacements: { c: year.currentContainer.sandpiper, i: keyed.sandpiper },
    });

  // A price change half a year ago: solvents and the fees went up.
  const changed = new Date(now.getTime() - 182 * DAY_MS).toISOString().slice(0, 10);
  const raise = [
    ["reagent", "acetonitrile", "internal", "L", 4_700],
    ["reagent", "acetonitrile", "external", "L", 8_800],
    ["reagent", "methanol", "internal", "L", 2_100],
    ["reagent", "methanol", "external", "L", 4_000],
    ["preparation_fee", null, "internal", "batch", 1_400],
    ["preparation_fee", null, "external", "batch", 2_900],
    ["injection_fee", null, "external", "injection", 175],
  ] as const;
  await insert(
    qi,
    "rates",
    raise.map(([kind, reagent, list, unit, amount]) => ({
      kind,
      reagent_id: reagent,
      price_list: list,
      unit,
      amount_minor: amount,
      currency: "EUR",
      effective_from: changed,
      created_by: manager,
      created_at: new Date(now.getTime() - 200 * DAY_MS),
    })),
  );
  const rates = (
    await q<{
      id: number;
      kind: Rate["kind"];
      reagent_id: string | null;
      grade: string | null;
      price_list: Rate["priceList"];
      unit: Rate["unit"];
      amount_minor: number;
      currency: string;
      effective_from: string;
    }>(
      "SELECT id, kind, reagent_id, grade, price_list, unit, amount_minor, currency, DATE_FORMAT(effective_from, '%Y-%m-%d') AS effective_from FROM rates ORDER BY effective_from, id",
    )
  ).map((r) => ({
    id: r.id,
    kind: r.kind,
    reagentId: r.reagent_id,
    grade: r.grade,
    priceList: r.price_list,
    unit: r.unit,
    amount_minor: r.amount_minor,
    currency: r.currency,
    effectiveFrom: r.effective_from,
  }));
  const bills = await billYear(sequelize, {
    now,
    manager,
    nextStatementId: await nextId("statements"),
    nextInvoiceId: await nextId("invoices"),
    clients: await q("SELECT id, name, kind, currency FROM clients WHERE active = 1 ORDER BY id"),
    rates,
    existing: new Set(
      (await q<{ k: string }>("SELECT CONCAT(client_id, ':', DATE_FORMAT(period_start, '%Y-%m-%d')) AS k FROM statements")).map((r) => r.k),
    ),
  });
  await insert(qi, "statements", bills.statements);
  await insert(qi, "invoices", bills.invoices);
  await insert(qi, "period_locks", bills.locks);
  return {
    runs: year.runs.length,
    ledgerEntries: year.ledger.length,
    batches: year.batches.length,
    bottles: year.batchBottles.length,
    stockLots: year.stockLots.length,
    wasteContainers: year.wasteContainers.length,
    pickups: year.pickups.length,
    statements: bills.statements.length,
    invoices: bills.invoices.length,
  };
}
