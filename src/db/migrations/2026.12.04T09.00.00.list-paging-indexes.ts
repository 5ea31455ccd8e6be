import type { QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";

// The keyset pages of the lists (lib/server/list-page.ts) walk an index in the list's order and stop
// after one page. InnoDB appends the primary key to every secondary index, so (started_at) orders
// by (started_at, id), the tie-breaker of every cursor. A run reference is searched by its start.
const INDEXES: [table: string, fields: string[], name: string][] = [
  ["runs", ["started_at"], "runs_started"],
  ["runs", ["reference"], "runs_reference"],
  ["batches", ["prepared_at"], "batches_prepared"],
  ["stock_lots", ["expires_on"], "stock_lots_expires"],
  ["audit_log", ["actor_id", "created_at"], "audit_log_actor_created"],
  ["audit_log", ["entity", "created_at"], "audit_log_entity_created"],
];

export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  for (const [table, fields, name] of INDEXES) await qi.addIndex(table, fields, { name });
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  // InnoDB may have let (actor_id, created_at) serve the actor foreign key in place of the index
  // it made for it; give the key a one-column index back in the same ALTER that drops ours.
  for (const [table, fields, name] of INDEXES) {
    const keep = fields[0] === "actor_id" ? `ADD INDEX \`${table}_${fields[0]}\` (\`${fields[0]}\`), ` : "";
    await qi.sequelize.query(`ALTER TABLE \`${table}\` ${keep}DROP INDEX \`${name}\``);
  }
}
