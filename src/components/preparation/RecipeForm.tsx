import { lazy, Suspense, useState } from "react";
import { useFieldArray } from "react-hook-form";
import type { RecipeChoices } from "../../lib/preparation/recipe-choices";
import type { RecipeInput } from "../../lib/schemas/recipes";
import { LoadBoundary } from "../common/LoadBoundary";
import { Field, useZodForm } from "../forms/form";
import { IslandForm } from "../forms/island-form";
import { postJson } from "../forms/post-json";
import { useServerErrors } from "../forms/server-errors";

// The chemistry behind the preview, the reagent catalogue and zod would take the page past its
// JavaScript budget: they load after the form is up (the preview) or at its first check (the schema).
const RecipePreview = lazy(() => import("./RecipePreview"));
const loadRecipeSchema = () => import("../../lib/schemas/recipes").then((m) => m.recipeInputSchema);

interface Props {
  /** Reagents and units the lists offer, from the catalogue (`recipeChoices()` on the page). */
  choices: RecipeChoices;
  recipeId?: number;
  initial?: RecipeInput;
  /** The latest version is approved or used: saving makes a new version. */
  makesNewVersion?: boolean;
}

const EMPTY: RecipeInput = {
  name: "",
  code: undefined,
  channel: "A",
  detection_nm: 254,
  storage: "Room temperature, capped",
  notes: "",
  spec: { solvents: [{ reagent: "water", percent: 100 }], additives: [], labile: false },
};

