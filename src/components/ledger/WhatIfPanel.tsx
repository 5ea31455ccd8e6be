import { useMemo, useState } from "react";
import type { ProgramPoint, SolventUseResult } from "../../lib/chem/solvent-use";
import { ChemInputError } from "../../lib/chem/warnings";
import { formatNumber, formatVolume } from "../../lib/format";
import { whatIf, type WhatIfResult } from "../../lib/ledger/what-if";
import { HydratedControls } from "../forms/island-form";
import { errorMessage } from "../forms/post-json";

interface Props {
  /** The method's saved program. */
  program: ProgramPoint[];
  /** The method's re-equilibration, min: the margin's starting value. */
  reEquilibration_min: number;
}

type RunText = { percentB: string; retention_min: string };

const num = (s: string) => (s.trim() === "" ? Number.NaN : Number(s.replace(",", ".")));
const min = (v: number) => `${formatNumber(v, 2)} min`;
const sign = (v: number) => (v > 0 ? "+" : v < 0 ? "−" : "±");

/** The solvent (and waste) of one scenario, per injection and per 100. */
function Volumes({
  use,
  per100,
  testId,
  compareTo,
}: {
  use: SolventUseResult;
  per100: SolventUseResult;
  testId: string;
  compareTo?: SolventUseResult;
}) {
  const diff = compareTo ? per100.total_mL - compareTo.total_mL : null;
  return (
    <table className="table mt-2 text-sm" data-testid={testId}>
      <thead>
        <tr>
          <th scope="col">Channel</th>
          <th scope="col" className="num">
            per injection
          </th>
          <th scope="col" className="num">
            per 100 injections
          </th>
        </tr>
      </thead>
      <tbody>
        {Object.entries(use.byChannel_mL)
          .filter(([, v]) => v > 1e-9)
          .map(([ch, v]) => (
            <tr key={ch}>
              <td>{ch}</td>
              <td className="num">{formatVolume(v)}</td>
              <td className="num">{formatVolume(per100.byChannel_mL[ch] ?? 0)}</td>
            </tr>
          ))}
        <tr className="font-semibold">
          <td>Total, all to waste</td>
          <td className="num">{formatVolume(use.total_mL)}</td>
          <td className="num" data-testid={`${testId}-per100`}>
            {formatVolume(per100.total_mL)}
            {diff !== null && (
              <div className="text-xs font-normal text-[var(--color-muted)]">
                {sign(diff)} {formatVolume(Math.abs(diff))} against the method now
              </div>
            )}
          </td>
        </tr>
      </tbody>
    </table>
  );
}

/**
 * What-if on a method: Snyder's LSS model fitted to scouting runs predicts the last peak at
 * another %B and under the method's gradient, and so the run time and the solvent it costs.
 */
