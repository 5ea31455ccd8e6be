// The development profile's demo year (npm start, npm run db:reset): twelve months of invented
// activity on top of the small demo the tests read. Generated from a fixed seed relative to the day
// it runs; the test profile never loads it (src/db/umzug.ts, DEV_SEEDERS).
import type { QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";
import { loadDemoHistory } from "../history/load";

export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  const started = Date.now();
  const counts = await loadDemoHistory(qi);
  if (Object.keys(counts).length)
    console.log(
      `decant: demo year generated in ${((Date.now() - started) / 1000).toFixed(1)} s (${Object.entries(counts)
        .map(([k, v]) => `${v} ${k}`)
        .join(", ")})`,
    );
}

export async function down() {
  throw new Error("The demo data cannot be unloaded row by row; use npm run db:reset to start from an empty database.");
}
