import { useId, useState } from "react";
import { IslandForm } from "../forms/island-form";

/** A code field for typing or a barcode scanner (which types the code and Enter). */
export default function BatchLookup({ autoFocus = false }: { autoFocus?: boolean }) {
  const id = useId();
  const [code, setCode] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  async function open(event: React.FormEvent) {
    event.preventDefault();
    setError(null);
    if (code.trim().length < 2) return setError("Type or scan a batch code.");
    setBusy(true);
    const response = await fetch(`/api/batches/lookup?code=${encodeURIComponent(code.trim())}`);
    const data = (await response.json().catch(() => ({}))) as { href?: string; error?: string };
    setBusy(false);
    if (response.ok && data.href) window.location.assign(data.href);
    else setError(response.status === 404 ? `No batch with the code ${code.trim().toUpperCase()}.` : (data.error ?? "The look-up failed."));
  }
  return (
    <IslandForm onSubmit={open} className="flex flex-wrap items-end gap-2" role="search" aria-label="Open a batch by its code">
      <div className="field">
        <label htmlFor={id}>Batch code</label>
        <input
          id={id}
          className="input w-48 font-mono uppercase"
          value={code}
          onChange={(e) => setCode(e.target.value)}
          placeholder="Scan or type"
          autoComplete="off"
          autoFocus={autoFocus}
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? `${id}-error` : undefined}
        />
      </div>
      <button className="btn btn-quiet" type="submit" disabled={busy}>
        Open
      </button>
      {error && (
        <p id={`${id}-error`} className="field-error w-full" role="alert">
          {error}
        </p>
      )}
    </IslandForm>
  );
}
