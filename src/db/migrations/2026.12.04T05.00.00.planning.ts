import { DataTypes, type QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";

// Planning ahead: proposed variants of a method (another organic modifier, another column), method
// versions so that a variant can become the method's program with a manager's approval (like
// recipe versions), and each reagent's lead time and safety stock for the reorder point.
export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  const id = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
  const user = { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: "users", key: "id" } };
  await qi.createTable("method_variants", {
    id,
    method_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: "methods", key: "id" }, onDelete: "CASCADE" },
    name: { type: DataTypes.STRING(120), allowNull: false },
    /** What was asked for: { substitution?, transfer?, detection_nm?, solvents } */
    params: { type: DataTypes.JSON, allowNull: false },
    /** The method's program the variant was worked out from, and the result. */
    base_program: { type: DataTypes.JSON, allowNull: false },
    program: { type: DataTypes.JSON, allowNull: false },
    created_by: user,
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.addIndex("method_variants", ["method_id", "created_at"]);

  await qi.createTable("method_versions", {
    id,
    method_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: "methods", key: "id" }, onDelete: "CASCADE" },
    version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    program: { type: DataTypes.JSON, allowNull: false },
    run_time_min: { type: DataTypes.DECIMAL(8, 3), allowNull: false },
    origin: { type: DataTypes.ENUM("initial", "edit", "variant"), allowNull: false },
    variant_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: "method_variants", key: "id" } },
    note: { type: DataTypes.STRING(255), allowNull: true },
    created_by: user,
    created_at: { type: DataTypes.DATE(3), allowNull: false },
    approved_by: user,
    approved_at: { type: DataTypes.DATE(3), allowNull: true },
    /** A pending version set aside by a manager (or superseded) is never approved. */
    rejected_at: { type: DataTypes.DATE(3), allowNull: true },
  });
  await qi.addIndex("method_versions", ["method_id", "version"], { unique: true });
  // Every existing method starts at version 1: its current program, approved as it is.
  await qi.sequelize.query(
    `INSERT INTO method_versions (method_id, version, program, run_time_min, origin, created_at, approved_at)
     SELECT id, 1, program, run_time_min, 'initial', created_at, created_at FROM methods`,
  );

  await qi.createTable("reagent_supply", {
    reagent_id: {
      type: DataTypes.STRING(64),
      primaryKey: true,
      references: { model: "reagents", key: "id" },
      onUpdate: "CASCADE",
      onDelete: "CASCADE",
    },
    lead_time_days: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    /** In the reagent's unit (mL or g). */
    safety_stock: { type: DataTypes.DECIMAL(12, 3), allowNull: false, defaultValue: 0 },
    updated_by: user,
    updated_at: { type: DataTypes.DATE(3), allowNull: false },
  });
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.dropTable("reagent_supply");
  await qi.dropTable("method_versions");
  await qi.dropTable("method_variants");
}
