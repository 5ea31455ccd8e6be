/**
 * Writing CSV (RFC 4180): fields with a comma, quote or line break go in double quotes, a quote
 * doubled. A field a spreadsheet would run as a formula (=, +, -, @ first) gets a leading
 * apostrophe, so an exported name cannot execute; numbers are left as they are.
 */

export type CsvValue = string | number | null | undefined;

function field(value: CsvValue): string {
  if (value === null || value === undefined) return "";
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : "";
  const guarded = /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
  return /[",\r\n]/.test(guarded) ? `"${guarded.replace(/"/g, '""')}"` : guarded;
}

/** One CSV line, ended with CRLF. */
export function csvLine(values: readonly CsvValue[]): string {
  return `${values.map(field).join(",")}\r\n`;
}
