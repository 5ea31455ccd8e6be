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
                {expiry.expiresAt.toISOString().slice(0, 16).replace("T", " ")} UTC
              </dd>
            </>
          )}
        </dl>
        {expiry && <p className="mt-2 text-xs text-[var(--color-muted)]">{expiry.reason}</p>}
      </section>
      {plan.warnings.length > 0 && (
        <section className="notice text-sm" aria-labelledby="warn-heading">
          <h2 id="warn-heading" className="text-base">
            Warnings
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
          Cautions
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
