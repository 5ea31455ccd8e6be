import { DataTypes, type QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";
import { dropColumns } from "../drop-columns";

// What an invoice a finance office accepts needs: the client's billing address, tax id, purchase
// order and tax treatment; Decant's own gap-free invoice numbers (one counter row per series,
// locked by the transaction that sends the invoice, so a rolled-back send leaves no gap); the
// invoice's tax, subtotal and a frozen copy of both parties' details as printed.
export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.addColumn("clients", "billing_address", { type: DataTypes.TEXT, allowNull: true });
  await qi.addColumn("clients", "tax_id", { type: DataTypes.STRING(40), allowNull: true });
  await qi.addColumn("clients", "purchase_order", { type: DataTypes.STRING(60), allowNull: true });
  await qi.addColumn("clients", "tax_treatment", {
    type: DataTypes.ENUM("none", "standard", "zero_rated", "reverse_charge"),
    allowNull: false,
    defaultValue: "none",
  });
  await qi.addColumn("clients", "tax_rate_percent", { type: DataTypes.DECIMAL(7, 4), allowNull: true });
  await qi.addColumn("clients", "tax_label", { type: DataTypes.STRING(20), allowNull: true });
  await qi.createTable("invoice_sequences", {
    series: { type: DataTypes.STRING(40), primaryKey: true },
    last_number: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
  });
  await qi.addColumn("invoices", "subtotal_minor", { type: DataTypes.INTEGER, allowNull: true });
  await qi.addColumn("invoices", "tax_minor", { type: DataTypes.INTEGER, allowNull: true });
  await qi.addColumn("invoices", "issued_on", { type: DataTypes.DATEONLY, allowNull: true });
  await qi.addColumn("invoices", "details", { type: DataTypes.JSON, allowNull: true });
  await qi.addIndex("invoices", ["number"], { name: "invoices_number", unique: true });
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  await qi.removeIndex("invoices", "invoices_number");
  await dropColumns(qi, "invoices", ["details", "issued_on", "tax_minor", "subtotal_minor"]);
  await qi.dropTable("invoice_sequences");
  await dropColumns(qi, "clients", ["tax_label", "tax_rate_percent", "tax_treatment", "purchase_order", "tax_id", "billing_address"]);
}
