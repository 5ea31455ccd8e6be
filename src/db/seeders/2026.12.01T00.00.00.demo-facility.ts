// Demo data: an invented analytical core facility, its people, clients and three months of work.
// Every name here is invented; numbers are illustrative, not reference values. The rows are in
// ./demo-facility/ (one module per area); this file loads them in the order the keys need.
import type { QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";
import { hashPassword } from "../../lib/server/auth/password";
import { execute } from "../../lib/server/query";
import { demoClock } from "../demo-time";
import { billingRows } from "./demo-facility/billing";
import { labRows } from "./demo-facility/lab";
import { organisationRows } from "./demo-facility/organisation";
import { preparationRows } from "./demo-facility/preparation";
import { runRows } from "./demo-facility/runs";

export const DEMO_PASSWORD = "decant-demo";

export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  const at = demoClock(new Date());
  const t0 = at(100);

  const organisation = organisationRows(t0, await hashPassword(DEMO_PASSWORD));
  await qi.bulkInsert("clients", organisation.clients);
  await qi.bulkInsert("users", organisation.users);
  await qi.bulkInsert("projects", organisation.projects);

  const lab = labRows(at, t0);
  await qi.bulkInsert("waste_streams", lab.wasteStreams);
  await qi.bulkInsert("waste_containers", lab.wasteContainers);
  await qi.bulkInsert("instruments", lab.instruments);
  await qi.bulkInsert("reagents", lab.reagents);
  await qi.bulkInsert("stock_lots", lab.stockLots);
  await qi.bulkInsert("methods", lab.methods);

  const preparation = preparationRows(at, t0);
  await qi.bulkInsert("recipes", preparation.recipes);
  await qi.bulkInsert("recipe_versions", preparation.recipeVersions);
  await qi.bulkInsert("batches", preparation.batches);
  await qi.bulkInsert("batch_components", preparation.batchComponents);
  await qi.bulkInsert("batch_bottles", preparation.batchBottles);

  const { runs, ledger } = runRows(at);
  await qi.bulkInsert("runs", runs);
  await qi.bulkInsert("ledger_entries", ledger);
  await execute(
    `UPDATE waste_containers c SET estimated_volume_ml = (
       SELECT COALESCE(SUM(l.volume_ml), 0) FROM ledger_entries l
       WHERE l.waste_container_id = c.id AND l.occurred_at >= c.accumulation_started_at)`,
    { sequelize: qi.sequelize },
  );

  const billing = billingRows(at, t0);
  await qi.bulkInsert("rates", billing.rates);
  await qi.bulkInsert("settings", billing.settings);
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  // The ledger refuses DELETE by design, so the demo data goes with the schema: `npm run db:reset`.
  void qi;
  throw new Error("The demo data cannot be unloaded row by row; use npm run db:reset to start from an empty database.");
}
