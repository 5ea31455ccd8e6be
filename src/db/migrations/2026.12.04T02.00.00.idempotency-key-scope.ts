import type { QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";

// One idempotency mechanism for batches, runs and draws (src/lib/server/idempotency.ts): a key is
// unique within its scope, not across all of them, and every committed key has its answer stored
// as {"value": …}. Keys recorded before get theirs: a batch's or run's id, a draw's stored result.
// A batch claim without a batch was left by a failed attempt and is dropped, so its retry can run.
export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  const sql = (text: string) => qi.sequelize.query(text);
  await sql("ALTER TABLE idempotency_keys DROP PRIMARY KEY, ADD PRIMARY KEY (scope, `key`)");
  await sql(`UPDATE idempotency_keys SET response = CONCAT('{"value":', response, '}') WHERE scope = 'draw' AND response IS NOT NULL`);
  await sql(
    `UPDATE idempotency_keys k JOIN batches b ON b.idempotency_key = k.\`key\`
        SET k.response = JSON_OBJECT('value', b.id) WHERE k.scope = 'batch'`,
  );
  await sql(
    `INSERT IGNORE INTO idempotency_keys (scope, \`key\`, response, created_at)
     SELECT 'run', idempotency_key, JSON_OBJECT('value', id), created_at FROM runs WHERE idempotency_key IS NOT NULL`,
  );
  await sql("DELETE FROM idempotency_keys WHERE response IS NULL");
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  const sql = (text: string) => qi.sequelize.query(text);
  await sql("DELETE FROM idempotency_keys WHERE scope = 'run'");
  await sql(`UPDATE idempotency_keys SET response = NULL WHERE scope = 'batch'`);
  await sql(`UPDATE idempotency_keys SET response = JSON_EXTRACT(response, '$.value') WHERE scope = 'draw'`);
  await sql("ALTER TABLE idempotency_keys DROP PRIMARY KEY, ADD PRIMARY KEY (`key`)");
}
