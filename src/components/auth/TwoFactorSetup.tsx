import { useState, type FormEvent } from "react";
import type { NewKey } from "../../lib/auth/types";
import { HydratedControls } from "../forms/island-form";

interface Props {
  /** "sign-in": the set-up a role requires, during sign-in (no password again); "account": from My account. */
  mode: "sign-in" | "account";
  /** Where to go when done (sign-in mode). */
  next?: string;
}

async function post<T>(url: string, body: unknown): Promise<T> {
  const response = await fetch(url, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
  const data = (await response.json().catch(() => ({}))) as { error?: string };
  if (!response.ok) throw new Error((data.error ?? `The request failed (${response.status}).`).replace(/^(code|password): /, ""));
  return data as T;
}

/** Adds an authenticator app: QR code (drawn on the server), the first code, then the ten recovery codes, once. */
export default function TwoFactorSetup({ mode, next = "/home" }: Props) {
  const [password, setPassword] = useState("");
  const [key, setKey] = useState<NewKey | null>(null);
  const [code, setCode] = useState("");
  const [codes, setCodes] = useState<string[] | null>(null);
  const [saved, setSaved] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function run(work: () => Promise<void>) {
    setProblem(null);
    setBusy(true);
    try {
      await work();
    } catch (error) {
      setProblem(error instanceof Error ? error.message : String(error));
    } finally {
      setBusy(false);
    }
  }

  const start = (event: FormEvent) => {
    event.preventDefault();
    void run(async () => setKey(await post<NewKey>("/api/auth/two-factor/setup", mode === "account" ? { password } : {})));
  };
  const confirm = (event: FormEvent) => {
    event.preventDefault();
    void run(async () => {
      const answer = await post<{ recoveryCodes: string[] }>("/api/auth/two-factor/confirm", { code });
      setCodes(answer.recoveryCodes);
    });
  };
  const finish = () => (mode === "sign-in" ? window.location.assign(next) : window.location.reload());

  const alert = problem && (
    <p className="notice notice-danger" role="alert">
      {problem}
    </p>
  );

  if (codes) {
    const text = `Decant recovery codes\nEach code works once, in place of the code from your app.\n\n${codes.join("\n")}\n`;
    return (
      <section aria-label="Your recovery codes" className="flex flex-col gap-3">
        <p className="notice border-l-[var(--color-ok)] bg-[var(--color-ok-wash)]" role="status">
          Two-factor sign-in is on.
        </p>
        <p className="text-sm">
          If your phone is lost or replaced, each of these codes lets you in once instead of a code from the app. They are shown only now:
          keep them where only you can reach them (a password manager, or printed and locked away). Anyone with one of them and your
          password can sign in as you.
        </p>
        <ol className="grid gap-x-6 gap-y-1 whitespace-nowrap font-mono text-sm sm:grid-cols-2" data-testid="recovery-codes">
          {codes.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ol>
        <div className="flex flex-wrap gap-2">
          <a
            className="btn-quiet btn"
            href={`data:text/plain;charset=utf-8,${encodeURIComponent(text)}`}
            download="decant-recovery-codes.txt"
          >
            Download as a text file
          </a>
          <button type="button" className="btn-quiet btn" onClick={() => void navigator.clipboard?.writeText(text)}>
            Copy
          </button>
        </div>
        <label className="flex items-center gap-2 text-sm">
          <input type="checkbox" checked={saved} onChange={(e) => setSaved(e.target.checked)} />I have saved these codes
        </label>
        <div>
          <button type="button" className="btn" disabled={!saved} onClick={finish}>
            {mode === "sign-in" ? "Continue to Decant" : "Done"}
          </button>
        </div>
      </section>
    );
  }

  if (key) {
    const { size, path } = key.qr;
    return (
      <form onSubmit={confirm} noValidate className="flex flex-col gap-4" aria-label="Confirm the authenticator app">
        <HydratedControls>
          <ol className="list-decimal space-y-3 pl-5 text-sm">
            <li>
              In an authenticator app on your phone, add an account by scanning this code.
              <svg
                viewBox={`-4 -4 ${size + 8} ${size + 8}`}
                width="208"
                height="208"
                role="img"
                aria-label="QR code for your authenticator app"
                data-testid="totp-qr"
                className="mt-2 block border border-[var(--color-rule)] bg-white"
                shapeRendering="crispEdges"
              >
                <rect x="-4" y="-4" width={size + 8} height={size + 8} fill="#ffffff" />
                <path d={path} fill="#000000" />
              </svg>
              <details className="mt-2">
                <summary className="cursor-pointer text-[var(--color-teal)]">Cannot scan? Type the key instead</summary>
                <p className="mt-1">
                  Key (time-based, 6 digits, 30 seconds):{" "}
                  <code className="font-mono" data-testid="totp-secret">
                    {key.secret}
                  </code>
                </p>
              </details>
            </li>
            <li>Type the six digits the app now shows for Decant.</li>
          </ol>
          <div className="field max-w-48">
            <label htmlFor="totp-first-code">Code from the app</label>
            <input
              id="totp-first-code"
              className="input font-mono tracking-widest"
              inputMode="numeric"
              autoComplete="one-time-code"
              maxLength={8}
              value={code}
              onChange={(e) => setCode(e.target.value)}
            />
          </div>
          {alert}
          <div>
            <button className="btn" type="submit" disabled={busy || code.trim() === ""}>
              {busy ? "Checking…" : "Turn on two-factor sign-in"}
            </button>
          </div>
        </HydratedControls>
      </form>
    );
  }

  return (
    <form onSubmit={start} noValidate className="flex max-w-sm flex-col gap-4" aria-label="Set up two-factor sign-in">
      <HydratedControls>
        {mode === "account" && (
          <div className="field">
            <label htmlFor="totp-password">Your password</label>
            <input
              id="totp-password"
              className="input"
              type="password"
              autoComplete="current-password"
              value={password}
              onChange={(e) => setPassword(e.target.value)}
            />
            <p className="text-xs text-[var(--color-muted)]">Asked again so that a browser left open cannot add someone else's phone.</p>
          </div>
        )}
        {alert}
        <div>
          <button className="btn" type="submit" disabled={busy || (mode === "account" && password === "")}>
            {busy ? "Preparing…" : "Set up with an authenticator app"}
          </button>
        </div>
      </HydratedControls>
    </form>
  );
}
