import { DataTypes, type QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";
import { dropColumns } from "../drop-columns";

// A bottle remembers the state it left and when, so marking it empty or discarding it can be undone
// for a short while (services/undo.ts); the discard's ledger entries are reversed, never deleted.
export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.addColumn("batch_bottles", "previous_status", {
    type: DataTypes.ENUM("ready", "in_use", "empty", "discarded"),
    allowNull: true,
  });
  await qi.addColumn("batch_bottles", "changed_at", { type: DataTypes.DATE(3), allowNull: true });
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  await dropColumns(qi, "batch_bottles", ["changed_at", "previous_status"]);
}
