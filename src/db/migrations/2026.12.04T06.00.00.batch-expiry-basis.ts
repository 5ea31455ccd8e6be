import { DataTypes, type QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";
import { dropColumns } from "../drop-columns";

// What a batch's expiry was computed from (the rule, its shelf life, a lot that cut it short), so the
// label, the batch page, the due list and the digest word the expiry from the computation itself.
// NULL for batches recorded before: they show their stored reason.
export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.addColumn("batches", "expiry_basis", { type: DataTypes.JSON, allowNull: true });
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  await dropColumns(qi, "batches", ["expiry_basis"]);
}
