import convert from "convert-units";
import { useEffect, useMemo, useRef, useState } from "react";
import { ChemInputError } from "../../lib/chem/warnings";
import { findDeviations, type Tolerances } from "../../lib/preparation/deviations";
import { batchExpiry, lotExpired, type ExpiryRule } from "../../lib/preparation/expiry";
import { assayNote, assayUsed, lotChemistry } from "../../lib/preparation/lot-assays";
import { preparationPlan, type PreparationPlan } from "../../lib/preparation/plan";
import type { BatchCreateInput } from "../../lib/schemas/preparation";
import type { PreparableRecipe } from "../../lib/server/services/recipes";
import { useZodForm } from "../forms/form";
import { IslandForm } from "../forms/island-form";
import { postJson } from "../forms/post-json";

/** The recipe as the page hands it to the form (the service's shape, without the recipe id). */
export type FormRecipe = Omit<PreparableRecipe, "recipeId">;

export interface FormLot {
  id: number;
  reagent: string;
  lotNumber: string;
  grade: string;
  expiresOn: string;
  remaining: number;
  unit: "mL" | "g";
  low: boolean;
  /** % w/w from the certificate; null when not recorded (the catalogue's typical value is used). */
  assayPercent: number | null;
  density_g_mL: number | null;
}

interface Props {
  recipes: FormRecipe[];
  lots: FormLot[];
  tolerances: Tolerances;
  expiryRules: ExpiryRule[];
  initialRecipeVersionId?: number | null;
  /** Rooms a batch may be kept in (instruments, stock lots, flammables limits); the first is the default. */
  rooms?: string[];
}

type VolumeUnit = "ml" | "l";
type MassUnit = "g" | "mg";

// With zod and the schema the page would pass its JavaScript budget: they load at the form's first
// check (a field left, or a submit) instead; the chemistry, which the first view needs, comes first.
const loadBatchSchema = () => import("../../lib/schemas/preparation").then((m) => m.batchCreateSchema);

const ROLE_LABEL: Record<string, string> = { solvent: "solvent", buffer: "buffer", titrant: "to pH", additive: "additive" };

function newKey(): string {
  return typeof crypto !== "undefined" && "randomUUID" in crypto
    ? crypto.randomUUID()
    : `k${Date.now()}${Math.random().toString(36).slice(2)}`;
}

function fmt(n: number, digits = 4): string {
  if (!Number.isFinite(n)) return "–";
  const abs = Math.abs(n);
  const d = abs >= 1000 ? 0 : abs >= 100 ? 1 : abs >= 10 ? 2 : abs >= 1 ? 3 : digits;
  return n.toFixed(d);
}

export default function PreparationForm({ recipes, lots, tolerances, expiryRules, initialRecipeVersionId, rooms = [] }: Props) {
  const key = useRef(newKey());
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
  const display = (amount: number, unit: "mL" | "g") =>
    unit === "mL" ? convert(amount).from("ml").to(liquidUnit) : convert(amount).from("g").to(massUnit);
  const canonical = (value: number, unit: "mL" | "g") =>
    unit === "mL" ? convert(value).from(liquidUnit).to("ml") : convert(value).from(massUnit).to("g");
  const unitLabel = (unit: "mL" | "g") => (unit === "mL" ? (liquidUnit === "ml" ? "mL" : "L") : massUnit);

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
      const result = await postJson<{ batch: { id: number } }>("/api/batches", { ...values, idempotencyKey: key.current });
      window.location.assign(`/batches/${result.batch.id}?recorded=1`);
    } catch (error) {
      setServerError(error instanceof Error ? error.message : String(error));
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
            <div className="overflow-x-auto">
              <table className="table" data-testid="amounts">
                <thead>
                  <tr>
                    <th>Component</th>
                    <th className="num">Target</th>
                    <th>Lot used</th>
                    <th className="num">Actual</th>
                  </tr>
                </thead>
                <tbody>
                  {lines.map((c, i) => {
                    const options = lots.filter((l) => l.reagent === c.reagent);
                    const field = `components.${i}.actualAmount`;
                    const lotError = errors.components?.[i]?.stockLotId?.message;
                    const text = actualText[rowKey(i)] ?? "";
                    return (
                      <tr key={rowKey(i)} data-reagent={c.reagent}>
                        <td>
                          <span className="font-medium">{c.name}</span> <span className="tag tag-muted ml-1">{ROLE_LABEL[c.role]}</span>
                        </td>
                        <td className="num whitespace-nowrap" data-testid={`target-${c.reagent}`}>
                          {fmt(display(c.target, c.unit))} {unitLabel(c.unit)}
                        </td>
                        <td>
                          <select
                            className="input w-full min-w-44 py-1"
                            aria-label={`Lot of ${c.name}`}
                            aria-invalid={lotError ? true : undefined}
                            {...register(`components.${i}.stockLotId` as const, { valueAsNumber: true })}
                          >
                            <option value={0}>Choose a lot…</option>
                            {options.map((l) => {
                              const expired = lotExpired(l.expiresOn);
                              return (
                                <option key={l.id} value={l.id} disabled={expired}>
                                  {`${l.lotNumber} · ${l.grade} · exp. ${l.expiresOn}${expired ? " · EXPIRED" : l.low ? " · low" : ""}`}
                                </option>
                              );
                            })}
                          </select>
                          {options.length === 0 && <p className="field-error">No lot of {c.name} is recorded: add it under Stock lots.</p>}
                          {(() => {
                            const lot = pickedLots[i];
                            const note = lot ? assayNote(assayUsed(c.reagent, c.role, lot)) : null;
                            return note ? (
                              <p
                                className={
                                  lot?.assayPercent === null ? "text-xs text-[var(--color-amber)]" : "text-xs text-[var(--color-muted)]"
                                }
                                data-testid={`assay-${c.reagent}`}
                              >
                                {note}
                              </p>
                            ) : null;
                          })()}
                          {lotError && (
                            <p className="field-error" role="alert">
                              {lotError === "Pick the lot used" || lotError.startsWith("Expected") ? "Pick the lot used" : lotError}
                            </p>
                          )}
                        </td>
                        <td className="num">
                          <input
                            className="input w-28 py-1 text-right"
                            inputMode="decimal"
                            aria-label={`Actual amount of ${c.name} (${unitLabel(c.unit)})`}
                            value={text}
                            placeholder={fmt(display(c.target, c.unit))}
                            aria-invalid={deviantFields.has(field) ? true : undefined}
                            onChange={(e) => {
                              setActualText({ ...actualText, [rowKey(i)]: e.target.value });
                              const n = Number(e.target.value.replace(",", "."));
                              setValue(
                                `components.${i}.actualAmount` as const,
                                e.target.value.trim() !== "" && Number.isFinite(n) ? canonical(n, c.unit) : null,
                              );
                            }}
                          />
                        </td>
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </div>
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
                <input id="prep-reason" className="input" {...register("deviationReason")} />
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
        {plan && (
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
                {plan.properties.uvCutoff_nm} nm{recipe?.detection_nm ? ` (detect at ${recipe.detection_nm} nm)` : ""}
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
        )}
        {plan && plan.warnings.length > 0 && (
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
        {plan && (
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
        )}
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
