import { useState, type FormEvent } from "react";
import type { ProgramPoint } from "../../lib/chem/solvent-use";
import type { VariantEvaluation } from "../../lib/planning/types";
import { IslandForm } from "../forms/island-form";
import { postJson } from "../forms/post-json";
import EvaluationView from "./EvaluationView";
import type { Names } from "./names";

const MODIFIERS = [
  ["acetonitrile", "Acetonitrile"],
  ["methanol", "Methanol"],
  ["tetrahydrofuran", "Tetrahydrofuran"],
] as const;
type Modifier = (typeof MODIFIERS)[number][0];

export interface ColumnText {
  length_mm: string;
  diameter_mm: string;
  particle_um: string;
  dwell_mL: string;
}

interface Props {
  methodId: number;
  program: ProgramPoint[];
  /** The organic solvent the ledger shows on channel B (or acetonitrile). */
  organic: Modifier;
  fromColumn: ColumnText;
  /** The wavelength on the recipes the method ran with, as a starting value. */
  detection_nm: number | null;
  canSave: boolean;
  names: Names;
}

const num = (s: string) => (s.trim() === "" ? undefined : Number(s.replace(",", ".")));
const column = (c: ColumnText) => ({
  length_mm: num(c.length_mm),
  diameter_mm: num(c.diameter_mm),
  particle_um: num(c.particle_um),
  dwell_mL: num(c.dwell_mL),
});

function ColumnFields({
  legend,
  value,
  onChange,
  prefix,
}: {
  legend: string;
  value: ColumnText;
  onChange: (c: ColumnText) => void;
  prefix: string;
}) {
  const field = (key: keyof ColumnText, label: string) => (
    <label className="field">
      <span>{label}</span>
      <input
        className="input"
        inputMode="decimal"
        name={`${prefix}.${key}`}
        value={value[key]}
        onChange={(e) => onChange({ ...value, [key]: e.target.value })}
      />
    </label>
  );
  return (
    <fieldset className="grid grid-cols-2 gap-2 sm:grid-cols-4">
      <legend className="mb-1 text-sm font-semibold">{legend}</legend>
      {field("length_mm", "Length, mm")}
      {field("diameter_mm", "Inner diameter, mm")}
      {field("particle_um", "Particle size, µm")}
      {field("dwell_mL", "System dwell volume, mL")}
    </fieldset>
  );
}

/**
 * Proposes a variant of the method: another organic modifier at the same strength, another
 * column, or both; the server works it out against the ledger (nothing is saved) and it can then
 * be kept as a proposal.
 */
