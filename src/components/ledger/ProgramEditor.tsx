import { useMemo, useState } from "react";
import { solventUse } from "../../lib/chem/solvent-use";
import { formatVolume } from "../../lib/format";
import { programChannels, rowsToProgram } from "../../lib/ledger/program";
import { fieldErrors } from "../../lib/schemas/zod-error";
import { methodSchema, programRowSchema, type ProgramRow } from "../../lib/schemas/methods";
import { errorMessage, postJson } from "../forms/post-json";
import ProgramChart from "./ProgramChart";
import { IslandForm } from "../forms/island-form";

type RowText = Record<keyof ProgramRow, string>;

interface Props {
  method?: { id: number; name: string; description: string | null; rows: ProgramRow[]; reEquilibration_min: number };
  canEdit: boolean;
}

const toText = (r: ProgramRow): RowText => ({
  time_min: String(r.time_min),
  flow_mL_min: String(r.flow_mL_min),
  B: String(r.B),
  C: String(r.C),
  D: String(r.D),
});
const EMPTY: ProgramRow[] = [
  { time_min: 0, flow_mL_min: 1, B: 5, C: 0, D: 0 },
  { time_min: 10, flow_mL_min: 1, B: 95, C: 0, D: 0 },
  { time_min: 12, flow_mL_min: 1, B: 95, C: 0, D: 0 },
];
const COLUMNS: { key: keyof ProgramRow; label: string; step: string }[] = [
  { key: "time_min", label: "Time, min", step: "0.1" },
  { key: "flow_mL_min", label: "Flow, mL/min", step: "0.01" },
  { key: "B", label: "%B", step: "0.1" },
  { key: "C", label: "%C", step: "0.1" },
  { key: "D", label: "%D", step: "0.1" },
];

