import { useState } from "react";
import { readingSchema, type ReadingInput } from "../../lib/schemas/waste";
import { Field, useZodForm } from "../forms/form";
import { IslandForm } from "../forms/island-form";
import { postJson } from "../forms/post-json";
import type { ReadingResult } from "../../lib/waste/types";

/** A manual level reading. The answer shows the difference from Decant's estimate, which is kept. */
export default function ReadingForm({ containerId, estimated_mL }: { containerId: number; estimated_mL: number }) {
  const { register, handleSubmit, formState, reset } = useZodForm<ReadingInput>(readingSchema, { defaultValues: { note: null } });
  const [problem, setProblem] = useState<string | null>(null);
  const [result, setResult] = useState<string | null>(null);
  const onSubmit = handleSubmit(async (values) => {
    setProblem(null);
    try {
      const r = await postJson<ReadingResult>(`/api/waste/containers/${containerId}/readings`, {
        ...values,
        note: values.note || null,
      });
      const sign = r.difference_mL > 0 ? "+" : "";
      setResult(`Reading kept. Estimate before: ${r.estimatedBefore_mL} mL; difference ${sign}${r.difference_mL} mL.`);
      reset({ note: null });
      window.setTimeout(() => window.location.reload(), 1500);
    } catch (error) {
      setProblem(error instanceof Error ? error.message : String(error));
    }
  });
  return (
    <IslandForm onSubmit={onSubmit} noValidate className="flex flex-col gap-3" aria-label="Record a level reading">
      <Field
        label="Level read off the container (mL)"
        type="number"
        inputMode="decimal"
        step="any"
        min={0}
        registration={register("level_mL")}
        error={formState.errors.level_mL?.message}
        hint={`Decant's estimate now: ${Math.round(estimated_mL)} mL`}
      />
      <Field label="Note (optional)" registration={register("note")} error={formState.errors.note?.message} maxLength={255} />
      {problem && (
        <p className="notice notice-danger" role="alert">
          {problem}
        </p>
      )}
      {result && (
        <p className="notice" role="status">
          {result}
        </p>
      )}
      <div>
        <button className="btn" type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? "Saving…" : "Record reading"}
        </button>
      </div>
    </IslandForm>
  );
}
