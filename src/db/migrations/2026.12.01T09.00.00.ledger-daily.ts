import { DataTypes, type QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";

// Per-day sums of the ledger by project and reagent, so usage over a year reads a few hundred
// thousand summary rows at most instead of every entry. A trigger keeps it in the same
// transaction as each insert, whatever the path (services, seeders, bulk loads); the ledger is
// append-only, so the sums only ever grow by the entries added (corrections included).
export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.createTable("ledger_daily", {
    day: { type: DataTypes.DATEONLY, allowNull: false, primaryKey: true },
    project_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, primaryKey: true },
    reagent_id: { type: DataTypes.STRING(64), allowNull: false, primaryKey: true },
    volume_ml: { type: DataTypes.DECIMAL(18, 4), allowNull: false, defaultValue: 0 },
    mass_g: { type: DataTypes.DECIMAL(18, 5), allowNull: true },
    entries: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
  });
  await qi.addIndex("ledger_daily", ["project_id", "day"], { name: "ledger_daily_project_day" });
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
  await qi.sequelize.query(`
    INSERT INTO ledger_daily (day, project_id, reagent_id, volume_ml, mass_g, entries)
    SELECT DATE(occurred_at), project_id, reagent_id, SUM(volume_ml), SUM(mass_g), COUNT(*)
      FROM ledger_entries WHERE project_id IS NOT NULL
     GROUP BY DATE(occurred_at), project_id, reagent_id`);
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.sequelize.query("DROP TRIGGER IF EXISTS ledger_entries_daily");
  await qi.dropTable("ledger_daily");
}
