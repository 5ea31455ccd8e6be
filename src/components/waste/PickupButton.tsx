import { useState } from "react";
import type { PickupView } from "../../lib/waste/types";
import { errorMessage, postJson } from "../forms/post-json";
import { HydratedControls } from "../forms/island-form";

/** Requests a pickup for one or more containers, after a confirmation step with an optional note. */
export default function PickupButton({
  containerIds,
  codes,
  label = "Request pickup",
}: {
  containerIds: number[];
  codes: string[];
  label?: string;
}) {
  const [open, setOpen] = useState(false);
  const [note, setNote] = useState("");
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);

  if (done)
    return (
      <p className="text-sm text-[var(--color-ok)]" role="status">
        {done}
      </p>
    );
  if (!open) {
    return (
      <button type="button" className="btn btn-quiet text-sm" onClick={() => setOpen(true)}>
        {label}
      </button>
    );
  }
  const submit = async () => {
    setBusy(true);
    setProblem(null);
    try {
      const { pickup } = await postJson<{ pickup: PickupView }>("/api/waste/pickups", {
        containerIds,
        note: note.trim() || null,
      });
      setDone(`Pickup ${pickup.reference} requested for ${codes.join(", ")}.`);
      window.setTimeout(() => window.location.reload(), 1200);
    } catch (error) {
      setProblem(errorMessage(error));
    } finally {
      setBusy(false);
    }
  };
  return (
    <HydratedControls>
      <div className="flex flex-col gap-2" role="group" aria-label={`Request a pickup for ${codes.join(", ")}`}>
        <div className="field">
          <label htmlFor={`pickup-note-${containerIds.join("-")}`}>Note for the collector (optional)</label>
          <input
            id={`pickup-note-${containerIds.join("-")}`}
            className="input text-sm"
            value={note}
            maxLength={255}
            onChange={(e) => setNote(e.target.value)}
          />
        </div>
        {problem && (
          <p className="field-error" role="alert">
            {problem}
          </p>
        )}
        <div className="flex gap-2">
          <button type="button" className="btn text-sm" disabled={busy} onClick={submit}>
            {busy ? "Requesting…" : `Confirm pickup of ${codes.join(", ")}`}
          </button>
          <button type="button" className="btn btn-quiet text-sm" onClick={() => setOpen(false)}>
            Cancel
          </button>
        </div>
      </div>
    </HydratedControls>
  );
}