export default function RecipeForm({ choices, recipeId, initial, makesNewVersion = false }: Props) {
  const form = useZodForm<RecipeInput>(loadRecipeSchema, { defaultValues: initial ?? EMPTY });
  const { register, control, handleSubmit, watch, setValue, formState } = form;
  const showServerError = useServerErrors(form);
  const solvents = useFieldArray({ control, name: "spec.solvents" });
  const additives = useFieldArray({ control, name: "spec.additives" });
  const [problem, setProblem] = useState<string | null>(null);
  const [saving, setSaving] = useState(false);
  const spec = watch("spec");
  const hasBuffer = Boolean(spec.buffer);
  const errors = formState.errors;

  const onSubmit = handleSubmit(async (values) => {
    setProblem(null);
    setSaving(true);
    try {
      const result = recipeId
        ? await postJson<{ recipe: { id: number } }>(`/api/recipes/${recipeId}`, values, "PUT")
        : await postJson<{ recipe: { id: number } }>("/api/recipes", values);
      window.location.assign(`/recipes/${result.recipe.id}?saved=1`);
    } catch (e) {
      setProblem(showServerError(e));
      setSaving(false);
    }
  });

  return (
    <IslandForm onSubmit={onSubmit} noValidate className="grid gap-6 xl:grid-cols-[minmax(0,1fr)_22rem]">
      <div className="grid gap-6">
        <section className="card grid gap-4 p-5 sm:grid-cols-2">
          <div className="sm:col-span-2">
            <Field
              label="Name"
              registration={register("name")}
              error={errors.name?.message}
              placeholder="e.g. 10 mM ammonium formate, pH 3.5"
            />
          </div>
          <Field
            label="Code (optional)"
            registration={register("code")}
            error={errors.code?.message}
            hint="Made from the name when left empty"
          />
          <div className="field">
            <label htmlFor="recipe-channel">Usual channel</label>
            <select id="recipe-channel" className="input" {...register("channel")}>
              <option value="">none</option>
              {["A", "B", "C", "D"].map((c) => (
                <option key={c} value={c}>
                  {c}
                </option>
              ))}
            </select>
          </div>
          <Field
            label="Detection wavelength (nm)"
            inputMode="numeric"
            registration={register("detection_nm", { setValueAs: (v) => (v === "" || v === null ? null : Number(v)) })}
            error={errors.detection_nm?.message}
          />
          <Field label="Storage" registration={register("storage")} error={errors.storage?.message} />
        </section>

        <section className="card p-5" aria-labelledby="solvents-heading">
          <h2 id="solvents-heading">Solvents (% v/v, measured separately)</h2>
          {errors.spec?.solvents?.message && (
            <p className="field-error" role="alert">
              {errors.spec.solvents.message}
            </p>
          )}
          {errors.spec?.solvents?.root?.message && (
            <p className="field-error" role="alert">
              {errors.spec.solvents.root.message}
            </p>
          )}
          <div className="mt-3 grid gap-2">
            {solvents.fields.map((f, i) => (
              <div key={f.id} className="flex flex-wrap items-end gap-2">
                <div className="field min-w-48 flex-1">
                  <label htmlFor={`solvent-${i}`}>Solvent {i + 1}</label>
                  <select id={`solvent-${i}`} className="input" {...register(`spec.solvents.${i}.reagent` as const)}>
                    {choices.solvents.map((r) => (
                      <option key={r.id} value={r.id}>
                        {r.name}
                      </option>
                    ))}
                  </select>
                </div>
                <div className="field w-28">
                  <label htmlFor={`solvent-pct-${i}`}>%</label>
                  <input
                    id={`solvent-pct-${i}`}
                    className="input"
                    inputMode="decimal"
                    {...register(`spec.solvents.${i}.percent` as const, { valueAsNumber: true })}
                  />
                </div>
                {solvents.fields.length > 1 && (
                  <button type="button" className="btn btn-quiet" onClick={() => solvents.remove(i)}>
                    Remove
                  </button>
                )}
              </div>
            ))}
          </div>
          {solvents.fields.length < 4 && (
            <button type="button" className="btn btn-quiet mt-3" onClick={() => solvents.append({ reagent: "acetonitrile", percent: 0 })}>
              Add a solvent
            </button>
          )}
        </section>

        <section className="card p-5" aria-labelledby="buffer-heading">
          <div className="flex items-center justify-between gap-3">
            <h2 id="buffer-heading">Buffer (in the aqueous part)</h2>
            <label className="flex items-center gap-2 text-sm">
              <input
                type="checkbox"
                checked={hasBuffer}
                onChange={(e) =>
                  setValue(
                    "spec.buffer",
                    e.target.checked
                      ? {
                          reagents: ["ammonium-formate", "formic-acid"],
                          targetPH: 3.5,
                          concentration_mM: 10,
                          basis: "first",
                          temperature_C: 25,
                        }
                      : undefined,
                    { shouldValidate: formState.isSubmitted },
                  )
                }
              />
              With a buffer
            </label>
          </div>
          {hasBuffer && (
            <div className="mt-3 grid gap-3 sm:grid-cols-2">
              {[0, 1].map((k) => (
                <div key={k} className="field">
                  <label htmlFor={`buffer-${k}`}>
                    {k === 0 ? "First reagent (fixed concentration)" : "Second reagent (conjugate or titrant)"}
                  </label>
                  <select id={`buffer-${k}`} className="input" {...register(k === 0 ? "spec.buffer.reagents.0" : "spec.buffer.reagents.1")}>
                    {choices.solutes.map((r) => (
                      <option key={r.id} value={r.id}>
                        {r.name}
                      </option>
                    ))}
                  </select>
                </div>
              ))}
              <Field
                label="Target pH"
                inputMode="decimal"
                registration={register("spec.buffer.targetPH", { valueAsNumber: true })}
                error={errors.spec?.buffer?.targetPH?.message}
              />
              <Field
                label="Concentration (mM)"
                inputMode="decimal"
                registration={register("spec.buffer.concentration_mM", { valueAsNumber: true })}
                error={errors.spec?.buffer?.concentration_mM?.message}
              />
              <div className="field">
                <label htmlFor="buffer-basis">Concentration refers to</label>
                <select id="buffer-basis" className="input" {...register("spec.buffer.basis")}>
                  <option value="first">the first reagent; the second is solved for</option>
                  <option value="total">the total of the acid–base pair</option>
                </select>
              </div>
              <Field
                label="pH set at (°C)"
                inputMode="decimal"
                registration={register("spec.buffer.temperature_C", { valueAsNumber: true })}
                error={errors.spec?.buffer?.temperature_C?.message}
              />
            </div>
          )}
          {errors.spec?.buffer?.message && (
            <p className="field-error" role="alert">
              {errors.spec.buffer.message}
            </p>
          )}
        </section>

        <section className="card p-5" aria-labelledby="additives-heading">
          <h2 id="additives-heading">Additives (per litre of the finished mix)</h2>
          <div className="mt-3 grid gap-2">
            {additives.fields.map((f, i) => (
              <div key={f.id} className="flex flex-wrap items-end gap-2">
                <div className="field min-w-48 flex-1">
                  <label htmlFor={`additive-${i}`}>Additive {i + 1}</label>
                  <select id={`additive-${i}`} className="input" {...register(`spec.additives.${i}.reagent` as const)}>
                    {choices.solutes.map((r) => (
                      <option key={r.id} value={r.id}>
                        {r.name}
                      </option>
                    ))}
                  </select>
                </div>
                <div className="field w-24">
                  <label htmlFor={`additive-amt-${i}`}>Amount</label>
                  <input
                    id={`additive-amt-${i}`}
                    className="input"
                    inputMode="decimal"
                    {...register(`spec.additives.${i}.amount` as const, { valueAsNumber: true })}
                  />
                </div>
                <div className="field w-28">
                  <label htmlFor={`additive-unit-${i}`}>Unit</label>
                  <select id={`additive-unit-${i}`} className="input" {...register(`spec.additives.${i}.unit` as const)}>
                    {choices.additiveUnits.map((u) => (
                      <option key={u} value={u}>
                        {u}
                      </option>
                    ))}
                  </select>
                </div>
                <button type="button" className="btn btn-quiet" onClick={() => additives.remove(i)}>
                  Remove
                </button>
              </div>
            ))}
          </div>
          <button
            type="button"
            className="btn btn-quiet mt-3"
            onClick={() => additives.append({ reagent: "formic-acid", amount: 0.1, unit: "%v/v" })}
          >
            Add an additive
          </button>
          <label className="mt-4 flex items-center gap-2 text-sm">
            <input type="checkbox" {...register("spec.labile")} /> Contains something that degrades within a day (shortest expiry rule)
          </label>
        </section>

        <section className="card p-5">
          <div className="field">
            <label htmlFor="recipe-notes">Notes</label>
            <textarea id="recipe-notes" className="input min-h-24" {...register("notes")} />
          </div>
        </section>
      </div>

      <aside className="grid content-start gap-4">
        <section className="card p-4 text-sm">
          <h2 className="text-base">In words</h2>
          <LoadBoundary fallback={<p className="field-error mt-1">The preview could not be loaded; the recipe can still be saved.</p>}>
            <Suspense
              fallback={
                <p className="mt-1 text-[var(--color-muted)]" role="status">
                  Working out the amounts…
                </p>
              }
            >
              <RecipePreview spec={spec} detection_nm={Number(watch("detection_nm")) || null} />
            </Suspense>
          </LoadBoundary>
        </section>
        {makesNewVersion && (
          <p className="notice text-sm">
            This recipe's latest version is approved or in use: saving makes a new version, which a manager approves before batches are made
            from it. Batches already made keep their version.
          </p>
        )}
        {problem && (
          <p className="notice notice-danger" role="alert">
            {problem}
          </p>
        )}
        <button type="submit" className="btn justify-center" disabled={saving}>
          {saving ? "Saving…" : recipeId ? (makesNewVersion ? "Save as a new version" : "Save changes") : "Create the recipe"}
        </button>
      </aside>
    </IslandForm>
  );
}
