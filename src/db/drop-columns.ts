import type { QueryInterface } from "sequelize";

/**
 * Drops columns in one ALTER TABLE. Not `removeColumn`: it first reads the table's foreign keys
 * with an untyped raw SELECT, whose result the mariadb dialect cannot hand back with this driver
 * (the rows' `meta` cannot be deleted), so every migration's `down` would fail.
 */
export async function dropColumns(qi: QueryInterface, table: string, columns: readonly string[]): Promise<void> {
  await qi.sequelize.query(`ALTER TABLE \`${table}\` ${columns.map((c) => `DROP COLUMN \`${c}\``).join(", ")}`);
}
