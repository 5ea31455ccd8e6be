import type { QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";

// The ledger is append-only: the database itself refuses to change or remove an entry,
// so no code path (or hand-typed SQL through the app user) can rewrite history.
export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  for (const op of ["UPDATE", "DELETE"]) {
    await qi.sequelize.query(`
      CREATE TRIGGER ledger_entries_no_${op.toLowerCase()} BEFORE ${op} ON ledger_entries
      FOR EACH ROW SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'ledger_entries is append-only: add a correction instead'`);
  }
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.sequelize.query("DROP TRIGGER IF EXISTS ledger_entries_no_update");
  await qi.sequelize.query("DROP TRIGGER IF EXISTS ledger_entries_no_delete");
}