export default function WhatIfPanel({ program, reEquilibration_min }: Props) {
  const [runs, setRuns] = useState<RunText[]>([
    { percentB: "", retention_min: "" },
    { percentB: "", retention_min: "" },
  ]);
  const [t0, setT0] = useState("1.0");
  const [dwell, setDwell] = useState("1.0");
  const [target, setTarget] = useState("40");
  const [margin, setMargin] = useState(String(reEquilibration_min > 0 ? reEquilibration_min : 3));

  const outcome = useMemo((): { result: WhatIfResult } | { error: string; field?: string } | null => {
    const filled = runs.filter((r) => r.percentB.trim() !== "" || r.retention_min.trim() !== "");
    if (filled.length < 2) return null;
    const values = { t0: num(t0), dwell: num(dwell), target: num(target), margin: num(margin) };
    if (!(values.t0 > 0)) return { error: "Dead time: enter a time above 0 min.", field: "t0" };
    if (!(values.target >= 0 && values.target <= 100)) return { error: "Target %B: enter 0–100.", field: "target" };
    if (!(values.margin >= 0)) return { error: "Margin: enter 0 min or more.", field: "margin" };
    if (!(values.dwell >= 0)) return { error: "Dwell volume: enter 0 mL or more.", field: "dwell" };
    try {
      const scouting = runs.map((r) => ({ percentB: num(r.percentB), retention_min: num(r.retention_min) }));
      return {
        result: whatIf({
          runs: scouting,
          deadTime_min: values.t0,
          targetPercentB: values.target,
          margin_min: values.margin,
          program,
          dwell_mL: values.dwell,
        }),
      };
    } catch (error) {
      if (error instanceof ChemInputError) {
        const m = /^runs\[(\d+)\]\.(\w+)/.exec(error.field ?? "");
        const where = m ? `Scouting run ${Number(m[1]) + 1}, ${m[2] === "percentB" ? "%B" : "last peak"}: ` : "";
        return { error: `${where}${error.message.replace(/^runs\[\d+\]\.\w+ /, "")}`, ...(error.field ? { field: error.field } : {}) };
      }
      return { error: errorMessage(error) };
    }
  }, [JSON.stringify(runs), t0, dwell, target, margin, program]);

  const setRun = (i: number, key: keyof RunText, value: string) =>
    setRuns((rs) => rs.map((r, j) => (j === i ? { ...r, [key]: value } : r)));
  const result = outcome && "result" in outcome ? outcome.result : null;
  const error = outcome && "error" in outcome ? outcome : null;

  return (
    <section className="card mt-6 flex flex-col gap-4 p-4" aria-labelledby="what-if-title">
      <HydratedControls>
        <div>
          <h2 id="what-if-title">What if the eluent were weaker or stronger?</h2>
          <p className="mt-1 text-sm text-[var(--color-muted)]">
            Enter two or more isocratic scouting runs (the %B and when the last peak left) and the column's dead time. Snyder's
            linear-solvent-strength (LSS) model, log k = log k<sub>w</sub> − S·φ, is fitted to them and predicts the last peak, the run time
            and the solvent, computed here as you type.
          </p>
        </div>

        <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_minmax(0,1.3fr)]">
          <div className="flex flex-col gap-3">
            <table className="table" aria-label="Scouting runs">
              <thead>
                <tr>
                  <th scope="col">Run</th>
                  <th scope="col" className="num">
                    %B
                  </th>
                  <th scope="col" className="num">
                    Last peak, min
                  </th>
                  <th scope="col">
                    <span className="sr-only">Remove</span>
                  </th>
                </tr>
              </thead>
              <tbody>
                {runs.map((r, i) => (
                  <tr key={i}>
                    <td className="num">{i + 1}</td>
                    <td className="num">
                      <input
                        className="input w-20 px-2 text-right"
                        inputMode="decimal"
                        aria-label={`Scouting run ${i + 1} %B`}
                        value={r.percentB}
                        onChange={(e) => setRun(i, "percentB", e.target.value)}
                      />
                    </td>
                    <td className="num">
                      <input
                        className="input w-24 px-2 text-right"
                        inputMode="decimal"
                        aria-label={`Scouting run ${i + 1} last peak, min`}
                        value={r.retention_min}
                        onChange={(e) => setRun(i, "retention_min", e.target.value)}
                      />
                    </td>
                    <td>
                      <button
                        type="button"
                        className="btn btn-quiet px-2 py-1 text-xs"
                        disabled={runs.length <= 2}
                        onClick={() => setRuns((rs) => rs.filter((_, j) => j !== i))}
                        aria-label={`Remove scouting run ${i + 1}`}
                      >
                        ✕
                      </button>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
            <div>
              <button type="button" className="btn btn-quiet" onClick={() => setRuns((rs) => [...rs, { percentB: "", retention_min: "" }])}>
                Add a scouting run
              </button>
            </div>
            <div className="grid grid-cols-2 gap-3">
              <div className="field">
                <label htmlFor="wi-t0">
                  Dead time t<sub>0</sub>, min
                </label>
                <input
                  id="wi-t0"
                  className="input"
                  inputMode="decimal"
                  value={t0}
                  onChange={(e) => setT0(e.target.value)}
                  aria-invalid={error?.field === "t0" || error?.field === "deadTime_min" ? true : undefined}
                />
              </div>
              <div className="field">
                <label htmlFor="wi-target">Predict at %B</label>
                <input
                  id="wi-target"
                  className="input"
                  inputMode="decimal"
                  value={target}
                  onChange={(e) => setTarget(e.target.value)}
                  aria-invalid={error?.field === "target" ? true : undefined}
                />
              </div>
              <div className="field">
                <label htmlFor="wi-margin">Margin after the last peak, min</label>
                <input id="wi-margin" className="input" inputMode="decimal" value={margin} onChange={(e) => setMargin(e.target.value)} />
                <p className="text-xs text-[var(--color-muted)]">Wash, return to start and re-equilibration.</p>
              </div>
              <div className="field">
                <label htmlFor="wi-dwell">Dwell volume, mL</label>
                <input id="wi-dwell" className="input" inputMode="decimal" value={dwell} onChange={(e) => setDwell(e.target.value)} />
                <p className="text-xs text-[var(--color-muted)]">Mixer to column head; gradient methods only.</p>
              </div>
            </div>
          </div>

          <div className="flex flex-col gap-3" aria-live="polite">
            {!outcome && <p className="text-sm text-[var(--color-muted)]">Fill in at least two scouting runs to see the prediction.</p>}
            {error && (
              <p className="notice notice-danger" role="alert">
                {error.error}
              </p>
            )}
            {result && (
              <>
                <p className="text-sm" data-testid="what-if-fit">
                  Fit: S = <span className="num">{result.fit.S.toFixed(2)}</span>, log k<sub>w</sub> ={" "}
                  <span className="num">{result.fit.logKw.toFixed(2)}</span>
                  {runs.length > 2 && (
                    <>
                      , r² = <span className="num">{result.fit.r2.toFixed(4)}</span>
                    </>
                  )}
                  .
                </p>
                <div className="rounded border border-[var(--color-rule)] p-3">
                  <h3 className="font-semibold">Isocratic at {num(target)} %B</h3>
                  <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-6 gap-y-1 text-sm">
                    <dt>Last peak (k = {result.isocratic.k.toFixed(2)})</dt>
                    <dd className="num" data-testid="what-if-iso-retention">
                      {min(result.isocratic.retention_min)}
                    </dd>
                    <dt>Run time (+ margin)</dt>
                    <dd className="num" data-testid="what-if-iso-runtime">
                      {min(result.isocratic.runTime_min)}
                    </dd>
                  </dl>
                  <Volumes
                    use={result.isocratic.perInjection}
                    per100={result.isocratic.per100}
                    compareTo={result.current.per100}
                    testId="what-if-iso"
                  />
                  <p className="mt-1 text-xs text-[var(--color-muted)]">
                    Assumes the method run isocratically on A and B at {num(target)} %B and its initial flow ({program[0]?.flow_mL_min ?? 0}{" "}
                    mL/min) for the whole run time.
                  </p>
                </div>
                {result.gradient && (
                  <div className="rounded border border-[var(--color-rule)] p-3">
                    <h3 className="font-semibold">
                      Under the method's gradient ({result.gradient.segment.from_percentB} → {result.gradient.segment.to_percentB} %B,{" "}
                      {min(result.gradient.segment.end_min - result.gradient.segment.start_min)})
                    </h3>
                    <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-6 gap-y-1 text-sm">
                      <dt>
                        Last peak (k* = {result.gradient.kStar.toFixed(2)}, b = {result.gradient.b.toFixed(3)})
                      </dt>
                      <dd className="num" data-testid="what-if-gradient-retention">
                        {min(result.gradient.retention_min)}
                      </dd>
                      <dt>Run time (+ margin)</dt>
                      <dd className="num">
                        {min(result.gradient.runTime_min)}{" "}
                        <span className="text-[var(--color-muted)]">· now {min(result.current.runTime_min)}</span>
                      </dd>
                    </dl>
                    <Volumes
                      use={result.gradient.perInjection}
                      per100={result.gradient.per100}
                      compareTo={result.current.per100}
                      testId="what-if-gradient"
                    />
                    <p className="mt-1 text-xs text-[var(--color-muted)]">
                      Assumes the gradient keeps its slope and the program ends after the last peak: it is cut there (or held at the final
                      composition if the peak leaves later), and the rows after the gradient (wash, return, re-equilibration) are stretched
                      or shrunk to fill the margin. Rows before the gradient count as dwell ({min(result.gradient.dwell_min)} from the dwell
                      volume).
                    </p>
                  </div>
                )}
                <p className="text-xs text-[var(--color-muted)]">
                  The method as saved: {min(result.current.runTime_min)}, {formatVolume(result.current.perInjection.total_mL)} per
                  injection, {formatVolume(result.current.per100.total_mL)} per 100. Everything the pump delivers goes to the instrument's
                  waste container.
                </p>
                {result.warnings.map((w) => (
                  <p key={w} className="notice">
                    {w}
                  </p>
                ))}
              </>
            )}
          </div>
        </div>

        <p className="notice text-sm" data-testid="what-if-caveat">
          A model, not a measurement: LSS assumes log k falls linearly with %B (S ≈ 4 for small molecules; rule of thumb: −10 % B raises k
          about 2.5–3×, Snyder, Kirkland &amp; Dolan 2010), and the last peak may not stay the last peak, nor the critical pair resolved. A
          change to a method must be verified, and validated where required, under your laboratory's procedures before it is used.
        </p>
      </HydratedControls>
    </section>
  );
}
