/** What a run-log import answers: the check before a commit, the commit, the list of imports. Types only. */
import type { RowIssue } from "./run-log";

export interface ImportReport {
  fileName: string;
  checksum: string;
  /** Data rows in the file. */
  rowCount: number;
  /** Rows that would be (or were) written. */
  newRuns: number;
  /** Rows whose instrument and run reference are already recorded: skipped. */
  alreadyRecorded: number;
  /** Ledger entries that would be (or were) written. */
  entries: number;
  volume_mL: number;
  issues: RowIssue[];
  /** A committed import of the very same file, if there was one. */
  previousImport: { id: number; at: string } | null;
  importId: number | null;
}

export interface ImportSummary {
  id: number;
  fileName: string;
  rowCount: number;
  status: string;
  uploadedBy: string | null;
  createdAt: string;
}
