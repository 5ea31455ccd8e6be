/**
 * The undo window: an action that writes to the ledger or ends something (discard, mark empty,
 * deactivate a person) can be taken back for a short while after it was done. Taking it back on
 * the ledger is a reversing entry (kind "correction", linked to what it reverses), never a delete.
 * Pure, shared by the services that check the window and the islands that count it down.
 */
export const UNDO_WINDOW_MS = 2 * 60_000;

/** What a service answers after an undoable action: until when, and what undoing it does. */
export interface UndoOffer {
  /** ISO instant after which the server refuses the undo. */
  until: string;
  /** "Puts 500 mL back into B26-1204 with a reversing ledger entry." */
  effect: string;
}

export function undoUntil(doneAt: Date): Date {
  return new Date(doneAt.getTime() + UNDO_WINDOW_MS);
}

export function withinUndoWindow(doneAt: Date | null, now = new Date()): boolean {
  return doneAt !== null && now.getTime() < undoUntil(doneAt).getTime();
}
