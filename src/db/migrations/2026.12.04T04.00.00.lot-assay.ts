import { DataTypes, type QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";

// What is weighed matches what is in the bottle: a stock lot records the assay on its certificate
// of analysis (% w/w of the formula substance; for solutions as received) and, for solutions, the
// density the certificate gives (g/mL at 20 °C). Each batch component records the assay its target
// was computed with and where it came from: the lot, the catalogue's typical value, or none (100 %).
export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.addColumn("stock_lots", "assay_percent", { type: DataTypes.DECIMAL(6, 3), allowNull: true });
  await qi.addColumn("stock_lots", "density_g_ml", { type: DataTypes.DECIMAL(6, 4), allowNull: true });
  await qi.addColumn("batch_components", "assay_percent", { type: DataTypes.DECIMAL(6, 3), allowNull: true });
  await qi.addColumn("batch_components", "assay_source", { type: DataTypes.ENUM("lot", "typical", "none"), allowNull: true });
}

// Plain ALTERs: removeColumn first reads the foreign keys with an untyped raw SELECT, which the
// mariadb dialect cannot hand back with this driver (its result's meta cannot be deleted).
export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.sequelize.query("ALTER TABLE batch_components DROP COLUMN assay_source, DROP COLUMN assay_percent");
  await qi.sequelize.query("ALTER TABLE stock_lots DROP COLUMN density_g_ml, DROP COLUMN assay_percent");
}
