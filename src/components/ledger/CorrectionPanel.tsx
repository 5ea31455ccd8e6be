import { useState } from "react";
import { errorMessage, postJson } from "../forms/post-json";
import { IslandForm } from "../forms/island-form";

/** Reverses a run's entries (never edits them): the reason and your name stay with the correction. */
export default function CorrectionPanel({ runId, open }: { runId: number; open: number }) {
  const [reason, setReason] = useState("");
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  if (open === 0) return <p className="text-sm text-[var(--color-muted)]">Every entry of this run has been reversed.</p>;
  async function submit(event: React.FormEvent) {
    event.preventDefault();
    if (reason.trim().length < 3) {
      setProblem("Say why the entries are wrong.");
      return;
    }
    setBusy(true);
    setProblem(null);
    try {
      await postJson("/api/ledger/corrections", { runId, reason });
      window.location.reload();
    } catch (error) {
      setProblem(errorMessage(error));
      setBusy(false);
    }
  }
  return (
    <IslandForm onSubmit={submit} noValidate className="flex flex-col gap-3" aria-label="Reverse this run">
      <div className="field">
        <label htmlFor="correction-reason">Why is this run wrong?</label>
        <input
          id="correction-reason"
          className="input"
          value={reason}
          onChange={(e) => setReason(e.target.value)}
          maxLength={255}
          aria-invalid={problem ? true : undefined}
        />
        <p className="text-xs text-[var(--color-muted)]">
          Reversing adds a correction for each of the {open} open entries and puts the volume back in the batches. The original entries stay
          in the ledger.
        </p>
      </div>
      {problem && (
        <p className="field-error" role="alert">
          {problem}
        </p>
      )}
      <div>
        <button className="btn btn-quiet" type="submit" disabled={busy}>
          {busy ? "Reversing…" : "Reverse this run's entries"}
        </button>
      </div>
    </IslandForm>
  );
}
