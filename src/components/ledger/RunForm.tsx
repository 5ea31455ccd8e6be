import { useEffect, useMemo, useState } from "react";
// The module itself, not the chem index, which would ship the reagent catalogue to this page.
import { solventUse, type ProgramPoint } from "../../lib/chem/solvent-use";
import { formatVolume, localInputValue, zoneName } from "../../lib/format";
import { programChannels } from "../../lib/ledger/program";
import type { LoggedRun, ProjectChoice, UsableBatch } from "../../lib/ledger/types";
import { CHANNELS } from "../../lib/schemas/fields";
import { runFormSchema, type RunInput } from "../../lib/schemas/runs";
import { Field, SelectField, useZodForm } from "../forms/form";
import { newKey } from "../forms/idempotency-key";
import { IslandForm } from "../forms/island-form";
import { postJson } from "../forms/post-json";
import { useServerErrors } from "../forms/server-errors";

interface Props {
  instruments: { id: number; name: string; channels: string[]; wasteContainerCode: string | null }[];
  methods: { id: number; name: string; program: ProgramPoint[] }[];
  projects: ProjectChoice[];
  batches: Omit<UsableBatch, "expiresAt">[];
  /** The facility's zone and locale: the start time is typed as its wall-clock time. */
  facility: { timeZone: string; locale: string };
}

