import convert from "convert-units";
import { useEffect, useMemo, useRef, useState } from "react";
import { ChemInputError } from "../../lib/chem/warnings";
import { findDeviations, type Tolerances } from "../../lib/preparation/deviations";
import { batchExpiry, lotExpired, type ExpiryRule } from "../../lib/preparation/expiry";
import { lotChemistry } from "../../lib/preparation/lot-assays";
import { preparationPlan, type PreparationPlan } from "../../lib/preparation/plan";
import type { FormLot, FormRecipe } from "../../lib/preparation/types";
import type { BatchCreateInput } from "../../lib/schemas/preparation";
import type { PreparableRecipe, RecordedBatch } from "../../lib/preparation/types";
import { useZodForm } from "../forms/form";
import { newKey } from "../forms/idempotency-key";
import { IslandForm } from "../forms/island-form";
import { postJson } from "../forms/post-json";
import { useServerErrors } from "../forms/server-errors";
import { fmt, type MassUnit, type VolumeUnit } from "./amounts";
import { AmountsTable } from "./AmountsTable";
import { PreparationChecks } from "./PreparationChecks";

interface Props {
  recipes: FormRecipe[];
  lots: FormLot[];
  tolerances: Tolerances;
  expiryRules: ExpiryRule[];
  initialRecipeVersionId?: number | null;
  /** Rooms a batch may be kept in (instruments, stock lots, flammables limits); the first is the default. */
  rooms?: string[];
}

// With zod and the schema the page would pass its JavaScript budget: they load at the form's first
// check (a field left, or a submit) instead; the chemistry, which the first view needs, comes first.
const loadBatchSchema = () => import("../../lib/schemas/preparation").then((m) => m.batchCreateSchema);

