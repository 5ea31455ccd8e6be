import { useEffect, useState } from "react";
import { formatVolume } from "../../lib/format";
import type { DrawResult, ProjectChoice, UsableBatch } from "../../lib/ledger/types";
import { DRAW_PURPOSES, drawSchema, type DrawInput } from "../../lib/schemas/runs";
import { Field, SelectField, useZodForm } from "../forms/form";
import { newKey } from "../forms/idempotency-key";
import { IslandForm } from "../forms/island-form";
import { postJson } from "../forms/post-json";
import { useServerErrors } from "../forms/server-errors";

interface Props {
  batches: Pick<UsableBatch, "id" | "code" | "name" | "remaining_mL">[];
  projects: ProjectChoice[];
  containers: { id: number; code: string; stream: string; room: string }[];
}

const PURPOSE_LABELS: Record<(typeof DRAW_PURPOSES)[number], string> = {
  wash: "Wash or flush",
  spill: "Spill",
  transfer: "Transfer to another vessel",
  other: "Something else",
};

/** A manual withdrawal from a batch, with its reason. */
export default function DrawForm({ batches: initial, projects, containers }: Props) {
  const form = useZodForm<DrawInput>(drawSchema);
  const { register, handleSubmit, formState, setValue, reset } = form;
  const showServerError = useServerErrors(form);
  const [batches, setBatches] = useState(initial);
  const [done, setDone] = useState<string | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  useEffect(() => setValue("idempotencyKey", newKey("draw")), [setValue]);

  const onSubmit = handleSubmit(async (values) => {
    setProblem(null);
    setDone(null);
    try {
      const r = await postJson<DrawResult>("/api/draws", values);
      setBatches((bs) => bs.map((b) => (b.code === r.batchCode ? { ...b, remaining_mL: r.remaining_mL } : b)));
      setDone(`${formatVolume(r.volume_mL)} drawn from ${r.batchCode}; ${formatVolume(r.remaining_mL)} left.`);
      reset({ ...values, volume_mL: undefined as unknown as number, note: "", idempotencyKey: newKey("draw") });
    } catch (error) {
      setProblem(showServerError(error));
    }
  });
  const e = formState.errors;
  return (
    <IslandForm method="post" onSubmit={onSubmit} noValidate className="card flex max-w-2xl flex-col gap-4 p-5" aria-label="Log a draw">
      <input type="hidden" {...register("idempotencyKey")} />
      <SelectField
        label="Batch"
        registration={register("batchId")}
        options={batches.map((b) => ({ value: b.id, label: `${b.code} · ${b.name} · ${formatVolume(b.remaining_mL)} left` }))}
        placeholder="Choose…"
        error={e.batchId?.message}
      />
      <div className="grid gap-4 md:grid-cols-2">
        <Field label="Volume, mL" inputMode="decimal" registration={register("volume_mL")} error={e.volume_mL?.message} />
        <SelectField
          label="What for"
          registration={register("purpose")}
          options={DRAW_PURPOSES.map((p) => ({ value: p, label: PURPOSE_LABELS[p] }))}
          placeholder="Choose…"
          error={e.purpose?.message}
        />
      </div>
      <Field
        label="Note"
        registration={register("note")}
        error={e.note?.message}
        hint="Kept with the ledger entry, e.g. which column was flushed."
      />
      <div className="grid gap-4 md:grid-cols-2">
        <SelectField
          label="Charged to project"
          registration={register("projectId")}
          options={projects.map((p) => ({ value: p.id, label: `${p.code} · ${p.name}` }))}
          placeholder="No project (facility)"
          error={e.projectId?.message}
        />
        <SelectField
          label="Went to waste container"
          registration={register("wasteContainerId")}
          options={containers.map((c) => ({ value: c.id, label: `${c.code} · ${c.stream} · ${c.room}` }))}
          placeholder="None (e.g. absorbed spill)"
          error={e.wasteContainerId?.message}
        />
      </div>
      {problem && (
        <p className="notice notice-danger" role="alert">
          {problem}
        </p>
      )}
      {done && (
        <p className="notice" role="status">
          {done}
        </p>
      )}
      <div>
        <button className="btn" type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? "Recording…" : "Record the draw"}
        </button>
      </div>
    </IslandForm>
  );
}
