// Demo assays from the lots' certificates of analysis (invented numbers, in the ranges such products
// are sold at), and a lot of potassium hydroxide pellets, so the preparation form shows both a lot's
// own assay and the catalogue's typical value for a lot that has none.
import type { QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";

const DAY = 86_400_000;

export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.sequelize.query("UPDATE stock_lots SET assay_percent = 85.6, density_g_ml = 1.6935 WHERE lot_number = 'PA-5120'");
  await qi.sequelize.query("UPDATE stock_lots SET assay_percent = 99.6 WHERE lot_number = 'KP-8120'");
  const now = new Date();
  const day = (offset: number) => new Date(now.getTime() + offset * DAY).toISOString().slice(0, 10);
  await qi.bulkInsert("stock_lots", [
    {
      reagent_id: "potassium-hydroxide",
      lot_number: "KH-4471",
      supplier: "Pellworth Reagents",
      grade: "analytical",
      received_on: day(-40),
      opened_on: day(-35),
      expires_on: day(800),
      quantity: 500,
      remaining: 430,
      room: "B2.16",
      assay_percent: 86.1,
      created_at: now,
      updated_at: now,
    },
  ]);
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.sequelize.query("DELETE FROM stock_lots WHERE lot_number = 'KH-4471'");
  await qi.sequelize.query("UPDATE stock_lots SET assay_percent = NULL, density_g_ml = NULL WHERE lot_number IN ('PA-5120', 'KP-8120')");
}
