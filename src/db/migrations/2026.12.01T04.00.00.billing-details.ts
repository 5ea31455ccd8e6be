import { DataTypes, type QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";

// What statements and invoices need beyond the core tables: a statement's revision (part of the
// idempotency keys sent to the payments provider) and who issued it; the provider's invoice number
// and the dates of each change its events report; lookups for period locks.
export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.addColumn("statements", "revision", { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 });
  await qi.addColumn("statements", "issued_by", {
    type: DataTypes.INTEGER.UNSIGNED,
    allowNull: true,
    references: { model: "users", key: "id" },
    onDelete: "SET NULL",
    onUpdate: "CASCADE",
  });
  await qi.addColumn("statements", "voided_at", { type: DataTypes.DATE(3), allowNull: true });
  await qi.addColumn("invoices", "number", { type: DataTypes.STRING(64), allowNull: true });
  await qi.addColumn("invoices", "finalized_at", { type: DataTypes.DATE(3), allowNull: true });
  await qi.addColumn("invoices", "voided_at", { type: DataTypes.DATE(3), allowNull: true });
  await qi.addColumn("invoices", "uncollectible_at", { type: DataTypes.DATE(3), allowNull: true });
  await qi.addColumn("invoices", "payment_failed_at", { type: DataTypes.DATE(3), allowNull: true });
  await qi.addColumn("invoices", "last_payment_error", { type: DataTypes.STRING(255), allowNull: true });
  await qi.addColumn("invoices", "created_by", {
    type: DataTypes.INTEGER.UNSIGNED,
    allowNull: true,
    references: { model: "users", key: "id" },
    onDelete: "SET NULL",
    onUpdate: "CASCADE",
  });
  await qi.addIndex("period_locks", ["client_id", "period_start", "period_end"], { name: "period_locks_client_period" });
  await qi.addIndex("invoices", ["client_id", "status"], { name: "invoices_client_status" });
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.removeIndex("invoices", "invoices_client_status");
  await qi.removeIndex("period_locks", "period_locks_client_period");
  for (const column of ["created_by", "last_payment_error", "payment_failed_at", "uncollectible_at", "voided_at", "finalized_at", "number"])
    await qi.removeColumn("invoices", column);
  for (const column of ["voided_at", "issued_by", "revision"]) await qi.removeColumn("statements", column);
}