export default function PreparationForm({ recipes, lots, tolerances, expiryRules, initialRecipeVersionId, rooms = [] }: Props) {
  const key = useRef(newKey("batch"));
  const first = recipes.find((r) => r.versionId === initialRecipeVersionId) ?? recipes[0];
  const form = useZodForm<BatchCreateInput>(loadBatchSchema, {
    defaultValues: {
      idempotencyKey: key.current,
      recipeVersionId: first?.versionId ?? 0,
      volume_mL: 1000,
      bottles: 1,
      bottleSize_mL: 1000,
      temperature_C: 22,
      measuredPH: null,
      phMeterTemperature_C: null,
      components: [],
      deviationReason: "",
      ...(rooms[0] !== undefined ? { room: rooms[0] } : {}),
    },
  });
  const { register, watch, setValue, handleSubmit, formState } = form;
  const showServerError = useServerErrors(form);
  const [volumeUnit, setVolumeUnit] = useState<VolumeUnit>("ml");
  const [liquidUnit, setLiquidUnit] = useState<VolumeUnit>("ml");
  const [massUnit, setMassUnit] = useState<MassUnit>("g");
  const [volumeText, setVolumeText] = useState("1000");
  const [actualText, setActualText] = useState<Record<string, string>>({});
  const [serverError, setServerError] = useState<string | null>(null);
  const [saving, setSaving] = useState(false);

  const versionId = Number(watch("recipeVersionId"));
  const volume = Number(watch("volume_mL"));
  const temperature = Number(watch("temperature_C"));
  const bottles = Number(watch("bottles"));
  const measuredPH = watch("measuredPH");
  const chosenLots = watch("components");
  const recipe = recipes.find((r) => r.versionId === versionId);
  // The lots picked, matched to their lines: their assays set the amounts to weigh.
  const pickedLots = (chosenLots ?? []).map((c) => lots.find((l) => l.id === Number(c.stockLotId) && l.reagent === c.reagent));
  const lotKey = pickedLots.map((l) => (l ? `${l.id}:${l.assayPercent ?? ""}:${l.density_g_mL ?? ""}` : "")).join(",");

  // The amounts, computed in the browser as the user types: no round trip.
  const computed = useMemo((): { plan: PreparationPlan | null; error: string | null } => {
    if (!recipe) return { plan: null, error: "Pick a recipe." };
    if (!(volume > 0)) return { plan: null, error: "Type the batch volume." };
    try {
      return {
        plan: preparationPlan({
          spec: recipe.spec,
          volume_mL: volume,
          temperature_C: Number.isFinite(temperature) ? temperature : 22,
          detection_nm: recipe.detection_nm,
          ...lotChemistry(pickedLots),
        }),
        error: null,
      };
    } catch (error) {
      return { plan: null, error: error instanceof ChemInputError ? error.message : "These numbers cannot be computed." };
    }
    // pickedLots is summed up by lotKey.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [recipe, volume, temperature, lotKey]);
  const plan = computed.plan;

  const rowKey = (i: number) => `${versionId}:${i}`;

  // Keep the form's component lines in step with the plan (one line per planned component).
  const lines = plan?.components ?? [];
  const lineKey = `${versionId}|${lines.map((c) => c.reagent).join(",")}`;
  useEffect(() => {
    if (!plan) return;
    const next = plan.components.map((c) => {
      const usable = lots.filter((l) => l.reagent === c.reagent && !lotExpired(l.expiresOn));
      return { reagent: c.reagent, stockLotId: usable.length === 1 ? usable[0]!.id : 0, actualAmount: null as number | null };
    });
    setValue("components", next);
    setActualText({});
    // Only when the recipe or its list of components changes; amounts typed so far belong to the old list.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [lineKey]);

  const deviations = plan
    ? findDeviations({
        tolerances,
        targetPH: recipe?.spec.buffer?.targetPH ?? null,
        measuredPH: typeof measuredPH === "number" && Number.isFinite(measuredPH) ? measuredPH : null,
        components: lines.map((c, i) => ({ name: c.name, unit: c.unit, target: c.target, actual: chosenLots[i]?.actualAmount ?? null })),
      })
    : [];
  const deviantFields = new Set(deviations.map((d) => d.field));

  const expiry = plan
    ? batchExpiry({
        kind: plan.kind,
        preparedAt: new Date(),
        rules: expiryRules,
        lots: chosenLots
          .map((c) => lots.find((l) => l.id === Number(c.stockLotId)))
          .filter((l): l is FormLot => l !== undefined)
          .map((l) => ({ lotNumber: l.lotNumber, expiresOn: l.expiresOn })),
      })
    : null;

  const onSubmit = handleSubmit(async (values) => {
    setServerError(null);
    setSaving(true);
    try {
      const result = await postJson<RecordedBatch>("/api/batches", { ...values, idempotencyKey: key.current });
      window.location.assign(`/batches/${result.batch.id}?recorded=1`);
    } catch (error) {
      setServerError(showServerError(error));
      setSaving(false);
    }
  });

  const errors = formState.errors;
  const perBottle = bottles > 0 ? volume / bottles : 0;

  if (recipes.length === 0)
    return <p className="notice">No recipe is approved yet. A manager approves a recipe before batches are made from it.</p>;

  return (
    <IslandForm onSubmit={onSubmit} noValidate className="grid gap-6 xl:grid-cols-[minmax(0,1fr)_22rem]" aria-describedby="prep-status">
      <div className="grid gap-6">
        <section className="card grid gap-4 p-5" aria-labelledby="what-heading">
          <h2 id="what-heading">What and how much</h2>
          <div className="grid gap-4 sm:grid-cols-2">
            <div className="field sm:col-span-2">
              <label htmlFor="prep-recipe">Recipe</label>
              <select id="prep-recipe" className="input" {...register("recipeVersionId", { valueAsNumber: true })}>
                {recipes.map((r) => (
                  <option
                    key={r.versionId}
                    value={r.versionId}
                  >{`${r.code} · ${r.name} (v${r.version}${r.channel ? `, ch. ${r.channel}` : ""})`}</option>
                ))}
              </select>
            </div>
            <div className="field">
              <label htmlFor="prep-volume">Batch volume</label>
              <div className="flex gap-2">
                <input
                  id="prep-volume"
                  className="input min-w-0 flex-1"
                  inputMode="decimal"
                  value={volumeText}
                  aria-invalid={errors.volume_mL ? true : undefined}
                  onChange={(e) => {
                    setVolumeText(e.target.value);
                    const n = Number(e.target.value.replace(",", "."));
                    setValue("volume_mL", Number.isFinite(n) && n > 0 ? convert(n).from(volumeUnit).to("ml") : NaN, {
                      shouldValidate: formState.isSubmitted,
                    });
                  }}
                />
                <select
                  aria-label="Unit of volume"
                  className="input"
                  value={volumeUnit}
                  onChange={(e) => {
                    const unit = e.target.value as VolumeUnit;
                    setVolumeUnit(unit);
                    if (volume > 0) setVolumeText(String(+convert(volume).from("ml").to(unit).toFixed(4)));
                  }}
                >
                  <option value="ml">mL</option>
                  <option value="l">L</option>
                </select>
              </div>
              {errors.volume_mL && (
                <p className="field-error" role="alert">
                  {errors.volume_mL.message}
                </p>
              )}
            </div>
            <div className="field">
              <label htmlFor="prep-temp">Preparation temperature (°C)</label>
              <input id="prep-temp" className="input" inputMode="decimal" {...register("temperature_C", { valueAsNumber: true })} />
              {errors.temperature_C && (
                <p className="field-error" role="alert">
                  {errors.temperature_C.message}
                </p>
              )}
            </div>
            <div className="field">
              <label htmlFor="prep-bottles">Bottles</label>
              <input id="prep-bottles" className="input" inputMode="numeric" {...register("bottles", { valueAsNumber: true })} />
              {errors.bottles && (
                <p className="field-error" role="alert">
                  {errors.bottles.message}
                </p>
              )}
            </div>
            <div className="field">
              <label htmlFor="prep-bottle-size">Bottle size (mL)</label>
              <input id="prep-bottle-size" className="input" inputMode="numeric" {...register("bottleSize_mL", { valueAsNumber: true })} />
              {errors.bottleSize_mL ? (
                <p className="field-error" role="alert">
                  {errors.bottleSize_mL.message}
                </p>
              ) : (
                perBottle > 0 && <p className="text-xs text-[var(--color-muted)]">{fmt(perBottle)} mL in each bottle</p>
              )}
            </div>
            {rooms.length > 0 && (
              <div className="field">
                <label htmlFor="prep-room">Kept in room</label>
                <select id="prep-room" className="input" {...register("room")}>
                  {rooms.map((r) => (
                    <option key={r} value={r}>
                      {r}
                    </option>
                  ))}
                </select>
                {errors.room ? (
                  <p className="field-error" role="alert">
                    {errors.room.message}
                  </p>
                ) : (
                  <p className="text-xs text-[var(--color-muted)]">Counted in the room's flammable liquids on hand</p>
                )}
              </div>
            )}
          </div>
        </section>

        <section className="card p-5" aria-labelledby="amounts-heading">
          <div className="mb-3 flex flex-wrap items-end justify-between gap-3">
            <div>
              <h2 id="amounts-heading">Weigh and measure</h2>
              <p className="text-sm text-[var(--color-muted)]">Solvent percentages are v/v, each measured separately before mixing.</p>
            </div>
            <div className="flex gap-2 text-sm">
              <label className="flex items-center gap-1">
                Liquids
                <select
                  className="input py-1"
                  value={liquidUnit}
                  onChange={(e) => setLiquidUnit(e.target.value as VolumeUnit)}
                  aria-label="Unit for liquids"
                >
                  <option value="ml">mL</option>
                  <option value="l">L</option>
                </select>
              </label>
              <label className="flex items-center gap-1">
                Solids
                <select
                  className="input py-1"
                  value={massUnit}
                  onChange={(e) => setMassUnit(e.target.value as MassUnit)}
                  aria-label="Unit for solids"
                >
                  <option value="g">g</option>
                  <option value="mg">mg</option>
                </select>
              </label>
            </div>
          </div>
          {computed.error && (
            <p className="notice notice-danger" role="alert">
              {computed.error}
            </p>
          )}
          {plan && (
            <AmountsTable
              lines={lines}
              lots={lots}
              pickedLots={pickedLots}
              form={form}
              units={{ liquid: liquidUnit, mass: massUnit }}
              texts={actualText}
              onText={(row, text) => setActualText({ ...actualText, [row]: text })}
              rowKey={rowKey}
              deviantFields={deviantFields}
            />
          )}
          {recipe?.spec.buffer && (
            <div className="mt-4 grid gap-4 sm:grid-cols-2">
              <div className="field">
                <label htmlFor="prep-ph">
                  Measured pH (target {recipe.spec.buffer.targetPH.toFixed(2)} ± {tolerances.pH})
                </label>
                <input
                  id="prep-ph"
                  className="input"
                  inputMode="decimal"
                  aria-invalid={deviantFields.has("measuredPH") || errors.measuredPH ? true : undefined}
                  {...register("measuredPH", { valueAsNumber: true })}
                />
                {errors.measuredPH && (
                  <p className="field-error" role="alert">
                    {errors.measuredPH.message}
                  </p>
                )}
              </div>
              <div className="field">
                <label htmlFor="prep-ph-temp">pH read at (°C)</label>
                <input
                  id="prep-ph-temp"
                  className="input"
                  inputMode="decimal"
                  {...register("phMeterTemperature_C", { valueAsNumber: true })}
                />
              </div>
            </div>
          )}
          {deviations.length > 0 && (
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
                  aria-invalid={errors.deviationReason ? true : undefined}
                  aria-describedby={errors.deviationReason ? "prep-reason-error" : undefined}
                  {...register("deviationReason")}
                />
                {errors.deviationReason && (
                  <p id="prep-reason-error" className="field-error" role="alert">
                    {errors.deviationReason.message}
                  </p>
                )}
              </div>
            </div>
          )}
        </section>

        {plan && (
          <section className="card p-5" aria-labelledby="order-heading">
            <h2 id="order-heading">Order of work</h2>
            <ol className="ml-5 mt-2 list-decimal space-y-1 text-sm">
              {plan.steps.map((s) => (
                <li key={s}>{s}</li>
              ))}
            </ol>
          </section>
        )}
      </div>

      <aside className="grid content-start gap-4" aria-label="Checks">
        {plan && <PreparationChecks plan={plan} detection_nm={recipe?.detection_nm ?? null} expiry={expiry} />}
        <div id="prep-status" aria-live="polite">
          {serverError && (
            <p className="notice notice-danger" role="alert">
              {serverError}
            </p>
          )}
        </div>
        <button type="submit" className="btn justify-center" disabled={saving || !plan}>
          {saving ? "Recording…" : "Record the batch"}
        </button>
      </aside>
    </IslandForm>
  );
}
