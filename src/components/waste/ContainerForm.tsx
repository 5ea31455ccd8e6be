import { useState } from "react";
import { containerSchema, type ContainerInput } from "../../lib/schemas/waste";
import { Field, SelectField, useZodForm } from "../forms/form";
import { IslandForm } from "../forms/island-form";
import { postJson } from "../forms/post-json";
import type { ContainerView, InstrumentChoice, StreamView } from "../../lib/waste/types";

interface Props {
  /** Editing this container; creating a new one when absent. */
  containerId?: number;
  initial?: Partial<ContainerInput>;
  streams: Pick<StreamView, "id" | "name">[];
  instruments: Pick<InstrumentChoice, "id" | "name" | "room" | "containerCode">[];
}

const LOCATION_LABELS = { room: "In the room", satellite_area: "Satellite accumulation area", instrument: "At an instrument" } as const;
const orNull = (v: unknown) => (typeof v === "string" && v.trim() === "" ? null : v);

export default function ContainerForm({ containerId, initial = {}, streams, instruments }: Props) {
  const { register, handleSubmit, formState } = useZodForm<ContainerInput>(containerSchema, {
    defaultValues: { locationKind: "instrument", locationNote: null, instrumentId: null, ...initial },
  });
  const [problem, setProblem] = useState<string | null>(null);
  const onSubmit = handleSubmit(async (values) => {
    setProblem(null);
    try {
      const { container } = await postJson<{ container: ContainerView }>(
        containerId ? `/api/waste/containers/${containerId}` : "/api/waste/containers",
        values,
        containerId ? "PUT" : "POST",
      );
      window.location.assign(`/waste/containers/${container.id}`);
    } catch (error) {
      setProblem(error instanceof Error ? error.message : String(error));
    }
  });
  const e = formState.errors;
  return (
    <IslandForm
      onSubmit={onSubmit}
      noValidate
      className="grid gap-4 sm:grid-cols-2"
      aria-label={containerId ? "Edit container" : "New container"}
    >
      <Field
        label="Container code"
        registration={register("code")}
        error={e.code?.message}
        placeholder="WC-0110"
        hint="Decant's own code; it is printed as a barcode on the container label."
      />
      <SelectField
        label="Waste stream"
        registration={register("streamId")}
        error={e.streamId?.message}
        options={streams.map((s) => ({ value: s.id, label: s.name }))}
        placeholder="Choose a stream…"
      />
      <Field
        label="Capacity (mL)"
        type="number"
        inputMode="numeric"
        min={100}
        step={1}
        registration={register("capacity_mL")}
        error={e.capacity_mL?.message}
      />
      <Field label="Room" registration={register("room")} error={e.room?.message} placeholder="B2.14" />
      <SelectField
        label="Location"
        registration={register("locationKind")}
        error={e.locationKind?.message}
        options={Object.entries(LOCATION_LABELS).map(([value, label]) => ({ value, label }))}
      />
      <Field
        label="Where exactly (optional)"
        registration={register("locationNote", { setValueAs: orNull })}
        error={e.locationNote?.message}
        placeholder="Under Wren, left side"
      />
      <SelectField
        label="Instrument draining into it"
        registration={register("instrumentId", { setValueAs: (v) => (v === "" || v === null ? null : Number(v)) })}
        error={e.instrumentId?.message}
        options={instruments.map((i) => ({
          value: i.id,
          label: `${i.name} (${i.room})${i.containerCode ? ` · now drains to ${i.containerCode}` : ""}`,
        }))}
        placeholder="None"
      />
      <p className="self-end text-xs text-[var(--color-muted)]">
        An instrument drains to one container at a time: choosing it here moves it from its current container.
      </p>
      {problem && (
        <p className="notice notice-danger sm:col-span-2" role="alert">
          {problem}
        </p>
      )}
      <div className="sm:col-span-2">
        <button className="btn" type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? "Saving…" : containerId ? "Save changes" : "Add container"}
        </button>
      </div>
    </IslandForm>
  );
}
