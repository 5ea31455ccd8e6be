import { useState } from "react";
import { z } from "zod";
import { wasteSettingsSchema } from "../../lib/schemas/waste";
import { Field, useZodForm } from "../forms/form";
import { IslandForm } from "../forms/island-form";
import { postJson } from "../forms/post-json";
import type { WasteSettings } from "../../lib/waste/types";

// Room limits and reagent overrides are edited as "key = value" lines; the API takes objects.
const lines = z.string().max(4000).default("");
const formSchema = z.object({
  fullThreshold_percent: z.coerce
    .number({ invalid_type_error: "must be a number" })
    .int("must be a whole number")
    .min(10, "must be 10 % or more")
    .max(100, "must be 100 % or less"),
  accumulationLimit_days: z.coerce.number({ invalid_type_error: "must be a number" }).int("must be whole days").min(1).max(3650),
  accumulationWarning_days: z.coerce.number({ invalid_type_error: "must be a number" }).int("must be whole days").min(0).max(365),
  roomLimits: lines,
  reagentStreams: lines,
});
type FormValues = z.infer<typeof formSchema>;

function parseLines(text: string, field: string, numeric: boolean): Record<string, string | number> {
  const out: Record<string, string | number> = {};
  for (const [i, raw] of text.split("\n").entries()) {
    const line = raw.trim();
    if (!line) continue;
    const [key, value] = line.split("=").map((s) => s.trim());
    if (!key || value === undefined || value === "") throw new Error(`${field}, line ${i + 1}: write it as "name = value"`);
    if (numeric && !Number.isFinite(Number(value))) throw new Error(`${field}, line ${i + 1}: ${value} is not a number`);
    out[key] = numeric ? Number(value) : value;
  }
  return out;
}

interface Props {
  settings: WasteSettings;
}

export default function WasteSettingsForm({ settings }: Props) {
  const { register, handleSubmit, formState } = useZodForm<FormValues>(formSchema, {
    defaultValues: {
      ...settings,
      roomLimits: Object.entries(settings.roomLimits_L)
        .map(([k, v]) => `${k} = ${v}`)
        .join("\n"),
      reagentStreams: Object.entries(settings.reagentStreams)
        .map(([k, v]) => `${k} = ${v}`)
        .join("\n"),
    },
  });
  const [problem, setProblem] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const onSubmit = handleSubmit(async (values) => {
    setProblem(null);
    setSaved(false);
    try {
      const body = wasteSettingsSchema.parse({
        fullThreshold_percent: values.fullThreshold_percent,
        accumulationLimit_days: values.accumulationLimit_days,
        accumulationWarning_days: values.accumulationWarning_days,
        roomLimits_L: parseLines(values.roomLimits, "Room limits", true),
        reagentStreams: parseLines(values.reagentStreams, "Reagent streams", false),
      });
      await postJson("/api/waste/settings", body, "PUT");
      setSaved(true);
    } catch (error) {
      const message =
        error instanceof z.ZodError
          ? error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ")
          : error instanceof Error
            ? error.message
            : String(error);
      setProblem(message);
    }
  });
  const e = formState.errors;
  return (
    <IslandForm onSubmit={onSubmit} noValidate className="grid max-w-3xl gap-4 sm:grid-cols-3" aria-label="Waste limits">
      <Field
        label="Fill threshold (%)"
        type="number"
        min={10}
        max={100}
        step={1}
        registration={register("fullThreshold_percent")}
        error={e.fullThreshold_percent?.message}
        hint="Example: 80 %"
      />
      <Field
        label="Accumulation limit (days)"
        type="number"
        min={1}
        step={1}
        registration={register("accumulationLimit_days")}
        error={e.accumulationLimit_days?.message}
        hint="Example: 180 days"
      />
      <Field
        label="Warn days before the limit"
        type="number"
        min={0}
        step={1}
        registration={register("accumulationWarning_days")}
        error={e.accumulationWarning_days?.message}
        hint="Example: 14 days"
      />
      <div className="field sm:col-span-3">
        <label htmlFor="room-limits">
          Flammable liquids allowed per room (litres), one room a line: <code>B2.14 = 50</code>
        </label>
        <textarea id="room-limits" className="input font-mono text-sm" rows={4} {...register("roomLimits")} />
      </div>
      <div className="field sm:col-span-3">
        <label htmlFor="reagent-streams">
          Reagents this site routes differently from the catalogue, one a line: <code>trifluoroacetic-acid = acidic-corrosive</code>
        </label>
        <textarea id="reagent-streams" className="input font-mono text-sm" rows={3} {...register("reagentStreams")} />
      </div>
      {problem && (
        <p className="notice notice-danger sm:col-span-3" role="alert">
          {problem}
        </p>
      )}
      <div className="flex items-center gap-3 sm:col-span-3">
        <button className="btn" type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? "Saving…" : "Save limits"}
        </button>
        {saved && (
          <span className="text-sm text-[var(--color-ok)]" role="status">
            Saved. The limits apply from the next check.
          </span>
        )}
      </div>
    </IslandForm>
  );
}
