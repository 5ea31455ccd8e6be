import type { QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";

// Lead times and safety stocks of the demo facility (invented): acetonitrile comes from a supplier
// with a long lead time, so the demo's acetonitrile runs out before an order placed today would
// arrive, and the manager's overview says so.
export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.sequelize.query(
    `INSERT INTO reagent_supply (reagent_id, lead_time_days, safety_stock, updated_at)
     SELECT id, lead, safety, NOW(3) FROM (
       SELECT 'acetonitrile' AS id, 35 AS lead, 2000 AS safety UNION ALL
       SELECT 'methanol', 21, 1000 UNION ALL
       SELECT 'formic-acid', 10, 20) s
     WHERE EXISTS (SELECT 1 FROM reagents r WHERE r.id = s.id)`,
  );
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.sequelize.query("DELETE FROM reagent_supply WHERE reagent_id IN ('acetonitrile', 'methanol', 'formic-acid')");
}
