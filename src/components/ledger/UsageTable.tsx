import { useEffect, useMemo, useState } from "react";
import type { UsageRow } from "../../lib/server/services/usage";
import { formatMoney } from "../../lib/billing/money";
import { csvField } from "../../lib/imports/csv";
import { formatVolume } from "../../lib/format";

type Row = UsageRow;
type SortKey = "projectCode" | "clientName" | "runs" | "injections" | "total" | "cost";

const total = (r: Row) => Object.values(r.volumes_mL).reduce((a, b) => a + b, 0);
// The last 30 days by default: "the month so far" is empty on the first of a month.
const thirtyDaysAgo = () => new Date(Date.now() - 29 * 86_400_000).toISOString().slice(0, 10);
const today = () => new Date().toISOString().slice(0, 10);

/** Usage per project for a period, fetched from GET /api/usage: sortable, filterable, with a chart and CSV export. */
export default function UsageTable({ initialFrom, initialTo }: { initialFrom?: string; initialTo?: string }) {
  const [from, setFrom] = useState(initialFrom ?? thirtyDaysAgo());
  const [to, setTo] = useState(initialTo ?? today());
  const [state, setState] = useState<{ kind: "loading" } | { kind: "error"; message: string } | { kind: "ready"; rows: Row[] }>({ kind: "loading" });
  const [filter, setFilter] = useState("");
  const [sort, setSort] = useState<{ key: SortKey; desc: boolean }>({ key: "total", desc: true });

  useEffect(() => {
    let live = true;
    setState({ kind: "loading" });
    window.history.replaceState(null, "", `?from=${from}&to=${to}`);
    fetch(`/api/usage?from=${from}&to=${to}&groupBy=project`)
      .then(async (r) => {
        const body = (await r.json().catch(() => ({}))) as { rows?: Row[]; error?: string };
        if (!r.ok) throw new Error(body.error ?? `The usage could not be loaded (${r.status}).`);
        if (live) setState({ kind: "ready", rows: body.rows ?? [] });
      })
      .catch((error: unknown) => live && setState({ kind: "error", message: error instanceof Error ? error.message : String(error) }));
    return () => {
      live = false;
    };
  }, [from, to]);

  const rows = useMemo(() => {
    if (state.kind !== "ready") return [];
    const f = filter.trim().toLowerCase();
    const value = (r: Row): string | number => (sort.key === "total" ? total(r) : sort.key === "cost" ? r.cost.amount : r[sort.key]);
    return state.rows
      .filter((r) => !f || `${r.projectCode} ${r.projectName} ${r.clientName}`.toLowerCase().includes(f))
      .sort((a, b) => {
        const [x, y] = [value(a), value(b)];
        const c = typeof x === "number" && typeof y === "number" ? x - y : String(x).localeCompare(String(y));
        return sort.desc ? -c : c;
      });
  }, [state, filter, sort]);
  const reagents = useMemo(() => [...new Set(rows.flatMap((r) => Object.keys(r.volumes_mL)))].sort(), [rows]);
  const max = Math.max(1, ...rows.map(total));

  function exportCsv() {
    const header = ["project", "project_name", "client", "runs", "injections", ...reagents.map((r) => `${r}_mL`), "total_mL", "cost_minor", "currency"];
    const lines = rows.map((r) => [r.projectCode, r.projectName, r.clientName, r.runs, r.injections, ...reagents.map((x) => r.volumes_mL[x] ?? 0), total(r).toFixed(4), r.cost.amount, r.cost.currency].map(csvField).join(","));
    const blob = new Blob([[header.join(","), ...lines].join("\r\n") + "\r\n"], { type: "text/csv" });
    const a = document.createElement("a");
    a.href = URL.createObjectURL(blob);
    a.download = `decant-usage-${from}-to-${to}.csv`;
    a.click();
    URL.revokeObjectURL(a.href);
  }

  const header = (key: SortKey, label: string, numeric = false) => (
    <th scope="col" className={numeric ? "num" : undefined} aria-sort={sort.key === key ? (sort.desc ? "descending" : "ascending") : "none"}>
      <button type="button" className="cursor-pointer uppercase" onClick={() => setSort((s) => ({ key, desc: s.key === key ? !s.desc : numeric }))}>
        {label}{sort.key === key ? (sort.desc ? " ↓" : " ↑") : ""}
      </button>
    </th>
  );

  return (
    <div className="flex flex-col gap-4">
      <form className="card flex flex-wrap items-end gap-4 p-4" aria-label="Period" onSubmit={(e) => e.preventDefault()}>
        <div className="field"><label htmlFor="usage-from">From</label><input id="usage-from" type="date" className="input" value={from} max={to} onChange={(e) => e.target.value && setFrom(e.target.value)} /></div>
        <div className="field"><label htmlFor="usage-to">To (included)</label><input id="usage-to" type="date" className="input" value={to} min={from} onChange={(e) => e.target.value && setTo(e.target.value)} /></div>
        <div className="field"><label htmlFor="usage-filter">Filter</label><input id="usage-filter" className="input" placeholder="project or client" value={filter} onChange={(e) => setFilter(e.target.value)} /></div>
        <button type="button" className="btn btn-quiet" onClick={exportCsv} disabled={rows.length === 0}>Export CSV</button>
      </form>
      {state.kind === "loading" && <p className="text-sm text-[var(--color-muted)]" role="status">Loading the usage…</p>}
      {state.kind === "error" && <p className="notice notice-danger" role="alert">{state.message}</p>}
      {state.kind === "ready" && rows.length === 0 && <p className="notice">No usage in this period.</p>}
      {rows.length > 0 && (
        <>
          <div className="card overflow-x-auto">
            <table className="table" aria-label="Usage per project">
              <thead>
                <tr>
                  {header("projectCode", "Project")}
                  {header("clientName", "Client")}
                  {header("runs", "Runs", true)}
                  {header("injections", "Injections", true)}
                  <th scope="col">Reagents</th>
                  {header("total", "Volume", true)}
                  {header("cost", "Cost", true)}
                </tr>
              </thead>
              <tbody>
                {rows.map((r) => (
                  <tr key={r.projectCode} data-project={r.projectCode}>
                    <td><code>{r.projectCode}</code><div className="text-xs text-[var(--color-muted)]">{r.projectName}</div></td>
                    <td>{r.clientName}</td>
                    <td className="num">{r.runs}</td>
                    <td className="num">{r.injections}</td>
                    <td className="text-xs">
                      {Object.entries(r.volumes_mL).filter(([, v]) => v !== 0).map(([id, v]) => <div key={id}>{id}: <span className="num">{formatVolume(v)}</span></div>)}
                      {Object.entries(r.masses_g).filter(([, g]) => g !== 0).map(([id, g]) => <div key={id}>{id}: <span className="num">{g.toFixed(3)} g</span></div>)}
                    </td>
                    <td className="num" data-testid="usage-total">{formatVolume(total(r))}</td>
                    <td className="num">{formatMoney(r.cost)}{r.uncosted.length > 0 && <div className="text-xs text-[var(--color-amber)]" title={`No rate for ${r.uncosted.join(", ")}`}>+ uncosted</div>}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <figure className="card m-0 p-4">
            <figcaption className="mb-2 text-sm font-semibold">Volume per project, {from} to {to}</figcaption>
            <svg viewBox={`0 0 600 ${rows.length * 26 + 8}`} width="100%" role="img" aria-label="Bar chart of the volume per project">
              {rows.map((r, i) => (
                <g key={r.projectCode} transform={`translate(0 ${i * 26 + 4})`}>
                  <text x="0" y="15" fontSize="11" fill="#1c2733" fontFamily="IBM Plex Mono, monospace">{r.projectCode}</text>
                  <rect x="120" y="3" height="16" width={Math.max(1, (total(r) / max) * 380)} fill="#145f66" rx="2" />
                  <text x={126 + (total(r) / max) * 380} y="15" fontSize="11" fill="#4a5663">{formatVolume(total(r))}</text>
                </g>
              ))}
            </svg>
          </figure>
        </>
      )}
    </div>
  );
}
