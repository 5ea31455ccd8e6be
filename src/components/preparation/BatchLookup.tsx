import { useId, useState } from "react";
import { IslandForm } from "../forms/island-form";
import ScanButton from "../scan/ScanButton";

/** A code field for typing or a barcode scanner (which types the code and Enter). */
export default function BatchLookup({ autoFocus = false }: { autoFocus?: boolean }) {
  const id = useId();
  const [code, setCode] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  async function openCode(typed: string) {
    setError(null);
    if (typed.trim().length < 2) return setError("Type or scan a batch code.");
    setBusy(true);
    const response = await fetch(`/api/batches/lookup?code=${encodeURIComponent(typed.trim())}`);
    const data = (await response.json().catch(() => ({}))) as { href?: string; error?: string };
    setBusy(false);
    if (response.ok && data.href) window.location.assign(data.href);
    else if (response.status === 404)
      setError(
        /^B\d{2}-\d{4}(-\d+)?$/i.test(typed.trim())
          ? `No batch with the code ${typed.trim().toUpperCase()}.`
          : `${typed.trim()} is not a Decant batch code (those read like B26-1103).`,
      );
    else setError(data.error ?? "The look-up failed.");
  }
  function open(event: React.FormEvent) {
    event.preventDefault();
    void openCode(code);
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
      <ScanButton
        onCode={(scanned) => {
          setCode(scanned);
          void openCode(scanned);
        }}
      />
      {error && (
        <p id={`${id}-error`} className="field-error w-full" role="alert">
          {error}
        </p>
      )}
    </IslandForm>
  );
}
