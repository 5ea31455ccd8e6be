import type { QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";
import { execute } from "../../lib/server/query";
import { applyTimeZone } from "../../lib/server/services/facility-settings";

// The invented demo facility works in Europe/Berlin, in English (en-GB) and in euros. The zone is
// set the way an administrator sets it: the offsets and the per-day sums follow in one transaction.
const DEMO = { "facility.timeZone": "Europe/Berlin", "facility.locale": "en-GB", "facility.currency": "EUR" };

export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  const sequelize = qi.sequelize;
  await sequelize.transaction(async (transaction) => {
    for (const [key, value] of Object.entries(DEMO)) {
      await execute(
        "INSERT INTO settings (`key`, value, updated_by, updated_at) VALUES (?, ?, NULL, NOW(3)) ON DUPLICATE KEY UPDATE value = VALUES(value)",
        { replacements: [key, JSON.stringify(value)], transaction, sequelize },
      );
    }
    await applyTimeZone(DEMO["facility.timeZone"], { transaction, sequelize });
  });
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  const sequelize = qi.sequelize;
  await sequelize.transaction(async (transaction) => {
    await execute("DELETE FROM settings WHERE `key` IN (:keys)", { replacements: { keys: Object.keys(DEMO) }, transaction, sequelize });
    await applyTimeZone("UTC", { transaction, sequelize });
  });
}
