// Demo waste history on top of the demo facility: a level reading that corrected an estimate
// (the halogenated carboy under Heron is near full), a container already collected with its
// manifest, and an acid carboy in the satellite area that has been accumulating for a long time.
// Invented data; the figures are illustrative.
import type { QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";
import { execute, selectOne } from "../../lib/server/query";
import { demoClock } from "../demo-time";

export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  const now = new Date();
  const at = demoClock(now);
  const stamp = (d: Date) => ({ created_at: d, updated_at: d });

  // A reading 3 days ago found WC-0103 fuller than the runs alone explain (rinses, a spill tray).
  const readAt = at(3, 16);
  const before = await selectOne<{ v: number }>(
    `SELECT COALESCE(SUM(l.volume_ml), 0) AS v FROM ledger_entries l JOIN waste_containers c ON c.id = l.waste_container_id
      WHERE c.code = 'WC-0103' AND l.occurred_at >= c.accumulation_started_at AND l.occurred_at <= :readAt`,
    { replacements: { readAt }, sequelize: qi.sequelize },
  );
  await qi.bulkInsert("waste_readings", [
    {
      container_id: 3,
      read_at: readAt,
      level_ml: 8_400,
      estimated_before_ml: before?.v ?? 0,
      reader_id: 4,
      note: "Read off the carboy's graduation; rinse solvent added by hand last week.",
      created_at: readAt,
    },
  ]);

  await qi.bulkInsert("pickups", [
    {
      id: 1,
      reference: "PU-2026-001",
      status: "collected",
      requested_at: at(48),
      requested_by: 4,
      collected_at: at(44, 11),
      manifest_ref: "HWM-88410",
      note: "Collected by the site waste service.",
      recorded_by: 4,
      ...stamp(at(48)),
    },
  ]);
  await qi.bulkInsert("waste_containers", [
    {
      id: 5,
      code: "WC-0091",
      stream_id: "non-halogenated-organic",
      capacity_ml: 20_000,
      estimated_volume_ml: 18_600,
      room: "B2.14",
      location_kind: "instrument",
      location_note: "Under Wren (before WC-0101)",
      status: "collected",
      accumulation_started_at: at(130),
      full_at: at(49),
      collected_at: at(44, 11),
      pickup_id: 1,
      ...stamp(at(130)),
    },
    {
      id: 6,
      code: "WC-0105",
      stream_id: "acidic-corrosive",
      capacity_ml: 5_000,
      estimated_volume_ml: 0,
      room: "B2.16",
      location_kind: "satellite_area",
      location_note: "Satellite area, acid cabinet",
      status: "in_use",
      accumulation_started_at: at(170),
      ...stamp(at(170)),
    },
  ]);
  await qi.bulkInsert("waste_readings", [
    {
      container_id: 6,
      read_at: at(20, 10),
      level_ml: 900,
      estimated_before_ml: 0,
      reader_id: 4,
      note: "Acid rinses from pH-meter maintenance, added by hand.",
      created_at: at(20, 10),
    },
  ]);
  await execute(`INSERT IGNORE INTO settings (\`key\`, value, updated_at) VALUES ('waste.accumulationWarning_days', '14', :t)`, {
    replacements: { t: at(100) },
    sequelize: qi.sequelize,
  });
}

export async function down() {
  throw new Error("The demo data cannot be unloaded row by row; use npm run db:reset to start from an empty database.");
}