/** Log a sequence: the volumes follow from the method's program, live, before anything is sent. */
export default function RunForm({ instruments, methods, projects, batches: initialBatches, facility }: Props) {
  const form = useZodForm<RunInput>(runFormSchema(facility.timeZone));
  const nowInput = () => localInputValue(new Date(), facility.timeZone) as unknown as Date;
  const { register, handleSubmit, formState, watch, setValue, reset } = form;
  const showServerError = useServerErrors(form);
  const [batches, setBatches] = useState(initialBatches);
  const [answer, setAnswer] = useState<LoggedRun | null>(null);
  const [problem, setProblem] = useState<string | null>(null);

  useEffect(() => {
    setValue("idempotencyKey", newKey("run"));
    setValue("startedAt", nowInput());
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [setValue]);

  const instrumentId = Number(watch("instrumentId"));
  const methodId = Number(watch("methodId"));
  const injections = Number(watch("injections") ?? 0);
  const blanks = Number(watch("blanks") || 0);
  const purge = Number(watch("purge_mL") || 0);
  const instrument = instruments.find((i) => i.id === instrumentId);
  const method = methods.find((m) => m.id === methodId);
  const channels = instrument?.channels ?? [];
  const preview = useMemo(() => {
    if (!method || !Number.isInteger(injections) || injections < 1 || !Number.isInteger(blanks) || blanks < 0 || !(purge >= 0)) return null;
    try {
      const use = solventUse({ program: method.program, injections: injections + blanks });
      const needed = programChannels(method.program);
      return Object.fromEntries(needed.map((ch) => [ch, (use.byChannel_mL[ch] ?? 0) + purge]));
    } catch {
      return null;
    }
  }, [method, injections, blanks, purge]);

  const onSubmit = handleSubmit(async (values) => {
    setProblem(null);
    try {
      const result = await postJson<LoggedRun>("/api/runs", { ...values, startedAt: values.startedAt.toISOString() });
      setAnswer(result);
      setBatches((bs) =>
        bs.map((b) => ({ ...b, remaining_mL: result.batches.find((x) => x.id === b.id)?.remaining_mL ?? b.remaining_mL })),
      );
      reset({ ...values, startedAt: nowInput(), idempotencyKey: newKey("run") });
    } catch (error) {
      setProblem(showServerError(error));
    }
  });

  const e = formState.errors;
  return (
    <div className="grid gap-6 lg:grid-cols-[minmax(0,1.4fr)_minmax(0,1fr)]">
      <IslandForm method="post" onSubmit={onSubmit} noValidate className="card flex flex-col gap-4 p-5" aria-label="Log a run">
        <input type="hidden" {...register("idempotencyKey")} />
        <div className="grid gap-4 md:grid-cols-2">
          <SelectField
            label="Instrument"
            placeholder="Choose…"
            options={instruments.map((i) => ({ value: i.id, label: i.name }))}
            registration={register("instrumentId")}
            error={e.instrumentId?.message}
          />
          <SelectField
            label="Method"
            placeholder="Choose…"
            options={methods.map((m) => ({ value: m.id, label: m.name }))}
            registration={register("methodId")}
            error={e.methodId?.message}
          />
          <SelectField
            label="Project"
            placeholder="Choose…"
            options={projects.map((p) => ({ value: p.id, label: `${p.code} · ${p.name}` }))}
            registration={register("projectId")}
            error={e.projectId?.message}
          />
          <Field
            label={`Start time (${facility.timeZone}, ${zoneName(new Date(), facility)})`}
            type="datetime-local"
            lang={facility.locale}
            registration={register("startedAt")}
            error={e.startedAt?.message}
            hint="The facility's local time. In the hour the clocks go back, the first occurrence is meant."
          />
          <Field label="Injections" inputMode="numeric" registration={register("injections")} error={e.injections?.message} />
          <Field label="Extra blanks" inputMode="numeric" placeholder="0" registration={register("blanks")} error={e.blanks?.message} />
          <Field
            label="Purge / prime per channel, mL"
            inputMode="decimal"
            placeholder="0"
            registration={register("purge_mL")}
            error={e.purge_mL?.message}
          />
          <Field
            label="Sequence name (optional)"
            registration={register("reference")}
            error={e.reference?.message}
            hint="Unique per instrument; a CSV import recognises runs by it."
          />
        </div>
        <fieldset className="flex flex-col gap-3">
          <legend className="mb-1 text-sm font-semibold">Batch on each channel</legend>
          {channels.length === 0 && <p className="text-sm text-[var(--color-muted)]">Choose the instrument first.</p>}
          <div className="grid gap-4 md:grid-cols-2">
            {CHANNELS.filter((ch) => channels.includes(ch)).map((ch) => (
              <SelectField
                key={ch}
                label={`Channel ${ch}${preview?.[ch] !== undefined ? ` · needs ${formatVolume(preview[ch]!)}` : ""}`}
                placeholder="Not used"
                options={batches.map((b) => ({
                  value: b.id,
                  label: `${b.code} · ${b.name} · ${formatVolume(b.remaining_mL)} left`,
                  // The exact mL left, for tests.
                  data: { ml: b.remaining_mL },
                }))}
                registration={register(`channelBatches.${ch}`)}
                error={(e.channelBatches as Record<string, { message?: string }> | undefined)?.[ch]?.message}
              />
            ))}
          </div>
          {e.channelBatches?.root?.message && (
            <p className="field-error" role="alert">
              {e.channelBatches.root.message}
            </p>
          )}
          {(e.channelBatches as { message?: string } | undefined)?.message && (
            <p className="field-error" role="alert">
              {(e.channelBatches as { message?: string }).message}
            </p>
          )}
        </fieldset>
        {problem && (
          <p className="notice notice-danger" role="alert">
            {problem}
          </p>
        )}
        <div>
          <button className="btn" type="submit" disabled={formState.isSubmitting}>
            {formState.isSubmitting ? "Recording…" : "Record the run"}
          </button>
        </div>
      </IslandForm>

      <aside className="flex flex-col gap-4" aria-live="polite">
        <div className="card p-4">
          <h2 className="mb-2">This run will pump</h2>
          {preview ? (
            <dl className="grid grid-cols-[auto_1fr] gap-x-6 gap-y-1 text-sm">
              {Object.entries(preview).map(([ch, v]) => (
                <div key={ch} className="contents">
                  <dt>Channel {ch}</dt>
                  <dd className="num">{formatVolume(v)}</dd>
                </div>
              ))}
              <dt className="font-semibold">To waste{instrument?.wasteContainerCode ? ` (${instrument.wasteContainerCode})` : ""}</dt>
              <dd className="num font-semibold">{formatVolume(Object.values(preview).reduce((a, b) => a + b, 0))}</dd>
            </dl>
          ) : (
            <p className="text-sm text-[var(--color-muted)]">Choose a method and the number of injections.</p>
          )}
          <p className="mt-2 text-xs text-[var(--color-muted)]">
            Each injection and blank runs the method's whole program; the purge volume is added to each channel in use.
          </p>
        </div>
        {answer && (
          <div className="card border-[var(--color-ok)] p-4" role="status" data-testid="run-recorded">
            <h2 className="mb-2">{answer.replayed ? "Already recorded" : "Run recorded"}</h2>
            <p className="text-sm">
              {formatVolume(answer.run.total_mL)} for {answer.run.projectCode}.{" "}
              <a href={`/runs/${answer.run.id}`}>See the ledger entries</a>.
            </p>
            <ul className="mt-2 text-sm">
              {answer.batches.map((b) => (
                <li key={b.id}>
                  <code>{b.code}</code>:{" "}
                  <span className="num" data-testid={`left-${b.code}`} data-ml={b.remaining_mL}>
                    {formatVolume(b.remaining_mL)}
                  </span>{" "}
                  left
                </li>
              ))}
            </ul>
          </div>
        )}
      </aside>
    </div>
  );
}
