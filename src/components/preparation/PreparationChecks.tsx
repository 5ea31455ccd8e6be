import type { UseFormRegisterReturn } from "react-hook-form";
import type { Deviation } from "../../lib/preparation/deviations";
import type { BatchExpiry } from "../../lib/preparation/expiry";
import type { PreparationPlan } from "../../lib/preparation/plan";
import { fmt } from "./amounts";

/** The side panel of the preparation form: what the mix will be, its warnings and the cautions for making it. */
export function PreparationChecks({
  plan,
  detection_nm,
  expiry,
}: {
  plan: PreparationPlan;
  detection_nm: number | null;
  expiry: BatchExpiry | null;
}) {
  return (
    <>
      <section className="card p-4 text-sm" aria-labelledby="props-heading">
        <h2 id="props-heading" className="text-base">
          The mix
        </h2>
        <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-3 gap-y-1">
          <dt className="text-[var(--color-muted)]">Final volume</dt>
          <dd className="num" data-testid="final-volume">
            {fmt(plan.finalVolume_mL)} mL
          </dd>
          <dt className="text-[var(--color-muted)]">Polarity index P′</dt>
          <dd className="num">{plan.properties.polarityIndex.toFixed(2)}</dd>
          <dt className="text-[var(--color-muted)]">UV cutoff</dt>
          <dd className="num">
            {plan.properties.uvCutoff_nm} nm{detection_nm ? ` (detect at ${detection_nm} nm)` : ""}
          </dd>
          {plan.properties.viscosity_cP !== undefined && (
            <>
              <dt className="text-[var(--color-muted)]">Viscosity</dt>
              <dd className="num">{plan.properties.viscosity_cP.toFixed(2)} cP at 25 °C</dd>
            </>
          )}
          {plan.buffer && (
            <>
              <dt className="text-[var(--color-muted)]">Buffer pH</dt>
              <dd className="num">
                {plan.buffer.pH.toFixed(3)} (I = {plan.buffer.ionicStrength_mol_L.toFixed(3)} mol/L)
              </dd>
            </>
          )}
          {expiry && (
            <>
              <dt className="text-[var(--color-muted)]">Expires</dt>
              <dd className="num" data-testid="expiry-preview">
                {expiry.wording.expires}
              </dd>
              <dt className="text-[var(--color-muted)]">Shelf life from</dt>
              <dd data-testid="expiry-basis-preview">{expiry.wording.basis}</dd>
            </>
          )}
        </dl>
        {expiry && !expiry.limitedBy && <p className="mt-2 text-xs text-[var(--color-muted)]">{expiry.rule.reason}</p>}
      </section>
      {plan.warnings.length > 0 && (
        <section className="notice text-sm" aria-labelledby="warn-heading">
          <h2 id="warn-heading" className="text-base">
            Warnings about this mix
          </h2>
          <ul className="ml-4 mt-1 list-disc space-y-1" data-testid="chem-warnings">
            {plan.warnings.map((w) => (
              <li key={`${w.code}:${w.reagent ?? ""}`}>{w.message}</li>
            ))}
          </ul>
        </section>
      )}
      <section className="notice notice-danger text-sm" aria-labelledby="caution-heading">
        <h2 id="caution-heading" className="text-base">
          Cautions for making it
        </h2>
        <ul className="ml-4 mt-1 list-disc space-y-1">
          {plan.cautions.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
      </section>
    </>
  );
}

/** The order of work, generated from the components in the mix (`lib/preparation/order-of-work.ts`). */
export function OrderOfWork({ steps }: { steps: readonly string[] }) {
  return (
    <section className="card p-5" aria-labelledby="order-heading">
      <h2 id="order-heading">Order of work</h2>
      <ol className="ml-5 mt-2 list-decimal space-y-1 text-sm" data-testid="order-of-work">
        {steps.map((s) => (
          <li key={s}>{s}</li>
        ))}
      </ol>
    </section>
  );
}

/** Outside the facility's tolerances: what, and the reason the label will carry. */
export function DeviationNotice({
  deviations,
  registration,
  error,
}: {
  deviations: readonly Deviation[];
  registration: UseFormRegisterReturn;
  error: string | undefined;
}) {
  return (
    <div className="notice mt-4" role="status">
      <p className="font-medium">Outside the facility's tolerances:</p>
      <ul className="ml-5 list-disc">
        {deviations.map((d) => (
          <li key={d.field}>{d.message}</li>
        ))}
      </ul>
      <div className="field mt-3">
        <label htmlFor="prep-reason">Reason for the deviation (printed on the label)</label>
        <input
          id="prep-reason"
          className="input"
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? "prep-reason-error" : undefined}
          {...registration}
        />
        {error && (
          <p id="prep-reason-error" className="field-error" role="alert">
            {error}
          </p>
        )}
      </div>
    </div>
  );
}