export default function VariantPlanner({ methodId, program, organic, fromColumn, detection_nm, canSave, names }: Props) {
  const [swap, setSwap] = useState(true);
  const [to, setTo] = useState<Modifier | "blend">(organic === "acetonitrile" ? "methanol" : "acetonitrile");
  const [blendMeOH, setBlendMeOH] = useState("50");
  const [move, setMove] = useState(false);
  const [from, setFrom] = useState<ColumnText>(fromColumn);
  const [target, setTarget] = useState<ColumnText>({ length_mm: "100", diameter_mm: "2.1", particle_um: "1.8", dwell_mL: "0.4" });
  const [keep, setKeep] = useState<"linear-velocity" | "reduced-velocity">("linear-velocity");
  const [injection, setInjection] = useState("10");
  const [detection, setDetection] = useState(detection_nm === null ? "" : String(detection_nm));
  const [runs, setRuns] = useState([
    { percentB: "", retention_min: "" },
    { percentB: "", retention_min: "" },
  ]);
  const [deadTime, setDeadTime] = useState("");
  const [name, setName] = useState("");
  const [result, setResult] = useState<{ evaluation: VariantEvaluation; body: object } | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  function body() {
    const scouting = runs.filter((r) => r.percentB.trim() !== "" || r.retention_min.trim() !== "");
    const other = MODIFIERS.find(([m]) => m !== organic && m !== "methanol")?.[0] ?? "acetonitrile";
    return {
      methodId,
      ...(swap
        ? {
            substitution: {
              from: organic,
              to:
                to === "blend" ? { methanol: num(blendMeOH), [organic === "methanol" ? other : organic]: 100 - (num(blendMeOH) ?? 0) } : to,
            },
          }
        : {}),
      ...(move ? { transfer: { from: column(from), to: column(target), keep, injection_uL: num(injection) } } : {}),
      ...(detection.trim() ? { detection_nm: num(detection) } : {}),
      ...(scouting.length || deadTime.trim()
        ? {
            scouting: {
              runs: scouting.map((r) => ({ percentB: num(r.percentB), retention_min: num(r.retention_min) })),
              deadTime_min: num(deadTime),
            },
          }
        : {}),
    };
  }

  async function workOut(event: FormEvent) {
    event.preventDefault();
    setBusy(true);
    setError(null);
    try {
      const b = body();
      setResult({ evaluation: await postJson<VariantEvaluation>("/api/planning/preview", b), body: b });
    } catch (e) {
      setResult(null);
      setError(e instanceof Error ? e.message : String(e));
    } finally {
      setBusy(false);
    }
  }

  async function keepIt() {
    if (!result) return;
    setBusy(true);
    setError(null);
    try {
      const { id } = await postJson<{ id: number }>("/api/planning/variants", {
        ...result.body,
        ...(name.trim() ? { name: name.trim() } : {}),
      });
      window.location.assign(`/planning/methods/${methodId}?kept=${id}#variant-${id}`);
    } catch (e) {
      setError(e instanceof Error ? e.message : String(e));
      setBusy(false);
    }
  }

  return (
    <section className="card flex flex-col gap-4 p-4" aria-labelledby="planner-title">
      <h2 id="planner-title">Propose a variant</h2>
      <IslandForm className="flex flex-col gap-4" onSubmit={workOut} aria-label="Variant">
        <label className="flex items-center gap-2">
          <input type="checkbox" name="swap" checked={swap} onChange={(e) => setSwap(e.target.checked)} />
          Change the organic solvent on channel B (now {names.reagents[organic] ?? organic}) at the same eluent strength
        </label>
        {swap && (
          <div className="flex flex-wrap items-end gap-3">
            <label className="field">
              <span>New organic solvent</span>
              <select className="input" name="to" value={to} onChange={(e) => setTo(e.target.value as Modifier | "blend")}>
                {MODIFIERS.filter(([m]) => m !== organic).map(([m, label]) => (
                  <option key={m} value={m}>
                    {label}
                  </option>
                ))}
                <option value="blend">A blend with methanol</option>
              </select>
            </label>
            {to === "blend" && (
              <label className="field">
                <span>Methanol in the blend, %</span>
                <input
                  className="input"
                  inputMode="decimal"
                  name="blendMethanol"
                  value={blendMeOH}
                  onChange={(e) => setBlendMeOH(e.target.value)}
                />
              </label>
            )}
          </div>
        )}
        <label className="flex items-center gap-2">
          <input type="checkbox" name="move" checked={move} onChange={(e) => setMove(e.target.checked)} />
          Move the method to another column
        </label>
        {move && (
          <div className="flex flex-col gap-3">
            <ColumnFields legend="Column and system now" value={from} onChange={setFrom} prefix="from" />
            <ColumnFields legend="New column and system" value={target} onChange={setTarget} prefix="to" />
            <div className="flex flex-wrap items-end gap-3">
              <label className="field">
                <span>Keep the same</span>
                <select className="input" name="keep" value={keep} onChange={(e) => setKeep(e.target.value as typeof keep)}>
                  <option value="linear-velocity">linear velocity</option>
                  <option value="reduced-velocity">reduced velocity (flow also × dp ratio)</option>
                </select>
              </label>
              <label className="field">
                <span>Injection volume now, µL</span>
                <input
                  className="input"
                  inputMode="decimal"
                  name="injection"
                  value={injection}
                  onChange={(e) => setInjection(e.target.value)}
                />
              </label>
            </div>
          </div>
        )}
        <details>
          <summary className="cursor-pointer text-sm">
            Detection wavelength{detection_nm !== null ? ` (${detection_nm} nm on the method's recipes)` : ""} and scouting runs (optional)
          </summary>
          <div className="mt-3 flex flex-wrap items-end gap-3">
            <label className="field">
              <span>Detection wavelength, nm</span>
              <input
                className="input"
                inputMode="numeric"
                name="detection"
                value={detection}
                onChange={(e) => setDetection(e.target.value)}
              />
            </label>
            <label className="field">
              <span>Dead time, min</span>
              <input className="input" inputMode="decimal" name="deadTime" value={deadTime} onChange={(e) => setDeadTime(e.target.value)} />
            </label>
            {runs.map((r, i) => (
              <div key={i} className="flex gap-2">
                <label className="field">
                  <span>Run {i + 1}: %B</span>
                  <input
                    className="input w-24"
                    inputMode="decimal"
                    value={r.percentB}
                    onChange={(e) => setRuns(runs.map((x, j) => (j === i ? { ...x, percentB: e.target.value } : x)))}
                  />
                </label>
                <label className="field">
                  <span>Run {i + 1}: last peak, min</span>
                  <input
                    className="input w-24"
                    inputMode="decimal"
                    value={r.retention_min}
                    onChange={(e) => setRuns(runs.map((x, j) => (j === i ? { ...x, retention_min: e.target.value } : x)))}
                  />
                </label>
              </div>
            ))}
          </div>
        </details>
        <div>
          <button type="submit" className="btn" disabled={busy}>
            Work it out
          </button>
        </div>
      </IslandForm>
      {error && (
        <p className="field-error" role="alert">
          {error}
        </p>
      )}
      {result && (
        <div className="flex flex-col gap-4 border-t border-[var(--color-rule)] pt-4" data-testid="preview">
          <EvaluationView evaluation={result.evaluation} current={program} channel="B" names={names} />
          {canSave && (
            <div className="flex flex-wrap items-end gap-3">
              <label className="field">
                <span>Name of the proposal (optional)</span>
                <input className="input" name="name" value={name} onChange={(e) => setName(e.target.value)} maxLength={120} />
              </label>
              <button type="button" className="btn" onClick={keepIt} disabled={busy}>
                Keep as a proposal
              </button>
            </div>
          )}
        </div>
      )}
    </section>
  );
}
