// Demo assays from the lots' certificates of analysis (invented numbers, in the ranges such products
// are sold at). The other demo lots keep none, so the preparation form shows both a lot's own assay
// and the fallback (the catalogue's typical value, or 100 %) for a lot that has none.
import type { QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";

export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.sequelize.query("UPDATE stock_lots SET assay_percent = 85.6, density_g_ml = 1.6935 WHERE lot_number = 'PA-5120'");
  await qi.sequelize.query("UPDATE stock_lots SET assay_percent = 99.6 WHERE lot_number = 'KP-8120'");
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.sequelize.query("UPDATE stock_lots SET assay_percent = NULL, density_g_ml = NULL WHERE lot_number IN ('PA-5120', 'KP-8120')");
}
