import { DataTypes, type QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";

// What the ledger service needs beyond the core tables: the mass of a solid reagent (buffer salts
// are priced per gram), the pump channel an entry was drawn through, and indexes for the lookups
// the run and correction screens make (a run's entries, a batch's entries).
export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.addColumn("ledger_entries", "mass_g", { type: DataTypes.DECIMAL(14, 5), allowNull: true });
  await qi.addColumn("ledger_entries", "channel", { type: DataTypes.STRING(4), allowNull: true });
  await qi.addIndex("ledger_entries", ["source_kind", "source_id"], { name: "ledger_entries_source" });
  await qi.addIndex("ledger_entries", ["batch_id", "occurred_at"], { name: "ledger_entries_batch" });
  await qi.addIndex("runs", ["project_id", "started_at"], { name: "runs_project_started" });
  await qi.addIndex("imports", ["checksum"], { name: "imports_checksum" });
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.removeIndex("imports", "imports_checksum");
  await qi.removeIndex("runs", "runs_project_started");
  await qi.removeIndex("ledger_entries", "ledger_entries_batch");
  await qi.removeIndex("ledger_entries", "ledger_entries_source");
  await qi.removeColumn("ledger_entries", "channel");
  await qi.removeColumn("ledger_entries", "mass_g");
}
