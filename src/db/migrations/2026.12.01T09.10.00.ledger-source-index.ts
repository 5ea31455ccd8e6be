import type { QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";

// A run's entries by source alone: the run pages sum them per run without naming the source kind,
// which the (source_kind, source_id) index cannot serve, so each run read scanned the whole ledger
// (the benchmark's runs list, with a million entries, did not answer within minutes).
export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.addIndex("ledger_entries", ["source_id"], { name: "ledger_entries_source_id" });
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.removeIndex("ledger_entries", "ledger_entries_source_id");
}
