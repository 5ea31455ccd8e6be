import type { QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";

// The audit log is append-only like the ledger: the database refuses to change or remove a line,
// so no route, service or SQL typed through the app user can rewrite who did what.
export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  for (const op of ["UPDATE", "DELETE"]) {
    await qi.sequelize.query(`
      CREATE TRIGGER audit_log_no_${op.toLowerCase()} BEFORE ${op} ON audit_log
      FOR EACH ROW SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'audit_log is append-only'`);
  }
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.sequelize.query("DROP TRIGGER IF EXISTS audit_log_no_update");
  await qi.sequelize.query("DROP TRIGGER IF EXISTS audit_log_no_delete");
}
