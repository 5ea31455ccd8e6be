// Demo data for preparation: an expired stock lot, a batch due to expire within a day, and one
// already past its expiry still on the bench. Invented names and numbers, as in the facility seed.
import type { QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";
import { batchCodeBase, nextBatchCode } from "../../lib/preparation/batch-code";
import { select, selectOne } from "../../lib/server/query";
import { demoExpiry } from "../demo-batches";

const DAY = 86_400_000;

export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  const now = new Date();
  const day = (offset: number) => new Date(now.getTime() + offset * DAY).toISOString().slice(0, 10);
  const stamp = { created_at: now, updated_at: now };
  await qi.bulkInsert("stock_lots", [
    {
      reagent_id: "ammonium-acetate",
      lot_number: "AA-3307",
      supplier: "Pellworth Reagents",
      grade: "LC-MS",
      received_on: day(-400),
      opened_on: day(-380),
      expires_on: day(-10),
      quantity: 250,
      remaining: 180,
      room: "B2.16",
      ...stamp,
    },
    {
      reagent_id: "phosphoric-acid",
      lot_number: "PA-5120",
      supplier: "Pellworth Reagents",
      grade: "analytical",
      received_on: day(-30),
      opened_on: day(-28),
      expires_on: day(900),
      quantity: 500,
      remaining: 455,
      room: "B2.16",
      ...stamp,
    },
    {
      reagent_id: "potassium-dihydrogen-phosphate",
      lot_number: "KP-8120",
      supplier: "Pellworth Reagents",
      grade: "analytical",
      received_on: day(-12),
      expires_on: day(1000),
      quantity: 500,
      remaining: 500,
      room: "B2.16",
      ...stamp,
    },
    {
      reagent_id: "methanol",
      lot_number: "ME-12044",
      supplier: "Northfold Chemicals",
      grade: "LC-MS",
      received_on: day(-20),
      expires_on: day(700),
      quantity: 4_000,
      remaining: 300,
      room: "B2.14",
      ...stamp,
    },
  ]);

  const taken = (await select<{ code: string }>("SELECT code FROM batches", { sequelize: qi.sequelize })).map((r) => r.code);
  const batch = async (recipeVersionId: 1 | 3, preparedAt: Date, volume: number, status: string, ph: number | null) => {
    // The expiry from the rules, as a recorded batch gets it (demo-batches.ts); no lots are listed.
    const expiry = demoExpiry(recipeVersionId, preparedAt, []);
    const code = nextBatchCode(batchCodeBase(preparedAt), taken);
    taken.push(code);
    await qi.bulkInsert("batches", [
      {
        code,
        recipe_version_id: recipeVersionId,
        spec_snapshot: JSON.stringify({ recipeVersionId }),
        volume_ml: volume,
        remaining_ml: volume,
        bottles: volume / 1000,
        bottle_size_ml: 1000,
        temperature_c: 22,
        measured_ph: ph,
        prepared_by: 3,
        prepared_at: preparedAt,
        expires_at: expiry.expiresAt,
        status,
        expiry_reason: expiry.reason.slice(0, 300),
        expiry_basis: JSON.stringify(expiry.basis),
        created_at: preparedAt,
        updated_at: preparedAt,
      },
    ]);
    const row = await selectOne<{ id: number }>("SELECT id FROM batches WHERE code = ?", { replacements: [code], sequelize: qi.sequelize });
    for (let n = 1; n <= volume / 1000; n++)
      await qi.bulkInsert("batch_bottles", [{ batch_id: row!.id, number: n, status, created_at: preparedAt, updated_at: preparedAt }]);
  };
  // Acidified water, a week's life: due within the next day.
  const dueAt = new Date(now.getTime() - 6.6 * DAY);
  await batch(1, dueAt, 2000, "in_use", null);
  // Phosphate buffer made four days ago with a 48 h rule: expired, still on the bench.
  const oldAt = new Date(now.getTime() - 4 * DAY);
  await batch(3, oldAt, 1000, "ready", 3.01);
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  void qi;
  throw new Error("Demo data is removed with npm run db:reset.");
}
