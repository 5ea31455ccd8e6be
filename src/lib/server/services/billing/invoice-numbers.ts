/**
 * Decant's invoice numbers: gap-free per prefix and year. The counter row is locked by the
 * transaction that sends the invoice and bumped in it, so concurrent sends queue on it and a send
 * that rolls back returns its number; a void invoice keeps its number.
 */
import type { Transaction } from "sequelize";
import { invoiceNumber, invoiceSeries } from "../../../billing/invoice";
import { execute, selectOne } from "../../query";

/** Creates the year's counter if it is missing (outside the caller's transaction, so no gap lock is held). */
async function ensureSeries(series: string): Promise<void> {
  await execute("INSERT IGNORE INTO invoice_sequences (series, last_number) VALUES (?, 0)", { replacements: [series] });
}

/** The next number of the series, taken in the caller's transaction. */
export async function takeInvoiceNumber(prefix: string, year: number, transaction: Transaction): Promise<string> {
  const series = invoiceSeries(prefix, year);
  await ensureSeries(series);
  const row = await selectOne<{ last_number: number }>("SELECT last_number FROM invoice_sequences WHERE series = ? FOR UPDATE", {
    replacements: [series],
    transaction,
  });
  const next = (row?.last_number ?? 0) + 1;
  await execute("UPDATE invoice_sequences SET last_number = ? WHERE series = ?", { replacements: [next, series], transaction });
  return invoiceNumber(prefix, year, next);
}
