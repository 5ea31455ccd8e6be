import { formatMoney } from "../../lib/billing/money";
import { formatNumber } from "../../lib/format";
import type { GreennessSummary, VariantEvaluation } from "../../lib/planning/types";
import type { ProgramPoint } from "../../lib/chem/solvent-use";
import { litres, reagentName, streamName, type Names } from "./names";

const money = (m: { amount: number; currency: string } | null) => (m ? formatMoney(m) : "no rate");
const min = (v: number) => `${formatNumber(v, 2)} min`;
const sum = (r: Record<string, number>) => Object.values(r).reduce((a, v) => a + v, 0);

/** The program before and after, point by point, on the organic channel. */
function ProgramTable({ before, after, channel }: { before: ProgramPoint[]; after: ProgramPoint[]; channel: string }) {
  const rows = Math.max(before.length, after.length);
  return (
    <table className="table text-sm [&_td]:whitespace-nowrap" data-testid="variant-program">
      <caption className="sr-only">Program of the method and of the variant</caption>
      <thead>
        <tr>
          <th scope="col">Method now: time</th>
          <th scope="col" className="num">
            flow
          </th>
          <th scope="col" className="num">
            %{channel}
          </th>
          <th scope="col">Variant: time</th>
          <th scope="col" className="num">
            flow
          </th>
          <th scope="col" className="num">
            %{channel}
          </th>
        </tr>
      </thead>
      <tbody>
        {Array.from({ length: rows }, (_, i) => {
          const a = before[i];
          const b = after[i];
          return (
            <tr key={i}>
              <td>{a ? min(a.time_min) : ""}</td>
              <td className="num">{a ? `${formatNumber(a.flow_mL_min, 3)} mL/min` : ""}</td>
              <td className="num">{a ? formatNumber(a.composition[channel] ?? 0, 1) : ""}</td>
              <td>{b ? min(b.time_min) : ""}</td>
              <td className="num">{b ? `${formatNumber(b.flow_mL_min, 3)} mL/min` : ""}</td>
              <td className="num">{b ? formatNumber(b.composition[channel] ?? 0, 1) : ""}</td>
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}

/** Greenness of the method and of its variants side by side, per 100 injections. */
export function GreennessTable({ columns, names }: { columns: { label: string; g: GreennessSummary }[]; names: Names }) {
  const reagents = [...new Set(columns.flatMap((c) => Object.keys(c.g.per100_mL)))];
  const streams = [...new Set(columns.flatMap((c) => Object.keys(c.g.waste100_mL)))];
  return (
    <div className="overflow-x-auto">
      <table className="table text-sm [&_td]:whitespace-nowrap" data-testid="greenness">
        <caption className="sr-only">Greenness per 100 injections</caption>
        <thead>
          <tr>
            <th scope="col">Per 100 injections</th>
            {columns.map((c) => (
              <th scope="col" className="num" key={c.label}>
                {c.label}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          <tr>
            <th scope="row">Solvent per injection</th>
            {columns.map((c) => (
              <td className="num" key={c.label}>
                {formatNumber(sum(c.g.perInjection_mL), 2)} mL
              </td>
            ))}
          </tr>
          {reagents.map((r) => (
            <tr key={r}>
              <th scope="row" className="font-normal">
                {reagentName(names, r)}
              </th>
              {columns.map((c) => (
                <td className="num" key={c.label}>
                  {litres(c.g.per100_mL[r] ?? 0)}
                </td>
              ))}
            </tr>
          ))}
          {streams.map((s) => (
            <tr key={s}>
              <th scope="row" className="font-normal">
                Waste: {streamName(names, s)}
              </th>
              {columns.map((c) => (
                <td className="num" key={c.label}>
                  {litres(c.g.waste100_mL[s] ?? 0)}
                </td>
              ))}
            </tr>
          ))}
          <tr>
            <th scope="row">Cost at today's rates</th>
            {columns.map((c) => (
              <td className="num" key={c.label}>
                {money(c.g.cost100)}
              </td>
            ))}
          </tr>
          <tr>
            <th scope="row">
              <abbr title={columns[0]?.g.score.source}>HPLC-EAT</abbr> per analysis <span className="font-normal">(lower is greener)</span>
            </th>
            {columns.map((c) => (
              <td className="num" key={c.label} data-testid="eat">
                {formatNumber(c.g.score.value, 1)}
              </td>
            ))}
          </tr>
        </tbody>
      </table>
    </div>
  );
}

/** What the variant would have saved over the last 12 months of this facility's ledger. */
export function SavingBlock({ evaluation, names }: { evaluation: VariantEvaluation; names: Names }) {
  const s = evaluation.saving;
  const reagents = Object.entries(s.saved.byReagent_mL).filter(([, v]) => Math.abs(v) > 1e-6);
  const streams = Object.entries(s.saved.byStream_mL).filter(([, v]) => Math.abs(v) > 1e-6);
  return (
    <div data-testid="saving">
      <p className="text-sm">
        At the <strong>{formatNumber(s.injections)}</strong> injections and blanks of {s.runs} run{s.runs === 1 ? "" : "s"} the ledger
        records for this method from {s.from} to {s.to}:
      </p>
      <p className="mt-2 text-lg">
        <strong data-testid="saving-total">{litres(s.saved.total_mL)}</strong> less solvent
        {s.saved.cost && (
          <>
            , <strong data-testid="saving-money">{formatMoney(s.saved.cost)}</strong> at today's internal rates
          </>
        )}
      </p>
      <div className="mt-2 grid gap-4 sm:grid-cols-2">
        <ul className="text-sm" aria-label="Saved by solvent">
          {reagents.map(([r, v]) => (
            <li key={r}>
              {reagentName(names, r)}: {v >= 0 ? `${litres(v)} saved` : `${litres(-v)} more`}
            </li>
          ))}
        </ul>
        <ul className="text-sm" aria-label="Saved by waste stream">
          {streams.map(([w, v]) => (
            <li key={w}>
              Waste, {streamName(names, w)}: {v >= 0 ? `${litres(v)} less` : `${litres(-v)} more`}
            </li>
          ))}
        </ul>
      </div>
      {s.current.unpriced.length > 0 && (
        <p className="mt-1 text-xs text-[var(--color-muted)]">
          No rate today for {[...new Set(s.current.unpriced)].map((r) => reagentName(names, r)).join(", ")}: left out of the money.
        </p>
      )}
    </div>
  );
}

/** A worked-out variant: warnings first, then the program, the column figures, the prediction, greenness and saving. */
export default function EvaluationView({
  evaluation,
  current,
  channel,
  names,
}: {
  evaluation: VariantEvaluation;
  current: ProgramPoint[];
  channel: string;
  names: Names;
}) {
  const t = evaluation.transfer;
  const p = evaluation.prediction;
  return (
    <div className="flex flex-col gap-4">
      {evaluation.warnings.length > 0 && (
        <ul className="flex flex-col gap-2" aria-label="Warnings" data-testid="variant-warnings">
          {evaluation.warnings.map((w, i) => (
            <li
              key={i}
              className={w.code === "strength-unreachable" || w.code === "precipitation-risk" ? "notice notice-danger" : "notice"}
              data-code={w.code}
            >
              {w.message}
            </li>
          ))}
        </ul>
      )}
      {evaluation.solventsFrom === "assumed" && (
        <p className="text-sm text-[var(--color-muted)]">
          The ledger has no runs of this method yet: channel A is taken to hold water and the organic channel the current solvent.
        </p>
      )}
      <div className="overflow-x-auto">
        <ProgramTable before={current} after={evaluation.program} channel={channel} />
      </div>
      {t && (
        <dl className="grid grid-cols-2 gap-x-6 gap-y-1 text-sm sm:grid-cols-4" data-testid="transfer-figures">
          <dt>Flow ×</dt>
          <dd className="num">{formatNumber(t.flowFactor, 3)}</dd>
          <dt>Times ×</dt>
          <dd className="num">{formatNumber(t.timeFactor, 3)}</dd>
          <dt>Injection</dt>
          <dd className="num">{formatNumber(evaluation.injection_uL ?? 0, 2)} µL</dd>
          <dt>Column volume</dt>
          <dd className="num">
            {formatNumber(t.columnVolume_mL.from, 3)} → {formatNumber(t.columnVolume_mL.to, 3)} mL
          </dd>
          <dt>L/dp</dt>
          <dd className="num">
            {formatNumber(t.lOverDp.from)} → {formatNumber(t.lOverDp.to)}
          </dd>
          <dt>Resolution ×</dt>
          <dd className="num">{formatNumber(t.resolutionFactor, 2)}</dd>
          <dt>Back-pressure ×</dt>
          <dd className="num">{formatNumber(t.pressureFactor, 2)}</dd>
          <dt>{t.injectionDelay_min > 0 ? "Delay the injection" : "Isocratic hold"}</dt>
          <dd className="num">{min(t.injectionDelay_min > 0 ? t.injectionDelay_min : t.hold_min)}</dd>
        </dl>
      )}
      {p && (
        <p className="text-sm" data-testid="prediction">
          Last peak (LSS model from the scouting runs): {min(p.current.lastPeak_min)} now, <strong>{min(p.variant.lastPeak_min)}</strong> in
          the variant; run time {min(p.current.runTime_min)} → <strong>{min(p.variant.runTime_min)}</strong>.
          {p.notes.map((n) => ` ${n}`).join("")}
        </p>
      )}
      <GreennessTable
        columns={[
          { label: "Method now", g: evaluation.greenness.current },
          { label: "Variant", g: evaluation.greenness.variant },
        ]}
        names={names}
      />
      <SavingBlock evaluation={evaluation} names={names} />
    </div>
  );
}
