import { useState, type FormEvent } from "react";
import type { TwoFactorView } from "../../lib/auth/types";
import { formatLabelInstant } from "../../lib/format";
import TwoFactorSetup from "../auth/TwoFactorSetup";
import { HydratedControls } from "../forms/island-form";

type Action = "codes" | "off";

/** Two-factor sign-in on My account: set it up, or (when on) new recovery codes and turning it off. */
export default function TwoFactorPanel({ view, timeZone }: { view: TwoFactorView; timeZone: string }) {
  const [action, setAction] = useState<Action | null>(null);
  const [password, setPassword] = useState("");
  const [codes, setCodes] = useState<string[] | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  if (!view.enabled) {
    return (
      <div className="flex flex-col gap-3">
        {view.required ? (
          <p className="notice" role="status">
            Your role must sign in with two-factor. Set it up now; until then, Decant opens only this step.
          </p>
        ) : (
          <p className="text-sm">
            With two-factor on, signing in needs a six-digit code from an app on your phone as well as your password, so a guessed or leaked
            password alone does not open your account.
          </p>
        )}
        <TwoFactorSetup mode="account" />
      </div>
    );
  }

  async function submit(event: FormEvent) {
    event.preventDefault();
    setProblem(null);
    setBusy(true);
    try {
      const response = await fetch(action === "off" ? "/api/account/two-factor" : "/api/account/recovery-codes", {
        method: action === "off" ? "DELETE" : "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ password }),
      });
      const body = (await response.json().catch(() => ({}))) as { error?: string; recoveryCodes?: string[] };
      if (!response.ok) throw new Error((body.error ?? `The request failed (${response.status}).`).replace(/^password: /, ""));
      if (action === "off") window.location.reload();
      else setCodes(body.recoveryCodes ?? []);
      setPassword("");
    } catch (error) {
      setProblem(error instanceof Error ? error.message : String(error));
    } finally {
      setBusy(false);
    }
  }

  return (
    <div className="flex flex-col gap-3 text-sm">
      <p data-testid="two-factor-state">
        <span className="tag">On</span> since {view.enabledAt ? formatLabelInstant(view.enabledAt, timeZone) : "—"}.{" "}
        {view.recoveryCodesLeft} of 10 recovery codes left.
      </p>
      {view.recoveryCodesLeft <= 3 && !codes && (
        <p className="notice" role="status">
          Few recovery codes are left: make new ones, and keep them safe.
        </p>
      )}
      {codes && (
        <div className="notice border-l-[var(--color-ok)] bg-[var(--color-ok-wash)]" role="status">
          <p className="mb-2">New recovery codes; the earlier ones no longer work. They are shown only now:</p>
          <ol className="grid gap-x-6 whitespace-nowrap font-mono sm:grid-cols-2" data-testid="recovery-codes">
            {codes.map((c) => (
              <li key={c}>{c}</li>
            ))}
          </ol>
        </div>
      )}
      <HydratedControls>
        <div className="flex flex-wrap gap-2">
          <button type="button" className="btn-quiet btn" onClick={() => setAction(action === "codes" ? null : "codes")}>
            New recovery codes
          </button>
          <button type="button" className="btn-quiet btn" onClick={() => setAction(action === "off" ? null : "off")}>
            Turn off two-factor sign-in
          </button>
        </div>
        {action && (
          <form
            onSubmit={submit}
            noValidate
            className="flex max-w-sm flex-col gap-3"
            aria-label={action === "off" ? "Turn off two-factor" : "New recovery codes"}
          >
            {action === "off" && (
              <p>
                {view.required
                  ? "Your role must use two-factor: you will be asked to set it up again at once (this is how you move it to a new phone)."
                  : "Signing in will need only your password again."}
              </p>
            )}
            <div className="field">
              <label htmlFor="two-factor-password">Your password</label>
              <input
                id="two-factor-password"
                className="input"
                type="password"
                autoComplete="current-password"
                value={password}
                onChange={(e) => setPassword(e.target.value)}
              />
            </div>
            {problem && (
              <p className="notice notice-danger" role="alert">
                {problem}
              </p>
            )}
            <div>
              <button className="btn" type="submit" disabled={busy || password === ""}>
                {action === "off" ? "Turn off" : "Make ten new codes"}
              </button>
            </div>
          </form>
        )}
      </HydratedControls>
    </div>
  );
}
