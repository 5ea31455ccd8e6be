import { useState } from "react";
import type { LotReagentChoice } from "../../lib/preparation/recipe-choices";
import type { StockLotInput } from "../../lib/schemas/stock-lots";
import { Field, useZodForm } from "../forms/form";
import { IslandForm } from "../forms/island-form";
import { readAnswer } from "../forms/post-json";
import { useServerErrors } from "../forms/server-errors";

const MAX_MB = 10;

// The schema checks the reagent against the catalogue: both load at the form's first check, not with the page.
const loadLotSchema = () => import("../../lib/schemas/stock-lots").then((m) => m.stockLotInputSchema);

/** Records a lot as received, with its certificate of analysis (PDF or image). */
export default function StockLotForm({ reagents }: { reagents: LotReagentChoice[] }) {
  const today = new Date().toISOString().slice(0, 10);
  const form = useZodForm<StockLotInput>(loadLotSchema, {
    defaultValues: {
      reagent: "acetonitrile",
      lotNumber: "",
      supplier: "",
      grade: "HPLC",
      receivedOn: today,
      expiresOn: "",
      quantity: 4000,
    },
  });
  const { register, handleSubmit, formState, watch } = form;
  const showServerError = useServerErrors(form);
  const [file, setFile] = useState<File | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [saving, setSaving] = useState(false);
  const reagent = reagents.find((r) => r.id === watch("reagent"));
  const errors = formState.errors;
  const typical = reagent?.purity_w_w?.value;
  // A lot density is used for liquids measured by volume into a buffer or as an additive, not for solvents.
  const asksDensity = reagent?.form === "liquid" && reagent.role !== "solvent";

  const onSubmit = handleSubmit(async (values) => {
    setProblem(null);
    if (file && file.size > MAX_MB * 1048576) return setProblem(`certificate: the file is over ${MAX_MB} MB`);
    setSaving(true);
    const body = new FormData();
    for (const [k, v] of Object.entries(values)) if (v !== undefined && v !== null) body.set(k, String(v));
    if (file) body.set("certificate", file);
    try {
      await readAnswer(await fetch("/api/stock-lots", { method: "POST", body }));
      window.location.assign("/stock-lots?added=1");
    } catch (error) {
      setProblem(showServerError(error));
      setSaving(false);
    }
  });

  return (
    <IslandForm
      onSubmit={onSubmit}
      noValidate
      className="card grid gap-4 p-5 sm:grid-cols-2 lg:grid-cols-4"
      aria-label="Record a stock lot"
    >
      <div className="field sm:col-span-2">
        <label htmlFor="lot-reagent">Reagent</label>
        <select id="lot-reagent" className="input" {...register("reagent")}>
          {reagents.map((r) => (
            <option key={r.id} value={r.id}>
              {r.name}
            </option>
          ))}
        </select>
      </div>
      <Field label="Lot number" registration={register("lotNumber")} error={errors.lotNumber?.message} />
      <Field label="Grade" registration={register("grade")} error={errors.grade?.message} />
      <div className="sm:col-span-2">
        <Field label="Supplier" registration={register("supplier")} error={errors.supplier?.message} />
      </div>
      <Field
        label={`Quantity (${reagent?.form === "solid" ? "g" : "mL"})`}
        inputMode="decimal"
        registration={register("quantity")}
        error={errors.quantity?.message}
      />
      <Field label="Room" registration={register("room")} error={errors.room?.message} />
      <div>
        <Field
          label="Assay (% w/w, from the certificate)"
          inputMode="decimal"
          registration={register("assayPercent")}
          error={errors.assayPercent?.message}
        />
        <p className="text-xs text-[var(--color-muted)]">
          {typical !== undefined
            ? `Sets the amounts weighed; when left empty the typical ${+(typical * 100).toFixed(1)} % is used and batches say so.`
            : "Sets the amounts weighed; when left empty 100 % is assumed and batches say so."}
        </p>
      </div>
      {asksDensity && (
        <div>
          <Field
            label="Density at 20 °C (g/mL, optional)"
            inputMode="decimal"
            registration={register("density_g_mL")}
            error={errors.density_g_mL?.message}
          />
          <p className="text-xs text-[var(--color-muted)]">From the certificate, if it gives one: the volume to measure uses it.</p>
        </div>
      )}
      <Field label="Received" type="date" registration={register("receivedOn")} error={errors.receivedOn?.message} />
      <Field label="Opened (optional)" type="date" registration={register("openedOn")} error={errors.openedOn?.message} />
      <Field label="Expires" type="date" registration={register("expiresOn")} error={errors.expiresOn?.message} />
      <div className="field">
        <label htmlFor="lot-coa">Certificate of analysis</label>
        <input
          id="lot-coa"
          type="file"
          accept="application/pdf,image/png,image/jpeg,image/webp"
          className="text-sm"
          onChange={(e) => setFile(e.target.files?.[0] ?? null)}
        />
        <p className="text-xs text-[var(--color-muted)]">PDF or image, at most {MAX_MB} MB</p>
      </div>
      <div className="flex items-end gap-3 sm:col-span-2 lg:col-span-4">
        <button type="submit" className="btn" disabled={saving}>
          {saving ? "Saving…" : "Record the lot"}
        </button>
        {problem && (
          <p className="field-error" role="alert">
            {problem}
          </p>
        )}
      </div>
    </IslandForm>
  );
}
