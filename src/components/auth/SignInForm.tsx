import { useEffect, useState } from "react";
import { signInSchema, type SignInInput } from "../../lib/schemas/auth";
import { Field, useZodForm } from "../forms/form";
import { IslandForm } from "../forms/island-form";

interface Props {
  next: string;
  email?: string;
  /** The idle limit of a shared-bench session, from the settings. */
  sharedBenchIdle_min: number;
}

export default function SignInForm({ next, email = "", sharedBenchIdle_min }: Props) {
  // No defaultValues: react-hook-form would then overwrite what was typed before hydration.
  const { register, handleSubmit, formState } = useZodForm<SignInInput>(signInSchema);
  const [problem, setProblem] = useState<string | null>(null);
  // While throttled, the button waits out the time the server stated (Retry-After).
  const [waitUntil, setWaitUntil] = useState<number | null>(null);
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    if (waitUntil === null) return;
    const timer = setInterval(() => {
      setNow(Date.now());
      if (Date.now() >= waitUntil) setWaitUntil(null);
    }, 1000);
    return () => clearInterval(timer);
  }, [waitUntil]);
  const secondsLeft = waitUntil === null ? 0 : Math.max(0, Math.ceil((waitUntil - now) / 1000));

  const onSubmit = handleSubmit(async (values) => {
    setProblem(null);
    try {
      const response = await fetch("/api/auth/sign-in", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify(values),
      });
      const body = (await response.json().catch(() => ({}))) as { error?: string; next?: string | null; retryAfter_s?: number };
      if (response.ok) {
        window.location.assign(body.next ? `${body.next}?next=${encodeURIComponent(next)}` : next);
        return;
      }
      if (response.status === 429) {
        const wait = Number(response.headers.get("retry-after") ?? body.retryAfter_s ?? 0);
        if (wait > 0) {
          setNow(Date.now());
          setWaitUntil(Date.now() + wait * 1000);
        }
      }
      setProblem(body.error ?? `Signing in failed (${response.status}).`);
    } catch {
      setProblem("Decant could not be reached. Check the connection and try again.");
    }
  });

  return (
    <IslandForm method="post" onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Sign in">
      <Field
        label="E-mail address"
        type="email"
        autoComplete="username"
        defaultValue={email || undefined}
        registration={register("email")}
        error={formState.errors.email?.message}
      />
      <Field
        label="Password"
        type="password"
        autoComplete="current-password"
        registration={register("password")}
        error={formState.errors.password?.message}
      />
      <label className="flex items-start gap-2 text-sm">
        <input type="checkbox" className="mt-1" {...register("sharedBench")} />
        <span>
          This is a shared bench computer
          <span className="block text-xs text-[var(--color-muted)]">
            Signs you out after {sharedBenchIdle_min} minutes without use, and when the browser is closed.
          </span>
        </span>
      </label>
      {problem && (
        <p className="notice notice-danger" role="alert">
          {problem}
        </p>
      )}
      <button className="btn justify-center" type="submit" disabled={formState.isSubmitting || secondsLeft > 0}>
        {formState.isSubmitting ? "Signing in…" : secondsLeft > 0 ? `Sign in (wait ${secondsLeft} s)` : "Sign in"}
      </button>
    </IslandForm>
  );
}
