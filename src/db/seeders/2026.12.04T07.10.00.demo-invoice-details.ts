import type { QueryInterface } from "sequelize";
import type { MigrationParams } from "umzug";
import { execute } from "../../lib/server/query";

// What the demo facility's invoices print (all invented: names, addresses, tax ids, bank details).
// Quillfeather is taxed at a standard 21 %; Tarnbrook is billed across a border under reverse charge.
const SETTINGS: Record<string, unknown> = {
  "facility.legalName": "Veldmoor Institute for Applied Sciences, Separation Science Core",
  "facility.address": "Building B2, Kestrel Lane 14\n4821 Veldmoor",
  "facility.taxId": "XX 482 117 930",
  "invoices.prefix": "VSC",
  "invoices.remitTo": "Veldmoor Institute, Finance Office\nAccount XX00 VELD 0000 4821 17\nReference: the invoice number",
  "invoices.note": "Questions about a line? Write to the core facility manager, quoting the statement reference.",
};

export async function up({ context: qi }: MigrationParams<QueryInterface>) {
  const options = { sequelize: qi.sequelize };
  for (const [key, value] of Object.entries(SETTINGS))
    await execute("INSERT IGNORE INTO settings (`key`, value, updated_at) VALUES (?, ?, NOW(3))", {
      ...options,
      replacements: [key, JSON.stringify(value)],
    });
  await execute(
    `UPDATE clients SET billing_address = ?, tax_id = ?, purchase_order = ?, tax_treatment = 'standard', tax_rate_percent = 21, tax_label = 'VAT'
      WHERE name = 'Quillfeather Therapeutics'`,
    { ...options, replacements: ["Attn. Accounts Payable\nHarbour Row 7\n3310 Quillmouth", "XX 301 775 204", "PO-QT-2026-118"] },
  );
  await execute(
    `UPDATE clients SET billing_address = ?, tax_id = ?, tax_treatment = 'reverse_charge', tax_label = 'VAT'
      WHERE name = 'Tarnbrook Agritech'`,
    { ...options, replacements: ["Mill Road 22\n9043 Tarnbrook", "YY 5518 2290"] },
  );
}

export async function down({ context: qi }: MigrationParams<QueryInterface>) {
  const options = { sequelize: qi.sequelize };
  await execute(
    `DELETE FROM settings WHERE \`key\` IN (${Object.keys(SETTINGS)
      .map(() => "?")
      .join(", ")})`,
    {
      ...options,
      replacements: Object.keys(SETTINGS),
    },
  );
  await execute(
    "UPDATE clients SET billing_address = NULL, tax_id = NULL, purchase_order = NULL, tax_treatment = 'none', tax_rate_percent = NULL",
    options,
  );
}
