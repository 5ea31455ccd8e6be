import { useState, type FormEvent } from "react";
import { HydratedControls } from "../forms/island-form";

/** The second step of a sign-in: the app's six digits, or one of the recovery codes. */
export default function SecondFactorForm({ next }: { next: string }) {
  const [recovery, setRecovery] = useState(false);
  const [code, setCode] = useState("");
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function submit(event: FormEvent) {
    event.preventDefault();
    setProblem(null);
    setBusy(true);
    try {
      const response = await fetch("/api/auth/two-factor", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ code }),
      });
      const body = (await response.json().catch(() => ({}))) as { error?: string; restart?: boolean };
      if (response.ok) return window.location.assign(next);
      if (body.restart) return window.location.assign(`/sign-in?next=${encodeURIComponent(next)}`);
      setProblem((body.error ?? `Checking the code failed (${response.status}).`).replace(/^code: /, ""));
      setCode("");
    } catch {
      setProblem("Decant could not be reached. Check the connection and try again.");
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4" aria-label="Two-factor code">
      <HydratedControls>
        <div className="field">
          <label htmlFor="second-factor-code">{recovery ? "Recovery code" : "Code from your authenticator app"}</label>
          <input
            id="second-factor-code"
            className="input font-mono tracking-widest"
            value={code}
            onChange={(e) => setCode(e.target.value)}
            inputMode={recovery ? "text" : "numeric"}
            autoComplete="one-time-code"
            autoCapitalize="characters"
            spellCheck={false}
            maxLength={recovery ? 24 : 8}
            placeholder={recovery ? "XXXX-XXXX-XXXX-XXXX" : "123456"}
            aria-invalid={problem ? true : undefined}
            autoFocus
          />
          <p className="text-xs text-[var(--color-muted)]">
            {recovery
              ? "Each recovery code works once. Make new ones on My account when you are in."
              : "Open the app on your phone and type the six digits it shows for Decant."}
          </p>
        </div>
        {problem && (
          <p className="notice notice-danger" role="alert">
            {problem}
          </p>
        )}
        <button className="btn justify-center" type="submit" disabled={busy || code.trim() === ""}>
          {busy ? "Checking…" : "Continue"}
        </button>
        <button
          type="button"
          className="btn-quiet btn justify-center"
          onClick={() => {
            setRecovery(!recovery);
            setCode("");
            setProblem(null);
          }}
        >
          {recovery ? "Use the code from the app" : "Use a recovery code instead"}
        </button>
      </HydratedControls>
    </form>
  );
}
