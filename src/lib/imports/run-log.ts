/**
 * Decant's run-log CSV format ("run log, version 1"): one row per sequence run on an instrument.
 * The header row names the columns (any order, case-insensitive). Row numbers in messages count
 * the header as row 1, as a spreadsheet shows them. Pure: used by the browser preview and the
 * server alike; the server adds the checks that need the database (names, codes, batches).
 */
import { z } from "zod";
import { amount, CHANNELS, instant, wholeNumber } from "../schemas/fields";
import { csvField, CsvError, parseCsv } from "./csv";

export interface RunLogColumn {
  name: string;
  required: boolean;
  description: string;
  example: string;
}

export const RUN_LOG_COLUMNS: readonly RunLogColumn[] = [
  {
    name: "run_reference",
    required: true,
    description:
      "The sequence's name on the instrument; unique per instrument. A row whose instrument and run reference are already recorded is recognised and skipped.",
    example: "SEQ-2611-014",
  },
  { name: "instrument", required: true, description: "The instrument's name as in Decant.", example: "Wren" },
  { name: "method", required: true, description: "The method's name as in Decant.", example: "Scout gradient 5–95 % B, 12 min" },
  { name: "project", required: true, description: "The project code.", example: "PMG-ROOT-26" },
  {
    name: "started_at",
    required: true,
    description: "Start time, ISO 8601 (YYYY-MM-DDTHH:MM, UTC unless a zone such as +01:00 is given).",
    example: "2026-11-03T09:15",
  },
  {
    name: "injections",
    required: true,
    description: "Sample injections (whole number, 1 or more); each runs the whole program.",
    example: "24",
  },
  { name: "blanks", required: false, description: "Extra blank injections (whole number; empty means 0).", example: "2" },
  { name: "purge_mL", required: false, description: "Purge or prime volume per channel in use, mL (empty means 0).", example: "5" },
  {
    name: "batch_A",
    required: false,
    description: "Code of the batch on channel A (empty when the channel is not used). Likewise batch_B, batch_C, batch_D.",
    example: "B26-1103",
  },
  { name: "batch_B", required: false, description: "Batch on channel B.", example: "B26-1104" },
  { name: "batch_C", required: false, description: "Batch on channel C.", example: "" },
  { name: "batch_D", required: false, description: "Batch on channel D.", example: "" },
  {
    name: "operator",
    required: false,
    description: "E-mail of the Decant user who ran it (empty: the person importing).",
    example: "tech@demo.test",
  },
];

export const RUN_LOG_HEADER = RUN_LOG_COLUMNS.map((c) => c.name);
/** Largest file accepted, bytes (50,000 rows of this format take about 6 MB). */
export const RUN_LOG_MAX_BYTES = 16 * 1024 * 1024;
export const RUN_LOG_MAX_ROWS = 100_000;

/** The downloadable template: the header and one example row. */
export function runLogTemplate(): string {
  return `${RUN_LOG_HEADER.join(",")}\r\n${RUN_LOG_COLUMNS.map((c) => csvField(c.example)).join(",")}\r\n`;
}

const text = (column: string, max: number) =>
  z.string().trim().min(1, `${column} is empty`).max(max, `${column} is longer than ${max} characters`);
const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `is longer than ${max} characters`)
    .transform((v) => (v === "" ? null : v));

const rowSchema = z.object({
  run_reference: text("run_reference", 64),
  instrument: text("instrument", 80),
  method: text("method", 120),
  project: text("project", 32),
  started_at: instant("give the start as YYYY-MM-DDTHH:MM"),
  injections: wholeNumber({ min: 1, max: 10_000 }),
  blanks: z.preprocess((v) => (v === "" ? 0 : v), wholeNumber({ min: 0, max: 10_000 })),
  purge_mL: z.preprocess((v) => (v === "" ? 0 : v), amount({ min: 0, max: 5_000 })),
  batch_A: optionalText(32),
  batch_B: optionalText(32),
  batch_C: optionalText(32),
  batch_D: optionalText(32),
  operator: optionalText(254),
});

export interface RunLogRow {
  /** Row number in the file, the header being row 1. */
  row: number;
  reference: string;
  instrument: string;
  method: string;
  project: string;
  startedAt: Date;
  injections: number;
  blanks: number;
  purge_mL: number;
  batches: Partial<Record<(typeof CHANNELS)[number], string>>;
  operator: string | null;
}

export interface RowIssue {
  /** Row number in the file (header = 1); 1 with column null for a problem with the file itself. */
  row: number;
  column: string | null;
  message: string;
}

export interface RunLogParse {
  rows: RunLogRow[];
  issues: RowIssue[];
  /** Data rows in the file, good and bad. */
  rowCount: number;
}

const MAX_ISSUES = 1_000;

/**
 * Reads a run log and checks each row on its own (and duplicate references within the file).
 * `onProgress(done, total)` is called every `chunk` rows; the browser yields between chunks.
 */
