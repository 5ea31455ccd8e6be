import { DataTypes, type QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";

// `ledger_daily` sums the facility's local days, not UTC days. The database does not know the
// IANA zones (MariaDB's zone tables are not loaded on a private server), so the app writes the
// zone's offset changes into `facility_utc_offsets` (one row per offset in force from `starts_at`
// to `ends_at`, UTC) and the trigger adds the offset in force at each entry's instant before
// taking its DATE(). Until an administrator sets a zone the one row says UTC, offset 0, and the
// sums are the same as before. Changing the zone rewrites the rows and the sums in one
// transaction (src/lib/server/services/facility-settings.ts).
export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.createTable("facility_utc_offsets", {
    starts_at: { type: DataTypes.DATE(3), allowNull: false, primaryKey: true },
    ends_at: { type: DataTypes.DATE(3), allowNull: false },
    offset_minutes: { type: DataTypes.SMALLINT, allowNull: false },
  });
  await qi.sequelize.query("INSERT INTO facility_utc_offsets (starts_at, ends_at, offset_minutes) VALUES ('1000-01-01', '9999-12-31', 0)");
  await qi.sequelize.query("DROP TRIGGER IF EXISTS ledger_entries_daily");
  await qi.sequelize.query(`
    CREATE TRIGGER ledger_entries_daily AFTER INSERT ON ledger_entries
    FOR EACH ROW
      IF NEW.project_id IS NOT NULL THEN
        INSERT INTO ledger_daily (day, project_id, reagent_id, volume_ml, mass_g, entries)
        VALUES (
          DATE(NEW.occurred_at + INTERVAL COALESCE(
            (SELECT o.offset_minutes FROM facility_utc_offsets o WHERE o.starts_at <= NEW.occurred_at ORDER BY o.starts_at DESC LIMIT 1), 0) MINUTE),
          NEW.project_id, NEW.reagent_id, NEW.volume_ml, NEW.mass_g, 1)
        ON DUPLICATE KEY UPDATE
          volume_ml = volume_ml + NEW.volume_ml,
          mass_g = IF(NEW.mass_g IS NULL, mass_g, COALESCE(mass_g, 0) + NEW.mass_g),
          entries = entries + 1;
      END IF`);
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.sequelize.query("DROP TRIGGER IF EXISTS ledger_entries_daily");
  await qi.sequelize.query(`
    CREATE TRIGGER ledger_entries_daily AFTER INSERT ON ledger_entries
    FOR EACH ROW
      IF NEW.project_id IS NOT NULL THEN
        INSERT INTO ledger_daily (day, project_id, reagent_id, volume_ml, mass_g, entries)
        VALUES (DATE(NEW.occurred_at), NEW.project_id, NEW.reagent_id, NEW.volume_ml, NEW.mass_g, 1)
        ON DUPLICATE KEY UPDATE
          volume_ml = volume_ml + NEW.volume_ml,
          mass_g = IF(NEW.mass_g IS NULL, mass_g, COALESCE(mass_g, 0) + NEW.mass_g),
          entries = entries + 1;
      END IF`);
  await qi.sequelize.query("DELETE FROM ledger_daily");
  await qi.sequelize.query(`
    INSERT INTO ledger_daily (day, project_id, reagent_id, volume_ml, mass_g, entries)
    SELECT DATE(occurred_at), project_id, reagent_id, SUM(volume_ml), SUM(mass_g), COUNT(*)
      FROM ledger_entries WHERE project_id IS NOT NULL
     GROUP BY DATE(occurred_at), project_id, reagent_id`);
  await qi.sequelize.query("DELETE FROM settings WHERE `key` = 'facility.timeZone'");
  await qi.dropTable("facility_utc_offsets");
}
