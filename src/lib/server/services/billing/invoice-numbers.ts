/**
 * Decant's invoice numbers: gap-free per prefix and year. The counter row is locked by the
 * transaction that sends the invoice and bumped in it, so concurrent sends queue on it and a send
 * that rolls back returns its number; a void invoice keeps its number.
 */
import type { Transaction } from "sequelize";
import { invoiceNumber, invoiceSeries } from "../../../billing/invoice";
import { execute, selectOne } from "../../query";

/**
 * Creates the year's counter if it is missing. Called before the sending transaction opens, so
 * concurrent first sends of a year do not deadlock inserting the same row, and no transaction
 * waits for a second pooled connection.
 */
export async function ensureInvoiceSeries(prefix: string, year: number): Promise<void> {
  await execute("INSERT IGNORE INTO invoice_sequences (series, last_number) VALUES (?, 0)", {
    replacements: [invoiceSeries(prefix, year)],
  });
}

/** The next number of the series, taken in the caller's transaction. */
export async function takeInvoiceNumber(prefix: string, year: number, transaction: Transaction): Promise<string> {
  const series = invoiceSeries(prefix, year);
  // Normally created by ensureInvoiceSeries; a send that crosses midnight on New Year's Eve creates it here.
  await execute("INSERT IGNORE INTO invoice_sequences (series, last_number) VALUES (?, 0)", { replacements: [series], transaction });
  const row = await selectOne<{ last_number: number }>("SELECT last_number FROM invoice_sequences WHERE series = ? FOR UPDATE", {
    replacements: [series],
    transaction,
  });
  const next = (row?.last_number ?? 0) + 1;
  await execute("UPDATE invoice_sequences SET last_number = ? WHERE series = ?", { replacements: [next, series], transaction });
  return invoiceNumber(prefix, year, next);
}
