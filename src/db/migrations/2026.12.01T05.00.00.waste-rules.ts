import { DataTypes, type QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";

// What the waste service needs beyond the core tables: per-stream routing rules (the share from
// which a mix reaches the stream, the other streams a container of it may take), the basic
// corrosive stream the reagent catalogue uses, the alerts already raised (so each is raised and
// mailed once per container fill, however often the check runs), and who recorded a collection.
export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  // NULL means "the common-practice default for this stream" (src/lib/waste/streams.ts).
  await qi.addColumn("waste_streams", "min_share_percent", { type: DataTypes.DECIMAL(6, 3), allowNull: true });
  await qi.addColumn("waste_streams", "also_accepts", { type: DataTypes.JSON, allowNull: true });
  await qi.sequelize.query(
    `INSERT IGNORE INTO waste_streams (id, name, description, restrictiveness, created_at, updated_at)
     VALUES ('basic-corrosive', 'Basic / corrosive', 'Concentrated bases (ammonia solution, hydroxides) and base-rich mixes.', 3, NOW(3), NOW(3))`,
  );

  await qi.createTable("waste_alerts", {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    container_id: {
      type: DataTypes.INTEGER.UNSIGNED,
      allowNull: false,
      references: { model: "waste_containers", key: "id" },
      onDelete: "CASCADE",
      onUpdate: "CASCADE",
    },
    kind: { type: DataTypes.ENUM("near-full", "over-capacity", "accumulation-approaching", "accumulation-over"), allowNull: false },
    // One alert of a kind per accumulation cycle of the container (its accumulation start, ISO).
    cycle: { type: DataTypes.STRING(32), allowNull: false },
    detail: { type: DataTypes.JSON, allowNull: true },
    raised_at: { type: DataTypes.DATE(3), allowNull: false },
    mailed_at: { type: DataTypes.DATE(3), allowNull: true },
  });
  await qi.addIndex("waste_alerts", ["container_id", "kind", "cycle"], { unique: true, name: "waste_alerts_once" });

  await qi.addColumn("pickups", "note", { type: DataTypes.STRING(255), allowNull: true });
  await qi.addColumn("pickups", "recorded_by", {
    type: DataTypes.INTEGER.UNSIGNED,
    allowNull: true,
    references: { model: "users", key: "id" },
    onDelete: "SET NULL",
    onUpdate: "CASCADE",
  });
  await qi.addIndex("waste_readings", ["container_id", "read_at"], { name: "waste_readings_container_read" });
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.removeIndex("waste_readings", "waste_readings_container_read");
  await qi.removeColumn("pickups", "recorded_by");
  await qi.removeColumn("pickups", "note");
  await qi.dropTable("waste_alerts");
  await qi.sequelize.query(
    "DELETE FROM waste_streams WHERE id = 'basic-corrosive' AND NOT EXISTS (SELECT 1 FROM waste_containers WHERE stream_id = 'basic-corrosive')",
  );
  await qi.removeColumn("waste_streams", "also_accepts");
  await qi.removeColumn("waste_streams", "min_share_percent");
}
