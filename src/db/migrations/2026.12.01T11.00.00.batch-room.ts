import { DataTypes, type QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";

// Where a batch is kept, so that the flammables on hand per room count the mobile phases on the
// bench with the stock lots and the waste. NULL for batches recorded before rooms were asked for.
export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.addColumn("batches", "room", { type: DataTypes.STRING(40), allowNull: true });
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.removeColumn("batches", "room");
}
