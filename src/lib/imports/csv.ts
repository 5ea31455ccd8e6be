/**
 * A small RFC 4180 CSV reader (comma-separated, fields optionally in double quotes, "" for a
 * quote inside quotes, CRLF or LF line ends). Pure and synchronous; the same code reads a file
 * in the browser for the preview and on the server for the commit.
 */

export class CsvError extends Error {
  constructor(
    message: string,
    /** 1-based line of the file where reading failed. */
    readonly line: number,
  ) {
    super(message);
  }
}

/** Rows of fields; blank lines are skipped. Each row carries the 1-based line it started on. */
export function parseCsv(text: string): { line: number; fields: string[] }[] {
  if (text.includes("\u0000")) throw new CsvError("The file holds binary data, not text: upload a CSV file.", 1);
  const rows: { line: number; fields: string[] }[] = [];
  let i = text.charCodeAt(0) === 0xfeff ? 1 : 0; // a byte-order mark from spreadsheet exports
  let line = 1;
  const n = text.length;
  while (i < n) {
    const startLine = line;
    const fields: string[] = [];
    let endOfRow = false;
    while (!endOfRow) {
      let value = "";
      if (text[i] === '"') {
        i++;
        for (;;) {
          if (i >= n) throw new CsvError("A quoted field is not closed before the end of the file.", startLine);
          const ch = text[i]!;
          if (ch === '"') {
            if (text[i + 1] === '"') {
              value += '"';
              i += 2;
              continue;
            }
            i++;
            break;
          }
          if (ch === "\n") line++;
          value += ch;
          i++;
        }
        const next = text[i];
        if (next !== undefined && next !== "," && next !== "\n" && next !== "\r") {
          throw new CsvError("Text follows a closing quote; put the whole field in quotes.", line);
        }
      } else {
        const start = i;
        while (i < n && text[i] !== "," && text[i] !== "\n" && text[i] !== "\r") i++;
        value = text.slice(start, i);
        if (value.includes('"')) throw new CsvError("A field holds a quote but does not start with one; quote the whole field.", line);
      }
      fields.push(value);
      const sep = text[i];
      if (sep === ",") {
        i++;
      } else {
        if (sep === "\r") i++;
        if (text[i] === "\n") i++;
        line++;
        endOfRow = true;
      }
    }
    if (!(fields.length === 1 && fields[0] === "")) rows.push({ line: startLine, fields });
  }
  return rows;
}

/** Quotes a field when it needs it. */
export function csvField(value: string | number | null | undefined): string {
  const text = value == null ? "" : String(value);
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}