export async function readRunLog(
  content: string,
  options: { onProgress?: (done: number, total: number) => void | Promise<void>; chunk?: number } = {},
): Promise<RunLogParse> {
  let records: { line: number; fields: string[] }[];
  try {
    records = parseCsv(content);
  } catch (error) {
    if (error instanceof CsvError) return { rows: [], issues: [{ row: error.line, column: null, message: error.message }], rowCount: 0 };
    throw error;
  }
  const header = records[0];
  if (!header)
    return {
      rows: [],
      issues: [{ row: 1, column: null, message: "The file is empty: it needs a header row and at least one run." }],
      rowCount: 0,
    };
  const names = header.fields.map((f) => f.trim().toLowerCase());
  const known = new Map(RUN_LOG_HEADER.map((n) => [n.toLowerCase(), n]));
  const issues: RowIssue[] = [];
  const unknown = names.filter((n) => !known.has(n));
  const missing = RUN_LOG_COLUMNS.filter((c) => c.required && !names.includes(c.name.toLowerCase())).map((c) => c.name);
  if (missing.length > 0 || unknown.length > 0) {
    const looksLikeCsv = header.fields.length > 1;
    const parts = [
      looksLikeCsv ? "This is not a Decant run log." : "This does not look like a CSV file with comma-separated columns.",
      missing.length ? `Missing column${missing.length > 1 ? "s" : ""}: ${missing.join(", ")}.` : "",
      unknown.length ? `Unknown column${unknown.length > 1 ? "s" : ""}: ${unknown.slice(0, 5).join(", ")}.` : "",
      "Start from the template on this page.",
    ];
    return { rows: [], issues: [{ row: 1, column: null, message: parts.filter(Boolean).join(" ") }], rowCount: records.length - 1 };
  }
  const duplicateHeader = names.find((n, i) => names.indexOf(n) !== i);
  if (duplicateHeader)
    return {
      rows: [],
      issues: [{ row: 1, column: known.get(duplicateHeader) ?? duplicateHeader, message: "This column appears twice in the header." }],
      rowCount: records.length - 1,
    };
  const dataRows = records.length - 1;
  if (dataRows === 0) return { rows: [], issues: [{ row: 1, column: null, message: "The file has a header but no runs." }], rowCount: 0 };
  if (dataRows > RUN_LOG_MAX_ROWS)
    return {
      rows: [],
      issues: [{ row: 1, column: null, message: `The file has ${dataRows} runs; import at most ${RUN_LOG_MAX_ROWS} at a time.` }],
      rowCount: dataRows,
    };

  const rows: RunLogRow[] = [];
  const seen = new Map<string, number>();
  const chunk = options.chunk ?? 2_000;
  for (let r = 1; r < records.length; r++) {
    const record = records[r]!;
    const rowNumber = r + 1;
    if (record.fields.length !== names.length) {
      issues.push({ row: rowNumber, column: null, message: `has ${record.fields.length} fields, the header has ${names.length}` });
    } else {
      const raw: Record<string, string> = {};
      names.forEach((n, i) => (raw[known.get(n)!] = record.fields[i] ?? ""));
      for (const c of RUN_LOG_COLUMNS) raw[c.name] ??= "";
      const parsed = rowSchema.safeParse(raw);
      if (!parsed.success) {
        const byColumn = new Set<string>();
        for (const issue of parsed.error.issues) {
          const column = String(issue.path[0] ?? "");
          if (byColumn.has(column)) continue;
          byColumn.add(column);
          issues.push({ row: rowNumber, column, message: issue.message });
        }
      } else {
        const v = parsed.data;
        const batches: RunLogRow["batches"] = {};
        for (const ch of CHANNELS) {
          const code = v[`batch_${ch}`];
          if (code) batches[ch] = code;
        }
        if (Object.keys(batches).length === 0)
          issues.push({ row: rowNumber, column: "batch_A", message: "name the batch on at least one channel (batch_A … batch_D)" });
        const key = `${v.instrument.toLowerCase()}\u0000${v.run_reference}`;
        const earlier = seen.get(key);
        if (earlier !== undefined)
          issues.push({ row: rowNumber, column: "run_reference", message: `the same instrument and run reference as row ${earlier}` });
        else seen.set(key, rowNumber);
        rows.push({
          row: rowNumber,
          reference: v.run_reference,
          instrument: v.instrument,
          method: v.method,
          project: v.project,
          startedAt: v.started_at,
          injections: v.injections,
          blanks: v.blanks,
          purge_mL: v.purge_mL,
          batches,
          operator: v.operator,
        });
      }
    }
    if (issues.length >= MAX_ISSUES) {
      issues.push({ row: rowNumber, column: null, message: `Stopped after ${MAX_ISSUES} problems; fix these and check again.` });
      break;
    }
    if (options.onProgress && r % chunk === 0) await options.onProgress(r, dataRows);
  }
  await options.onProgress?.(dataRows, dataRows);
  return { rows, issues, rowCount: dataRows };
}
