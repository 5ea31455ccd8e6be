// Demo data: an invented analytical core facility, its people, clients and three months of work.
// Every name here is invented; numbers are illustrative, not reference values.
import type { QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";
import { hashPassword } from "../../lib/server/auth/password";
import { execute } from "../../lib/server/query";
import { demoBatchSchedule, demoCodes, demoExpiry, type DemoBatch } from "../demo-batches";
import { DEMO_RECIPE_SPECS } from "../demo-recipes";
import { seedDemoLab } from "../demo-lab";
import { demoClock } from "../demo-time";

/** Small deterministic generator so every fresh seed looks the same. */
function prng(seed: number) {
  let s = seed >>> 0;
  return () => {
    s = (s * 1664525 + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

const stamp = (d: Date) => ({ created_at: d, updated_at: d });

export const DEMO_PASSWORD = "decant-demo";

export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  const now = new Date();
  const at = demoClock(now);
  const t0 = at(100);

  await qi.bulkInsert("clients", [
    { id: 1, name: "Plant Metabolomics Group", kind: "internal", cost_centre: "CC-4102", currency: "EUR", ...stamp(t0) },
    { id: 2, name: "Protein Chemistry Group", kind: "internal", cost_centre: "CC-4217", currency: "EUR", ...stamp(t0) },
    { id: 3, name: "Environmental Trace Analysis Group", kind: "internal", cost_centre: "CC-4330", currency: "EUR", ...stamp(t0) },
    {
      id: 4,
      name: "Quillfeather Therapeutics",
      kind: "external",
      billing_email: "accounts@quillfeather.test",
      currency: "EUR",
      ...stamp(t0),
    },
    { id: 5, name: "Tarnbrook Agritech", kind: "external", billing_email: "payables@tarnbrook.test", currency: "EUR", ...stamp(t0) },
  ]);

  const passwordHash = await hashPassword(DEMO_PASSWORD);
  await qi.bulkInsert("users", [
    { id: 1, email: "admin@demo.test", name: "Alex Morrow", role: "admin", password_hash: passwordHash, ...stamp(t0) },
    { id: 2, email: "manager@demo.test", name: "Priya Castellan", role: "manager", password_hash: passwordHash, ...stamp(t0) },
    { id: 3, email: "tech@demo.test", name: "Rowan Ellery", role: "technician", password_hash: passwordHash, ...stamp(t0) },
    { id: 4, email: "safety@demo.test", name: "Tomasz Werne", role: "safety", password_hash: passwordHash, ...stamp(t0) },
    { id: 5, email: "client@demo.test", name: "Jun Okabe", role: "client", client_id: 4, password_hash: passwordHash, ...stamp(t0) },
    { id: 6, email: "ines.halvorsen@demo.test", name: "Ines Halvorsen", role: "technician", password_hash: passwordHash, ...stamp(t0) },
  ]);

  await qi.bulkInsert("projects", [
    {
      id: 1,
      code: "PMG-ROOT-26",
      name: "Root exudate profiling",
      client_id: 1,
      contact_name: "Dr. Amara Nkem",
      contact_email: "a.nkem@veldmoor.test",
      ...stamp(t0),
    },
    {
      id: 2,
      code: "PCG-MASS-26",
      name: "Intact mass QC of expressed constructs",
      client_id: 2,
      contact_name: "Dr. Lukas Brenner",
      contact_email: "l.brenner@veldmoor.test",
      ...stamp(t0),
    },
    {
      id: 3,
      code: "ETA-RIVR-26",
      name: "River water screening, spring campaign",
      client_id: 3,
      contact_name: "Dr. Sofia Marrow",
      contact_email: "s.marrow@veldmoor.test",
      ...stamp(t0),
    },
    {
      id: 4,
      code: "QFT-IMP-014",
      name: "Impurity profiling, lead series QF-14",
      client_id: 4,
      contact_name: "Jun Okabe",
      contact_email: "client@demo.test",
      ...stamp(t0),
    },
    {
      id: 5,
      code: "QFT-STB-015",
      name: "Forced-degradation study QF-15",
      client_id: 4,
      contact_name: "Jun Okabe",
      contact_email: "client@demo.test",
      ...stamp(t0),
    },
    {
      id: 6,
      code: "TBA-RES-007",
      name: "Residue panel, cereal extracts",
      client_id: 5,
      contact_name: "Mireille Aubart",
      contact_email: "m.aubart@tarnbrook.test",
      ...stamp(t0),
    },
  ]);

  await seedDemoLab(qi, at, t0);

  const spec = (s: object) => JSON.stringify(s);
  await qi.bulkInsert("recipes", [
    { id: 1, code: "MP-FA-W", name: "0.1 % formic acid in water", channel: "A", status: "approved", created_by: 3, ...stamp(t0) },
    { id: 2, code: "MP-FA-ACN", name: "0.1 % formic acid in acetonitrile", channel: "B", status: "approved", created_by: 3, ...stamp(t0) },
    { id: 3, code: "MP-PHOS-30", name: "25 mM potassium phosphate, pH 3.0", channel: "A", status: "approved", created_by: 3, ...stamp(t0) },
    { id: 4, code: "MP-AMF-35", name: "10 mM ammonium formate, pH 3.5", channel: "A", status: "draft", created_by: 6, ...stamp(at(10)) },
  ]);
  await qi.bulkInsert("recipe_versions", [
    {
      id: 1,
      recipe_id: 1,
      version: 1,
      spec: spec(DEMO_RECIPE_SPECS["MP-FA-W"]),
      detection_nm: 254,
      storage: "Room temperature, capped",
      created_by: 3,
      approved_by: 2,
      approved_at: t0,
      created_at: t0,
    },
    {
      id: 2,
      recipe_id: 2,
      version: 1,
      spec: spec(DEMO_RECIPE_SPECS["MP-FA-ACN"]),
      detection_nm: 254,
      storage: "Flammables cabinet",
      created_by: 3,
      approved_by: 2,
      approved_at: t0,
      created_at: t0,
    },
    {
      id: 3,
      recipe_id: 3,
      version: 1,
      spec: spec(DEMO_RECIPE_SPECS["MP-PHOS-30"]),
      detection_nm: 210,
      storage: "2–8 °C",
      created_by: 3,
      approved_by: 2,
      approved_at: t0,
      created_at: t0,
    },
    {
      id: 4,
      recipe_id: 4,
      version: 1,
      spec: spec(DEMO_RECIPE_SPECS["MP-AMF-35"]),
      detection_nm: 220,
      storage: "Room temperature, capped",
      created_by: 6,
      created_at: at(10),
    },
  ]);

  // Batches (demo-batches.ts): inserted after the runs below, whose use sets their volumes.
  const schedule = demoBatchSchedule();

  // Three months of runs with their ledger entries (invented, illustrative volumes).
  const random = prng(20261201);
  const runs: object[] = [];
  const ledger: object[] = [];
  const projectsByInstrument: Record<number, number[]> = { 1: [1, 2, 4], 2: [4, 5, 6], 3: [3, 6, 2] };
  const perInjection: Record<number, { A: number; B: number }> = {
    1: { A: 3.38, B: 2.62 },
    2: { A: 20.1, B: 12.9 },
    3: { A: 4.8, B: 3.2 },
  };
  const waste: Record<number, { stream: string; container: number }> = {
    1: { stream: "non-halogenated-organic", container: 1 },
    2: { stream: "non-halogenated-organic", container: 2 },
    3: { stream: "halogenated-organic", container: 3 },
  };
  let runId = 0;
  for (let daysAgo = 90; daysAgo >= 1; daysAgo--) {
    const day = at(daysAgo);
    if (day.getUTCDay() === 0 || day.getUTCDay() === 6) continue;
    for (const instrumentId of [1, 2, 3]) {
      if (random() < 0.45) continue;
      runId++;
      const projectId = projectsByInstrument[instrumentId]![Math.floor(random() * 3)]!;
      const methodId = instrumentId === 2 ? 2 : random() < 0.8 ? 1 : 3;
      const injections = 8 + Math.floor(random() * 40);
      const use = perInjection[methodId]!;
      const volumes = { A: +(use.A * injections).toFixed(2), B: +(use.B * injections).toFixed(2) };
      const startedAt = new Date(day.getTime() + Math.floor(random() * 6) * 3_600_000);
      const { A: batchA, B: batchB } = schedule.forRun(daysAgo);
      runs.push({
        id: runId,
        instrument_id: instrumentId,
        method_id: methodId,
        project_id: projectId,
        operator_id: random() < 0.6 ? 3 : 6,
        reference: `SEQ-${instrumentId}-${String(runId).padStart(4, "0")}`,
        started_at: startedAt,
        injections,
        channel_batches: JSON.stringify({ A: batchA, B: batchB }),
        channel_volumes: JSON.stringify(volumes),
        ...stamp(startedAt),
      });
      const { stream, container } = waste[instrumentId]!;
      const entry = (batchId: number, reagentId: string, volume_ml: number) => ({
        occurred_at: startedAt,
        project_id: projectId,
        kind: "run",
        batch_id: batchId,
        reagent_id: reagentId,
        volume_ml: +volume_ml.toFixed(4),
        waste_stream_id: stream,
        waste_container_id: container,
        source_kind: "seed",
        source_id: `run:${runId}`,
        author_id: 3,
        created_at: startedAt,
      });
      // 0.1 % v/v formic acid in each channel; the rest is water (A) or acetonitrile (B).
      ledger.push(entry(batchA, "water", volumes.A * 0.999), entry(batchA, "formic-acid", volumes.A * 0.001));
      ledger.push(entry(batchB, "acetonitrile", volumes.B * 0.999), entry(batchB, "formic-acid", volumes.B * 0.001));
    }
  }
  // Each batch holds what its runs drew (historical ones used up), in whole bottles of 1 L.
  const used = new Map<number, number>();
  for (const e of ledger as { batch_id: number; volume_ml: number }[]) used.set(e.batch_id, (used.get(e.batch_id) ?? 0) + e.volume_ml);
  const lotExpiry = (lotNumber: string, daysAhead: number) => ({ lotNumber, expiresOn: at(-daysAhead).toISOString().slice(0, 10) });
  const lotsOf: Record<number, { lotNumber: string; expiresOn: string }[]> = {
    4: [lotExpiry("UPW-SYSTEM", 3650), lotExpiry("FA-2290", 300)],
    5: [lotExpiry("AN-58213", 600), lotExpiry("FA-2290", 300)],
    6: [lotExpiry("UPW-SYSTEM", 3650), lotExpiry("KP-7731", 400)],
  };
  const preparedAt = (b: DemoBatch) => at(b.daysAgo, 8);
  const codes = demoCodes(schedule.batches.map((b) => ({ id: b.id, at: preparedAt(b) })));
  const batchRows = schedule.batches.map((b) => {
    const drawn = +(used.get(b.id) ?? 0).toFixed(4);
    const volume =
      b.remaining !== undefined ? b.remaining : Math.max(1000, Math.ceil((drawn + (b.status === "in_use" ? 2500 : 0)) / 1000) * 1000);
    const expiry = demoExpiry(b.recipeVersionId, preparedAt(b), lotsOf[b.id] ?? []);
    return {
      id: b.id,
      code: codes.get(b.id)!,
      recipe_version_id: b.recipeVersionId,
      spec_snapshot: JSON.stringify({ recipeVersionId: b.recipeVersionId }),
      volume_ml: volume,
      remaining_ml: b.status === "in_use" || b.status === "ready" ? +(volume - drawn).toFixed(4) : 0,
      bottles: volume / 1000,
      bottle_size_ml: 1000,
      temperature_c: 22,
      measured_ph: b.recipeVersionId === 3 ? 3.02 : null,
      prepared_by: b.id % 2 ? 3 : 6,
      prepared_at: preparedAt(b),
      expires_at: expiry.expiresAt,
      expiry_reason: expiry.reason.slice(0, 300),
      expiry_basis: JSON.stringify(expiry.basis),
      status: b.status,
      ...stamp(preparedAt(b)),
    };
  });
  await qi.bulkInsert("batches", batchRows);
  // A row per bottle: in use batches have their first bottles done, the rest ready.
  await qi.bulkInsert(
    "batch_bottles",
    batchRows.flatMap((b) =>
      Array.from({ length: b.bottles }, (_, i) => {
        const emptied = Math.floor((b.volume_ml - b.remaining_ml) / (b.volume_ml / b.bottles));
        const status = b.status !== "in_use" ? b.status : i < emptied ? "empty" : i === emptied ? "in_use" : "ready";
        return { batch_id: b.id, number: i + 1, status, created_at: b.prepared_at, updated_at: b.prepared_at };
      }),
    ),
  );
  await qi.bulkInsert("batch_components", [
    { batch_id: 4, reagent_id: "water", stock_lot_id: 6, role: "solvent", unit: "mL", target_amount: 4000, actual_amount: 4000 },
    { batch_id: 4, reagent_id: "formic-acid", stock_lot_id: 3, role: "additive", unit: "mL", target_amount: 4, actual_amount: 4 },
    { batch_id: 5, reagent_id: "acetonitrile", stock_lot_id: 1, role: "solvent", unit: "mL", target_amount: 4000, actual_amount: 4000 },
    { batch_id: 5, reagent_id: "formic-acid", stock_lot_id: 3, role: "additive", unit: "mL", target_amount: 4, actual_amount: 4 },
    { batch_id: 6, reagent_id: "water", stock_lot_id: 6, role: "solvent", unit: "mL", target_amount: 1000, actual_amount: 1000 },
    {
      batch_id: 6,
      reagent_id: "potassium-dihydrogen-phosphate",
      stock_lot_id: 4,
      role: "buffer",
      unit: "g",
      target_amount: 3.4021,
      actual_amount: 3.405,
    },
  ]);

  await qi.bulkInsert("runs", runs);
  await qi.bulkInsert("ledger_entries", ledger);
  await execute(
    `UPDATE waste_containers c SET estimated_volume_ml = (
       SELECT COALESCE(SUM(l.volume_ml), 0) FROM ledger_entries l
       WHERE l.waste_container_id = c.id AND l.occurred_at >= c.accumulation_started_at)`,
    { sequelize: qi.sequelize },
  );

  const rate = (kind: string, reagent: string | null, list: string, unit: string, amount: number) => ({
    kind,
    reagent_id: reagent,
    price_list: list,
    unit,
    amount_minor: amount,
    currency: "EUR",
    effective_from: at(365),
    created_by: 2,
    created_at: t0,
  });
  await qi.bulkInsert("rates", [
    rate("reagent", "acetonitrile", "internal", "L", 4_200),
    rate("reagent", "acetonitrile", "external", "L", 7_900),
    rate("reagent", "methanol", "internal", "L", 1_900),
    rate("reagent", "methanol", "external", "L", 3_600),
    rate("reagent", "water", "internal", "L", 150),
    rate("reagent", "water", "external", "L", 400),
    rate("reagent", "formic-acid", "internal", "L", 21_000),
    rate("reagent", "formic-acid", "external", "L", 38_000),
    rate("reagent", "isopropanol", "internal", "L", 2_600),
    rate("reagent", "isopropanol", "external", "L", 4_900),
    rate("reagent", "trifluoroacetic-acid", "internal", "L", 95_000),
    rate("reagent", "trifluoroacetic-acid", "external", "L", 160_000),
    rate("reagent", "phosphoric-acid", "internal", "L", 6_000),
    rate("reagent", "phosphoric-acid", "external", "L", 11_000),
    rate("reagent", "ammonium-formate", "internal", "g", 30),
    rate("reagent", "ammonium-formate", "external", "g", 60),
    rate("reagent", "ammonium-acetate", "internal", "g", 20),
    rate("reagent", "ammonium-acetate", "external", "g", 45),
    rate("reagent", "potassium-dihydrogen-phosphate", "internal", "g", 9),
    rate("reagent", "potassium-dihydrogen-phosphate", "external", "g", 20),
    rate("reagent", "dipotassium-hydrogen-phosphate", "internal", "g", 10),
    rate("reagent", "dipotassium-hydrogen-phosphate", "external", "g", 22),
    rate("preparation_fee", null, "internal", "batch", 1_200),
    rate("preparation_fee", null, "external", "batch", 2_500),
    rate("injection_fee", null, "internal", "injection", 0),
    rate("injection_fee", null, "external", "injection", 150),
  ]);

  await qi.bulkInsert("settings", [
    { key: "facility.name", value: JSON.stringify("Veldmoor Separation Science Core"), updated_at: t0 },
    { key: "expiry.aqueousBuffer_h", value: JSON.stringify(48), updated_at: t0 },
    { key: "expiry.organicMix_days", value: JSON.stringify(30), updated_at: t0 },
    { key: "waste.fullThreshold_percent", value: JSON.stringify(80), updated_at: t0 },
    { key: "waste.accumulationLimit_days", value: JSON.stringify(180), updated_at: t0 },
    { key: "flammables.roomLimit_L", value: JSON.stringify({ "B2.14": 50, "B2.16": 25 }), updated_at: t0 },
    { key: "invoices.daysUntilDue", value: JSON.stringify(30), updated_at: t0 },
  ]);
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  // The ledger refuses DELETE by design, so the demo data goes with the schema: `npm run db:reset`.
  void qi;
  throw new Error("The demo data cannot be unloaded row by row; use npm run db:reset to start from an empty database.");
}
