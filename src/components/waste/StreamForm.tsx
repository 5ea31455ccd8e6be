import { useState } from "react";
import { z } from "zod";
import { streamSchema, type StreamInput } from "../../lib/schemas/waste";
import { Field, useZodForm } from "../forms/form";
import { IslandForm } from "../forms/island-form";
import { postJson } from "../forms/post-json";
import type { StreamRule } from "../../lib/waste/types";

// The form edits "also accepts" as a comma-separated list; the API takes an array.
const formSchema = streamSchema.extend({ alsoAccepts: z.string().max(400).default("") });
type FormValues = z.infer<typeof formSchema>;

interface Props {
  /** Editing this stream; creating one when absent. */
  /** As stored: null where the stream keeps the common-practice default. */
  stream?: Omit<StreamInput, "alsoAccepts"> & { alsoAccepts: readonly string[] | null };
  defaults?: Pick<StreamRule, "minShare_percent" | "alsoAccepts"> | null;
}

const orNull = (v: unknown) => (v === "" || v === null || v === undefined ? null : v);

export default function StreamForm({ stream, defaults = null }: Props) {
  const { register, handleSubmit, formState } = useZodForm<FormValues>(formSchema, {
    defaultValues: stream
      ? { ...stream, alsoAccepts: stream.alsoAccepts?.join(", ") ?? "" }
      : { id: "", name: "", description: null, restrictiveness: 1, minShare_percent: null, alsoAccepts: "" },
  });
  const [problem, setProblem] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const onSubmit = handleSubmit(async (values) => {
    setProblem(null);
    setSaved(false);
    const list = values.alsoAccepts
      .split(",")
      .map((s) => s.trim())
      .filter(Boolean);
    const body = {
      name: values.name,
      description: values.description || null,
      restrictiveness: values.restrictiveness,
      minShare_percent: values.minShare_percent,
      alsoAccepts: list.length || !defaults ? list : null,
    };
    try {
      if (stream) await postJson(`/api/waste/streams/${stream.id}`, body, "PUT");
      else await postJson("/api/waste/streams", { id: values.id, ...body });
      setSaved(true);
      window.setTimeout(() => window.location.reload(), 600);
    } catch (error) {
      setProblem(error instanceof Error ? error.message : String(error));
    }
  });
  const e = formState.errors;
  return (
    <IslandForm
      onSubmit={onSubmit}
      noValidate
      className="grid gap-3 md:grid-cols-2"
      aria-label={stream ? `Edit ${stream.name}` : "New stream"}
    >
      {!stream && <Field label="Id" registration={register("id")} error={e.id?.message} placeholder="e.g. heavy-metal-aqueous" />}
      <Field label="Name" registration={register("name")} error={e.name?.message} />
      <Field
        label="Restrictiveness (higher wins)"
        type="number"
        step={1}
        min={0}
        registration={register("restrictiveness")}
        error={e.restrictiveness?.message}
      />
      <Field
        label="Reached from share of the mix (%)"
        type="number"
        step="any"
        min={0}
        registration={register("minShare_percent", { setValueAs: orNull })}
        error={e.minShare_percent?.message}
        placeholder={defaults ? `default ${defaults.minShare_percent}` : "0"}
        hint={defaults ? "Leave empty for the common-practice default." : undefined}
      />
      <Field
        label="Its containers also take (stream ids)"
        registration={register("alsoAccepts")}
        error={e.alsoAccepts?.message}
        placeholder={defaults ? `default: ${defaults.alsoAccepts.join(", ") || "none"}` : "none"}
      />
      <div className="field md:col-span-2">
        <label htmlFor={`desc-${stream?.id ?? "new"}`}>Description</label>
        <textarea id={`desc-${stream?.id ?? "new"}`} className="input" rows={2} {...register("description", { setValueAs: orNull })} />
      </div>
      {problem && (
        <p className="notice notice-danger md:col-span-2" role="alert">
          {problem}
        </p>
      )}
      <div className="flex items-center gap-3 md:col-span-2">
        <button className="btn" type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? "Saving…" : stream ? "Save stream" : "Add stream"}
        </button>
        {saved && (
          <span className="text-sm text-[var(--color-ok)]" role="status">
            Saved.
          </span>
        )}
      </div>
    </IslandForm>
  );
}
