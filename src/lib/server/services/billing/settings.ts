/** The settings billing reads, each with the value used while none is stored. */
import type { Transaction } from "sequelize";
import type { FacilityDetails } from "../../../billing/invoice";
import { Setting } from "../../models/audit";

async function setting<T>(key: string, fallback: T, transaction?: Transaction): Promise<T> {
  const row = await Setting.findByPk(key, { transaction });
  return row ? (row.value as T) : fallback;
}

/** The facility's name, printed on statements and invoice e-mails. */
export const facilityName = (transaction?: Transaction) => setting("facility.name", "Decant", transaction);

/** Days a client has to pay an invoice. */
export const daysUntilDue = async (transaction?: Transaction) => Number(await setting("invoices.daysUntilDue", 30, transaction));

/** The facility as its invoices name it; the legal name falls back to the facility's name. */
export async function facilityDetails(transaction?: Transaction): Promise<FacilityDetails> {
  const name = await facilityName(transaction);
  return {
    legalName: await setting("facility.legalName", name, transaction),
    address: await setting("facility.address", "", transaction),
    taxId: await setting("facility.taxId", "", transaction),
    invoicePrefix: await setting("invoices.prefix", "INV", transaction),
    paymentTermsDays: await daysUntilDue(transaction),
    remitTo: await setting("invoices.remitTo", "", transaction),
    note: await setting("invoices.note", "", transaction),
  };
}