/** The gradient table with its chart and the solvent per injection, computed as you type. */
export default function ProgramEditor({ method, canEdit }: Props) {
  const [name, setName] = useState(method?.name ?? "");
  const [description, setDescription] = useState(method?.description ?? "");
  const [reEq, setReEq] = useState(String(method?.reEquilibration_min ?? 0));
  const [rows, setRows] = useState<RowText[]>((method?.rows ?? EMPTY).map(toText));
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [status, setStatus] = useState<{ kind: "ok" | "error"; text: string } | null>(null);
  const [saving, setSaving] = useState(false);

  const parsedRows = rows.map((r) => programRowSchema.safeParse(r));
  const goodRows = parsedRows.flatMap((p) => (p.success ? [p.data] : []));
  const use = useMemo(() => {
    if (goodRows.length !== rows.length || goodRows.length < 2) return null;
    try {
      const program = rowsToProgram(goodRows);
      return { ...solventUse({ program }), channels: programChannels(program) };
    } catch {
      return null;
    }
  }, [JSON.stringify(goodRows), rows.length]);

  const setCell = (i: number, key: keyof ProgramRow, value: string) =>
    setRows((rs) => rs.map((r, j) => (j === i ? { ...r, [key]: value } : r)));
  const addRow = () =>
    setRows((rs) => [
      ...rs,
      { ...(rs[rs.length - 1] ?? toText(EMPTY[0]!)), time_min: String(Number(rs[rs.length - 1]?.time_min ?? 0) + 1) },
    ]);
  const removeRow = (i: number) => setRows((rs) => rs.filter((_, j) => j !== i));

  async function save(event: React.FormEvent) {
    event.preventDefault();
    setStatus(null);
    const parsed = methodSchema.safeParse({ name, description, rows, reEquilibration_min: reEq });
    if (!parsed.success) {
      setErrors(fieldErrors(parsed.error));
      setStatus({ kind: "error", text: "Some cells need attention (marked in red)." });
      return;
    }
    setErrors({});
    setSaving(true);
    try {
      const body = { name, description, rows: parsed.data.rows, reEquilibration_min: parsed.data.reEquilibration_min };
      const result = method
        ? await postJson<{ id: number }>(`/api/methods/${method.id}`, body, "PUT")
        : await postJson<{ id: number }>("/api/methods", body);
      if (!method) window.location.assign(`/methods/${result.id}`);
      else setStatus({ kind: "ok", text: "Saved. Runs already logged keep the volumes they were recorded with." });
    } catch (error) {
      setStatus({ kind: "error", text: errorMessage(error) });
    } finally {
      setSaving(false);
    }
  }

  return (
    <IslandForm onSubmit={save} noValidate className="flex flex-col gap-5" aria-label="Method">
      <div className="grid gap-4 md:grid-cols-2">
        <div className="field">
          <label htmlFor="method-name">Name</label>
          <input
            id="method-name"
            className="input"
            value={name}
            onChange={(e) => setName(e.target.value)}
            disabled={!canEdit}
            aria-invalid={errors.name ? true : undefined}
          />
          {errors.name && (
            <p className="field-error" role="alert">
              {errors.name}
            </p>
          )}
        </div>
        <div className="field">
          <label htmlFor="method-reeq">Re-equilibration, min</label>
          <input
            id="method-reeq"
            className="input"
            inputMode="decimal"
            value={reEq}
            onChange={(e) => setReEq(e.target.value)}
            disabled={!canEdit}
          />
          <p className="text-xs text-[var(--color-muted)]">
            The return to starting conditions is part of the program's last rows; this says how much of it is re-equilibration.
          </p>
        </div>
        <div className="field md:col-span-2">
          <label htmlFor="method-description">Description</label>
          <input
            id="method-description"
            className="input"
            value={description}
            onChange={(e) => setDescription(e.target.value)}
            disabled={!canEdit}
          />
        </div>
      </div>

      <div className="grid gap-6 2xl:grid-cols-[minmax(0,1.15fr)_minmax(0,1fr)]">
        <div className="card overflow-x-auto p-3">
          <table className="table" aria-label="Gradient program">
            <thead>
              <tr>
                <th scope="col">#</th>
                {COLUMNS.map((c) => (
                  <th key={c.key} scope="col" className="num">
                    {c.label}
                  </th>
                ))}
                <th scope="col" className="num">
                  %A
                </th>
                {canEdit && (
                  <th scope="col">
                    <span className="sr-only">Remove</span>
                  </th>
                )}
              </tr>
            </thead>
            <tbody>
              {rows.map((r, i) => {
                const a = 100 - Number(r.B || 0) - Number(r.C || 0) - Number(r.D || 0);
                return (
                  <tr key={i}>
                    <td className="num">{i + 1}</td>
                    {COLUMNS.map((c) => {
                      const error = errors[`rows.${i}.${c.key}`];
                      return (
                        <td key={c.key} className="num">
                          <input
                            className="input w-[4.25rem] px-2 text-right"
                            inputMode="decimal"
                            aria-label={`Row ${i + 1} ${c.label}`}
                            value={r[c.key]}
                            disabled={!canEdit}
                            aria-invalid={error ? true : undefined}
                            title={error}
                            onChange={(e) => setCell(i, c.key, e.target.value)}
                          />
                          {error && <span className="field-error block text-left">{error}</span>}
                        </td>
                      );
                    })}
                    <td className="num" style={{ color: a < 0 ? "var(--color-danger)" : undefined }}>
                      {Number.isFinite(a) ? Number(a.toFixed(3)) : "–"}
                    </td>
                    {canEdit && (
                      <td>
                        <button
                          type="button"
                          className="btn btn-quiet px-2 py-1 text-xs"
                          onClick={() => removeRow(i)}
                          disabled={rows.length <= 2}
                          aria-label={`Remove row ${i + 1}`}
                        >
                          ✕
                        </button>
                      </td>
                    )}
                  </tr>
                );
              })}
            </tbody>
          </table>
          {errors.rows && <p className="field-error">{errors.rows}</p>}
          {canEdit && (
            <button type="button" className="btn btn-quiet mt-3" onClick={addRow}>
              Add a row
            </button>
          )}
        </div>
        <div className="flex flex-col gap-4">
          <ProgramChart rows={goodRows} />
          <div className="card p-4" aria-live="polite">
            <h2 className="mb-2">Solvent per injection</h2>
            {use ? (
              <dl className="grid grid-cols-[auto_1fr] gap-x-6 gap-y-1 text-sm" data-testid="per-injection">
                {Object.entries(use.byChannel_mL).map(([ch, v]) => (
                  <div key={ch} className="contents">
                    <dt>Channel {ch}</dt>
                    <dd className="num">
                      {formatVolume(v)} <span className="text-[var(--color-muted)]">· {formatVolume(v * 100)} per 100</span>
                    </dd>
                  </div>
                ))}
                <dt className="font-semibold">Total to waste</dt>
                <dd className="num font-semibold">
                  {formatVolume(use.total_mL)}{" "}
                  <span className="font-normal text-[var(--color-muted)]">· {formatVolume(use.total_mL * 100)} per 100</span>
                </dd>
              </dl>
            ) : (
              <p className="text-sm text-[var(--color-muted)]">Fill in every cell to see the volumes.</p>
            )}
            <p className="mt-2 text-xs text-[var(--color-muted)]">
              Flow and composition change linearly between rows, as the pump delivers them; each injection runs the whole program once.
            </p>
          </div>
        </div>
      </div>

      {status && (
        <p className={status.kind === "ok" ? "notice" : "notice notice-danger"} role={status.kind === "ok" ? "status" : "alert"}>
          {status.text}
        </p>
      )}
      {canEdit && (
        <div>
          <button className="btn" type="submit" disabled={saving}>
            {saving ? "Saving…" : method ? "Save the method" : "Create the method"}
          </button>
        </div>
      )}
    </IslandForm>
  );
}
