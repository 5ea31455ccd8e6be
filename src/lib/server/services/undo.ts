/**
 * The server side of the undo pattern (`lib/undo.ts`): one refusal, worded the same everywhere,
 * when the window has passed. Ledger reversals go through `reverseEntriesWithin` (ledger.ts) in
 * the undo's own transaction.
 */
import { UNDO_WINDOW_MS, withinUndoWindow } from "../../undo";
import { HttpError } from "../http";

export function requireUndoWindow(doneAt: Date | null, what: string, correction: string, now = new Date()): void {
  if (!withinUndoWindow(doneAt, now))
    throw new HttpError(409, `undo: ${what} can be undone only within ${UNDO_WINDOW_MS / 60_000} minutes of doing it; ${correction}`, {
      fields: { undo: "the undo window has passed" },
    });
}
