/**
 * The one pattern for an action that writes to the ledger or ends something (discard, mark empty,
 * void, write off, deactivate a person, collect a pickup):
 *
 *   <ConfirmAction label="Discard" tone="danger" title="Discard bottle 2 of B26-1204?"
 *     consequences={["480 mL go to waste as discard entries in the ledger", "The batch keeps 1520 mL"]}
 *     confirmLabel="Discard 480 mL" onConfirm={async () => { … }} />
 *
 * opens a modal confirmation that says what will happen in numbers (`consequences`; `children` for
 * an input such as the volume left), runs `onConfirm` (an error it throws stays in the dialog), and
 * closes. Where the ledger allows it the service answers an `UndoOffer` (`lib/undo.ts`) and the
 * island shows `<UndoNotice>` until it runs out: undoing is a reversing entry, shown as such.
 */
import { useEffect, useId, useRef, useState, type ReactNode } from "react";
import type { UndoOffer } from "../../lib/undo";
import { errorMessage } from "../forms/post-json";

export interface ConfirmActionProps {
  /** The button that opens the confirmation. */
  label: string;
  /** Accessible name of that button when `label` alone is ambiguous ("Discard bottle 2"). */
  ariaLabel?: string;
  tone?: "danger" | "quiet";
  title: string;
  /** What will happen, in numbers, one line each. */
  consequences: readonly string[];
  /** The confirming button says the action and its size: "Discard 480 mL". */
  confirmLabel: string;
  /** A caution or the rule that applies (SOPs, waste rules). */
  caution?: string;
  disabled?: boolean;
  buttonClassName?: string;
  onConfirm: () => Promise<void>;
  children?: ReactNode;
}

export function ConfirmAction(props: ConfirmActionProps) {
  const dialog = useRef<HTMLDialogElement>(null);
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const titleId = useId();
  const close = () => {
    setProblem(null);
    dialog.current?.close();
  };
  async function confirm() {
    setBusy(true);
    setProblem(null);
    try {
      await props.onConfirm();
      dialog.current?.close();
    } catch (error) {
      setProblem(errorMessage(error));
    } finally {
      setBusy(false);
    }
  }
  const danger = props.tone === "danger";
  return (
    <>
      <button
        type="button"
        className={props.buttonClassName ?? `btn btn-quiet py-1 ${danger ? "text-[var(--color-danger)]" : ""}`}
        aria-label={props.ariaLabel}
        aria-haspopup="dialog"
        disabled={props.disabled || busy}
        onClick={() => dialog.current?.showModal()}
      >
        {props.label}
      </button>
      <dialog ref={dialog} className="confirm-dialog" aria-labelledby={titleId} onClose={() => setProblem(null)}>
        <h2 id={titleId} className="text-base">
          {props.title}
        </h2>
        <ul className="mt-3 ml-5 list-disc space-y-1 text-sm" data-testid="confirm-consequences">
          {props.consequences.map((line) => (
            <li key={line}>{line}</li>
          ))}
        </ul>
        {props.children && <div className="mt-3">{props.children}</div>}
        {props.caution && <p className="mt-3 text-xs text-[var(--color-ink-soft)]">{props.caution}</p>}
        {problem && (
          <p className="notice notice-danger mt-3" role="alert">
            {problem}
          </p>
        )}
        <div className="mt-4 flex flex-wrap justify-end gap-2">
          <button type="button" className="btn btn-quiet" onClick={close} disabled={busy}>
            Cancel
          </button>
          <button type="button" className={`btn ${danger ? "btn-danger" : ""}`} onClick={confirm} disabled={busy}>
            {busy ? "Working…" : props.confirmLabel}
          </button>
        </div>
      </dialog>
    </>
  );
}

function secondsLeft(until: string, now: number): number {
  return Math.max(0, Math.ceil((Date.parse(until) - now) / 1000));
}

/**
 * "Bottle 2 discarded: 480 mL to waste. [Undo] 1:54 left", counting down to the server's `until`;
 * gone when the window closes. After an undo the caller shows what the reversal did.
 */
export function UndoNotice({ done, offer, onUndo }: { done: string; offer: UndoOffer; onUndo: () => Promise<void> }) {
  const [now, setNow] = useState(() => Date.now());
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  useEffect(() => {
    const timer = window.setInterval(() => setNow(Date.now()), 1000);
    return () => window.clearInterval(timer);
  }, []);
  const left = secondsLeft(offer.until, now);
  if (left === 0) return null;
  async function undo() {
    setBusy(true);
    setProblem(null);
    try {
      await onUndo();
    } catch (error) {
      setProblem(errorMessage(error));
    } finally {
      setBusy(false);
    }
  }
  return (
    <div className="notice notice-ok mt-3 flex flex-wrap items-center gap-x-3 gap-y-1" role="status" data-testid="undo-notice">
      <span>{done}</span>
      <button type="button" className="btn btn-quiet py-1" onClick={undo} disabled={busy} title={offer.effect}>
        Undo
      </button>
      <span className="num text-xs text-[var(--color-muted)]">
        {Math.floor(left / 60)}:{String(left % 60).padStart(2, "0")} left · {offer.effect}
      </span>
      {problem && (
        <span className="w-full text-[var(--color-danger)]" role="alert">
          {problem}
        </span>
      )}
    </div>
  );
}
