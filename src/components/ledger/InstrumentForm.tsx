import { useState } from "react";
import type { InstrumentSummary } from "../../lib/ledger/types";
import { CHANNELS } from "../../lib/schemas/fields";
import { instrumentSchema, type InstrumentInput } from "../../lib/schemas/instruments";
import { Field, useZodForm } from "../forms/form";
import { IslandForm } from "../forms/island-form";
import { postJson } from "../forms/post-json";
import { useServerErrors } from "../forms/server-errors";

interface Props {
  instrument?: Pick<InstrumentSummary, "id" | "name" | "kind" | "room" | "channels" | "wasteContainerId" | "active">;
  containers: { id: number; code: string; stream: string; room: string }[];
}

/** Adds an instrument or changes one (the waste container it drains to, its channels). */
export default function InstrumentForm({ instrument, containers }: Props) {
  const form = useZodForm<InstrumentInput>(instrumentSchema, {
    defaultValues: instrument
      ? { ...instrument, channels: instrument.channels as InstrumentInput["channels"] }
      : { channels: ["A", "B"], active: true, wasteContainerId: null },
  });
  const { register, handleSubmit, formState } = form;
  const showServerError = useServerErrors(form);
  const [problem, setProblem] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const onSubmit = handleSubmit(async (values) => {
    setProblem(null);
    setSaved(false);
    try {
      if (instrument) {
        await postJson(`/api/instruments/${instrument.id}`, values, "PUT");
        setSaved(true);
      } else {
        await postJson("/api/instruments", values);
        window.location.assign("/instruments");
      }
    } catch (error) {
      setProblem(showServerError(error));
    }
  });
  const e = formState.errors;
  return (
    <IslandForm
      method="post"
      onSubmit={onSubmit}
      noValidate
      className="card flex flex-col gap-4 p-5"
      aria-label={instrument ? "Change the instrument" : "Add an instrument"}
    >
      <div className="grid gap-4 md:grid-cols-3">
        <Field label="Name" registration={register("name")} error={e.name?.message} />
        <Field label="System" registration={register("kind")} error={e.kind?.message} hint="e.g. UHPLC, binary pump, DAD" />
        <Field label="Room" registration={register("room")} error={e.room?.message} />
      </div>
      <fieldset>
        <legend className="mb-1 text-sm font-medium text-[var(--color-ink-soft)]">Pump channels</legend>
        <div className="flex gap-4">
          {CHANNELS.map((ch) => (
            <label key={ch} className="flex items-center gap-1.5 text-sm">
              <input type="checkbox" value={ch} {...register("channels")} /> {ch}
            </label>
          ))}
        </div>
        {e.channels && (
          <p className="field-error" role="alert">
            {e.channels.message ?? e.channels.root?.message}
          </p>
        )}
      </fieldset>
      <div className="grid gap-4 md:grid-cols-2">
        <div className="field">
          <label htmlFor="instrument-waste">Drains to waste container</label>
          <select id="instrument-waste" className="input" {...register("wasteContainerId")}>
            <option value="">None yet</option>
            {containers.map((c) => (
              <option key={c.id} value={c.id}>
                {c.code} · {c.stream} · {c.room}
              </option>
            ))}
          </select>
          {e.wasteContainerId && (
            <p className="field-error" role="alert">
              {e.wasteContainerId.message}
            </p>
          )}
        </div>
        <label className="flex items-center gap-2 self-end text-sm">
          <input type="checkbox" {...register("active")} /> In service
        </label>
      </div>
      {problem && (
        <p className="notice notice-danger" role="alert">
          {problem}
        </p>
      )}
      {saved && (
        <p className="notice" role="status">
          Saved.
        </p>
      )}
      <div>
        <button className="btn" type="submit" disabled={formState.isSubmitting}>
          {instrument ? "Save" : "Add the instrument"}
        </button>
      </div>
    </IslandForm>
  );
}
