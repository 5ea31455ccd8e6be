import { useState } from "react";
import { ROLE_LABELS, ROLES } from "../../lib/permissions";
import { DEFAULT_SIGN_IN_SETTINGS, signInSettingsSchema, type SignInSettings } from "../../lib/schemas/sign-in-settings";
import { Field, useZodForm } from "../forms/form";
import { IslandForm } from "../forms/island-form";
import { postJson } from "../forms/post-json";

type Path = Parameters<ReturnType<typeof useZodForm<SignInSettings>>["register"]>[0];

const RATE_LABELS: Record<keyof SignInSettings["rateLimits"], string> = {
  "label-pdf": "Label PDFs (bottles, waste containers)",
  "statement-pdf": "Statement PDFs",
  import: "Run-log imports",
  export: "Exports (statement and journal CSV, waste reports)",
};

/** The administrator's sign-in, session and rate-limit settings, each with its default beside it. */
export default function SignInSettingsForm({ initial }: { initial: SignInSettings }) {
  const { register, handleSubmit, formState, setValue } = useZodForm<SignInSettings>(signInSettingsSchema, { defaultValues: initial });
  const [problem, setProblem] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const errors = formState.errors as Record<string, Record<string, { message?: string } | Record<string, { message?: string }>>>;
  const errorOf = (path: string) => {
    const [a, b, c] = path.split(".");
    const node = errors[a!]?.[b!] as Record<string, { message?: string }> | { message?: string } | undefined;
    return (
      (c ? (node as Record<string, { message?: string }> | undefined)?.[c]?.message : (node as { message?: string })?.message) ?? undefined
    );
  };
  const defaultOf = (path: string) =>
    path.split(".").reduce<unknown>((v, k) => (v as Record<string, unknown>)?.[k], DEFAULT_SIGN_IN_SETTINGS);
  const number = (path: Path, label: string, unit: string) => (
    <Field
      label={label}
      type="number"
      inputMode="numeric"
      registration={register(path)}
      error={errorOf(path)}
      hint={`${unit}; default ${String(defaultOf(path))}`}
    />
  );

  const onSubmit = handleSubmit(async (values) => {
    setProblem(null);
    setSaved(false);
    try {
      await postJson("/api/settings/sign-in", values, "PUT");
      setSaved(true);
    } catch (error) {
      setProblem(error instanceof Error ? error.message : String(error));
    }
  });

  return (
    <IslandForm method="post" onSubmit={onSubmit} noValidate className="flex max-w-3xl flex-col gap-6" aria-label="Sign-in settings">
      <section className="card p-5" aria-labelledby="sessions-settings">
        <h2 id="sessions-settings" className="mb-3">
          Sessions
        </h2>
        <div className="grid gap-4 sm:grid-cols-3">
          {number("sessions.idle_min", "Idle limit", "minutes without use")}
          {number("sessions.absolute_days", "Absolute lifetime", "days after sign-in")}
          {number("sessions.sharedBenchIdle_min", "Shared bench computer", "minutes without use")}
        </div>
        <p className="mt-3 text-sm text-[var(--color-muted)]">
          People tick "shared bench computer" when they sign in; those sessions use the short limit and end with the browser.{" "}
          <button type="button" className="text-[var(--color-teal)] underline" onClick={() => setValue("sessions.idle_min", 15)}>
            Use 15 minutes for every session
          </button>{" "}
          where all computers are shared.
        </p>
        <fieldset className="mt-4">
          <legend className="text-sm font-medium">Two-factor sign-in required for</legend>
          <div className="mt-2 flex flex-wrap gap-4 text-sm">
            {ROLES.map((role) => (
              <label key={role} className="flex items-center gap-2">
                <input type="checkbox" value={role} {...register("sessions.twoFactorRoles")} />
                {ROLE_LABELS[role]}
              </label>
            ))}
          </div>
          <p className="mt-2 text-xs text-[var(--color-muted)]">
            Facility managers and administrators handle money and people's accounts. Someone in a ticked role who has not set it up is led
            to the set-up at their next page, and cannot open Decant until it is done.
          </p>
        </fieldset>
      </section>

      <section className="card p-5" aria-labelledby="throttle-settings">
        <h2 id="throttle-settings" className="mb-1">
          Wrong passwords
        </h2>
        <p className="mb-4 text-sm text-[var(--color-muted)]">
          Following NIST SP 800-63B (at most 100 failures on an account, delays rather than lockout) and OWASP's device cookies: a browser
          that has signed in to an account before is judged on its own failures only, so attempts from elsewhere cannot keep its owner out.
        </p>
        <div className="grid gap-4 sm:grid-cols-2">
          {number("throttle.pairFailures", "One account from one address: pause after", "failures")}
          {number("throttle.pairWindow_min", "… within", "minutes")}
          {number("throttle.accountDelayAfter", "One account: delays start after", "failures (1 s, doubling)")}
          {number("throttle.accountMaxDelay_s", "… longest delay", "seconds")}
          {number("throttle.accountBlockFailures", "One account: new browsers refused after", "failures (at most 100)")}
          {number("throttle.accountWindow_min", "… within", "minutes")}
          {number("throttle.addressFailures", "One address, all accounts: pause after", "failures")}
          {number("throttle.addressWindow_min", "… within", "minutes")}
          {number("throttle.deviceFailures", "A known browser: pause after", "failures")}
          {number("throttle.deviceWindow_min", "… within", "minutes")}
        </div>
      </section>

      <section className="card p-5" aria-labelledby="rate-settings">
        <h2 id="rate-settings" className="mb-1">
          Heavy requests, per person
        </h2>
        <p className="mb-4 text-sm text-[var(--color-muted)]">
          Beyond the burst, a request waits for the per-minute allowance and is answered "too many requests" with the wait, so one person
          cannot slow Decant down for everyone.
        </p>
        <div className="grid gap-4 sm:grid-cols-2">
          {(Object.keys(RATE_LABELS) as (keyof typeof RATE_LABELS)[]).flatMap((kind) => [
            <div key={`${kind}-b`}>{number(`rateLimits.${kind}.burst` as Path, `${RATE_LABELS[kind]}: at once`, "requests")}</div>,
            <div key={`${kind}-m`}>{number(`rateLimits.${kind}.perMinute` as Path, "… then per minute", "requests")}</div>,
          ])}
        </div>
      </section>

      {problem && (
        <p className="notice notice-danger" role="alert">
          {problem}
        </p>
      )}
      {saved && (
        <p className="notice border-l-[var(--color-ok)] bg-[var(--color-ok-wash)]" role="status">
          Saved. The new limits apply from the next request.
        </p>
      )}
      <div>
        <button className="btn" type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? "Saving…" : "Save settings"}
        </button>
      </div>
    </IslandForm>
  );
}
