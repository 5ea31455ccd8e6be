import { DataTypes, type QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";

/** Preparation (issue 5): bottles per batch, pH-meter temperature, deviations, certificate size. */
export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.addColumn("batches", "ph_temperature_c", { type: DataTypes.DECIMAL(5, 2) });
  await qi.addColumn("batches", "deviations", { type: DataTypes.JSON });
  await qi.addColumn("batches", "deviation_reason", { type: DataTypes.STRING(500) });
  await qi.addColumn("batches", "expiry_reason", { type: DataTypes.STRING(300) });
  await qi.addColumn("stock_lots", "certificate_size", { type: DataTypes.INTEGER.UNSIGNED });
  await qi.addColumn("stock_lots", "created_by", {
    type: DataTypes.INTEGER.UNSIGNED,
    references: { model: "users", key: "id" },
    onDelete: "SET NULL",
    onUpdate: "CASCADE",
  });

  await qi.createTable("batch_bottles", {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    batch_id: {
      type: DataTypes.INTEGER.UNSIGNED,
      allowNull: false,
      references: { model: "batches", key: "id" },
      onDelete: "CASCADE",
      onUpdate: "CASCADE",
    },
    number: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    status: { type: DataTypes.ENUM("ready", "in_use", "empty", "discarded"), allowNull: false, defaultValue: "ready" },
    discarded_ml: { type: DataTypes.DECIMAL(14, 4) },
    updated_by: { type: DataTypes.INTEGER.UNSIGNED, references: { model: "users", key: "id" }, onDelete: "SET NULL", onUpdate: "CASCADE" },
    created_at: { type: DataTypes.DATE(3), allowNull: false, defaultValue: DataTypes.NOW },
    updated_at: { type: DataTypes.DATE(3), allowNull: false, defaultValue: DataTypes.NOW },
  });
  await qi.addIndex("batch_bottles", ["batch_id", "number"], { unique: true });
  await qi.addIndex("batches", ["expires_at"]);

  // Batches made before this migration get their bottles, in the batch's own state.
  await qi.sequelize.query(`
    INSERT INTO batch_bottles (batch_id, number, status, created_at, updated_at)
    WITH RECURSIVE n AS (SELECT 1 AS k UNION ALL SELECT k + 1 FROM n WHERE k < 50)
    SELECT b.id, n.k, b.status, b.created_at, b.updated_at FROM batches b JOIN n ON n.k <= b.bottles`);
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.dropTable("batch_bottles");
  await qi.removeIndex("batches", ["expires_at"]);
  for (const column of ["ph_temperature_c", "deviations", "deviation_reason", "expiry_reason"]) await qi.removeColumn("batches", column);
  await qi.removeColumn("stock_lots", "certificate_size");
  await qi.removeColumn("stock_lots", "created_by");
}
