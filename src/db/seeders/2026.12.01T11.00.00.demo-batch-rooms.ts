import type { QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";
import { execute } from "../../lib/server/query";

// The demo batches get the room they are kept in (invented): the current acetonitrile mix (id 5) stands
// by the MS in B2.16, the buffers beside the phosphate stock in B2.16, the rest in B2.14.
export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  const options = { sequelize: qi.sequelize };
  await execute("UPDATE batches SET room = 'B2.16' WHERE room IS NULL AND id = 5", options);
  await execute("UPDATE batches SET room = 'B2.16' WHERE room IS NULL AND recipe_version_id IN (3, 4)", options);
  await execute("UPDATE batches SET room = 'B2.14' WHERE room IS NULL", options);
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  await execute("UPDATE batches SET room = NULL", { sequelize: qi.sequelize });
}
