import { QueryClient, QueryClientProvider, useQuery } from "@tanstack/react-query";
import {
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type SortingState,
} from "@tanstack/react-table";
import { lazy, Suspense, useEffect, useMemo, useState } from "react";
import type { GroupedUsageRow, UsageRow } from "../../lib/ledger/types";
import { USAGE_GROUPINGS, type UsageGrouping } from "../../lib/ledger/usage-groupings";
import { formatMoney } from "../../lib/billing/money";
import { csvField } from "../../lib/imports/csv";
import { usageChartSeries } from "../../lib/ledger/usage-chart";
import { formatVolumeIn, volumeUnitFor } from "../../lib/ledger/volume-unit";
import { LoadBoundary } from "../common/LoadBoundary";
import { IslandForm } from "../forms/island-form";
import { errorMessage } from "../forms/post-json";

// Chart.js is about as heavy as the rest of the page together: it is fetched only once there is
// usage to draw, so the page itself stays inside its JavaScript budget (DEVELOPERS.md, Usage).
const UsageChart = lazy(() => import("./UsageChart"));

/** One row of any grouping, in one shape for the table. */
interface Row {
  key: string;
  label: string;
  detail: string;
  volumes_mL: Record<string, number>;
  masses_g: Record<string, number>;
  mobilePhases_mL: Record<string, number>;
  runs: number | null;
  injections: number | null;
  costs: { amount: number; currency: string }[];
  uncosted: string[];
}
type SortKey = "label" | "detail" | "runs" | "injections" | "total" | "cost";

const GROUP_LABEL: Record<UsageGrouping, string> = {
  project: "Project",
  client: "Client",
  instrument: "Instrument",
  reagent: "Reagent",
  month: "Month",
};
const fromProject = (r: UsageRow & { mobilePhases_mL?: Record<string, number> }): Row => ({
  key: r.projectCode,
  label: r.projectCode,
  detail: `${r.projectName} · ${r.clientName}`,
  volumes_mL: r.volumes_mL,
  masses_g: r.masses_g,
  mobilePhases_mL: r.mobilePhases_mL ?? {},
  runs: r.runs,
  injections: r.injections,
  costs: [r.cost],
  uncosted: r.uncosted,
});
const fromGroup = (r: GroupedUsageRow): Row => ({
  key: r.key,
  label: r.label,
  detail: "",
  volumes_mL: r.volumes_mL,
  masses_g: r.masses_g,
  mobilePhases_mL: r.mobilePhases_mL,
  runs: r.runs,
  injections: r.injections,
  costs: r.costs,
  uncosted: r.uncosted,
});
const costOf = (r: Row) => r.costs.reduce((a, c) => a + c.amount, 0);

const total = (r: Row) => Object.values(r.volumes_mL).reduce((a, b) => a + b, 0);
// The last 30 days by default: "the month so far" is empty on the first of a month.
const thirtyDaysAgo = () => new Date(Date.now() - 29 * 86_400_000).toISOString().slice(0, 10);
const today = () => new Date().toISOString().slice(0, 10);

interface Loaded {
  rows: Row[];
  phases: Record<string, string>;
  reagentNames: Record<string, string>;
  groupBy: UsageGrouping;
}

async function fetchUsage(from: string, to: string, groupBy: UsageGrouping): Promise<Loaded> {
  const r = await fetch(`/api/usage?from=${from}&to=${to}&groupBy=${groupBy}&phases=1`);
  const body = (await r.json().catch(() => ({}))) as {
    rows?: (UsageRow | GroupedUsageRow)[];
    mobilePhases?: Record<string, string>;
    reagentNames?: Record<string, string>;
    error?: string;
  };
  if (!r.ok) throw new Error(body.error ?? `The usage could not be loaded (${r.status}).`);
  const rows = (body.rows ?? []).map((row) => (groupBy === "project" ? fromProject(row as UsageRow) : fromGroup(row as GroupedUsageRow)));
  return { rows, phases: body.mobilePhases ?? {}, reagentNames: body.reagentNames ?? {}, groupBy };
}

// Sorting and filtering through TanStack Table; the cells themselves are rendered below.
const COLUMNS: ColumnDef<Row>[] = [
  { id: "label", accessorFn: (r) => r.label },
  { id: "detail", accessorFn: (r) => r.detail },
  { id: "runs", accessorFn: (r) => r.runs ?? 0, sortDescFirst: true },
  { id: "injections", accessorFn: (r) => r.injections ?? 0, sortDescFirst: true },
  { id: "total", accessorFn: total, sortDescFirst: true },
  { id: "cost", accessorFn: costOf, sortDescFirst: true },
];
const searchText = (r: Row) =>
  `${r.key} ${r.label} ${r.detail} ${Object.keys(r.volumes_mL).join(" ")} ${Object.keys(r.mobilePhases_mL).join(" ")}`.toLowerCase();

const queryClient = new QueryClient({ defaultOptions: { queries: { retry: 1, refetchOnWindowFocus: false } } });

/** Usage for a period, fetched from GET /api/usage: grouped, sortable, filterable, with a chart and CSV export. */
export default function UsageTable(props: { initialFrom?: string; initialTo?: string; initialGroupBy?: UsageGrouping }) {
  return (
    <QueryClientProvider client={queryClient}>
      <UsageView {...props} />
    </QueryClientProvider>
  );
}

function UsageView({
  initialFrom,
  initialTo,
  initialGroupBy,
}: {
  initialFrom?: string;
  initialTo?: string;
  initialGroupBy?: UsageGrouping;
}) {
  const [from, setFrom] = useState(initialFrom ?? thirtyDaysAgo());
  const [to, setTo] = useState(initialTo ?? today());
  const [groupBy, setGroupBy] = useState<UsageGrouping>(initialGroupBy ?? "project");
  const [filter, setFilter] = useState("");
  const [sorting, setSorting] = useState<SortingState>([{ id: "total", desc: true }]);

  useEffect(() => {
    window.history.replaceState(null, "", `?from=${from}&to=${to}${groupBy === "project" ? "" : `&groupBy=${groupBy}`}`);
  }, [from, to, groupBy]);
  const query = useQuery({ queryKey: ["usage", from, to, groupBy], queryFn: () => fetchUsage(from, to, groupBy) });
  const state: { kind: "loading" } | { kind: "error"; message: string } | ({ kind: "ready" } & Loaded) = query.isPending
    ? { kind: "loading" }
    : query.isError
      ? { kind: "error", message: errorMessage(query.error) }
      : { kind: "ready", ...query.data };

  const table = useReactTable({
    data: state.kind === "ready" ? state.rows : [],
    columns: COLUMNS,
    state: { sorting, globalFilter: filter },
    onSortingChange: setSorting,
    globalFilterFn: (row, _column, value: string) => !value.trim() || searchText(row.original).includes(value.trim().toLowerCase()),
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
  });
  // TanStack Table keeps the row model while nothing changes: so do the rows, and the chart with them.
  const rowModel = table.getRowModel();
  const rows = useMemo(() => rowModel.rows.map((r) => r.original), [rowModel]);
  const sort = { key: (sorting[0]?.id ?? "total") as SortKey, desc: sorting[0]?.desc ?? true };
  const reagents = useMemo(() => [...new Set(rows.flatMap((r) => Object.keys(r.volumes_mL)))].sort(), [rows]);
  const phases = useMemo(() => [...new Set(rows.flatMap((r) => Object.keys(r.mobilePhases_mL)))].sort(), [rows]);
  const shown = state.kind === "ready" ? state.groupBy : groupBy;
  const phaseName = (code: string) => (state.kind === "ready" ? state.phases[code] : undefined) ?? code;
  const reagentName = (id: string) => (state.kind === "ready" ? state.reagentNames[id] : undefined) ?? id;
  // One unit per column: the reagent and mobile-phase lists and the totals each pick mL or L once.
  const units = useMemo(
    () => ({
      // Each reagent is a column of its own (as in the CSV): formic acid stays in mL beside acetonitrile in L.
      reagents: new Map(reagents.map((id) => [id, volumeUnitFor(rows.map((r) => r.volumes_mL[id] ?? 0))])),
      phases: volumeUnitFor(rows.flatMap((r) => Object.values(r.mobilePhases_mL))),
      total: volumeUnitFor(rows.map(total)),
    }),
    [rows, reagents],
  );
  const chartSeries = useMemo(() => usageChartSeries(rows.map((r) => ({ label: r.label, volume_mL: total(r), costs: r.costs }))), [rows]);
  const groupNoun = GROUP_LABEL[shown].toLowerCase();

  function exportCsv() {
    const header = [
      shown,
      `${shown}_name`,
      "detail",
      "runs",
      "injections",
      ...reagents.map((r) => `${r}_mL`),
      ...phases.map((p) => `phase_${p}_mL`),
      "total_mL",
      "cost_minor",
      "currency",
    ];
    const lines = rows.map((r) =>
      [
        r.key,
        r.label,
        r.detail,
        r.runs ?? "",
        r.injections ?? "",
        ...reagents.map((x) => r.volumes_mL[x] ?? 0),
        ...phases.map((p) => r.mobilePhases_mL[p] ?? 0),
        total(r).toFixed(4),
        r.costs.map((c) => c.amount).join(" "),
        r.costs.map((c) => c.currency).join(" "),
      ]
        .map(csvField)
        .join(","),
    );
    const blob = new Blob([[header.join(","), ...lines].join("\r\n") + "\r\n"], { type: "text/csv" });
    const a = document.createElement("a");
    a.href = URL.createObjectURL(blob);
    a.download = `decant-usage-by-${shown}-${from}-to-${to}.csv`;
    a.click();
    URL.revokeObjectURL(a.href);
  }

  const header = (key: SortKey, label: string, numeric = false) => (
    <th
      scope="col"
      className={numeric ? "num" : undefined}
      aria-sort={sort.key === key ? (sort.desc ? "descending" : "ascending") : "none"}
    >
      <button
        type="button"
        className="cursor-pointer uppercase"
        onClick={() => setSorting((s) => [{ id: key, desc: s[0]?.id === key ? !s[0].desc : numeric }])}
      >
        {label}
        {sort.key === key ? (sort.desc ? " ↓" : " ↑") : ""}
      </button>
    </th>
  );

  return (
    <div className="flex flex-col gap-4">
      <IslandForm className="card flex flex-wrap items-end gap-4 p-4" aria-label="Period" onSubmit={(e) => e.preventDefault()}>
        <div className="field">
          <label htmlFor="usage-from">From</label>
          <input
            id="usage-from"
            type="date"
            className="input"
            value={from}
            max={to}
            onChange={(e) => e.target.value && setFrom(e.target.value)}
          />
        </div>
        <div className="field">
          <label htmlFor="usage-to">To (included)</label>
          <input
            id="usage-to"
            type="date"
            className="input"
            value={to}
            min={from}
            onChange={(e) => e.target.value && setTo(e.target.value)}
          />
        </div>
        <div className="field">
          <label htmlFor="usage-group">Group by</label>
          <select
            id="usage-group"
            className="input"
            value={groupBy}
            onChange={(e) => {
              setGroupBy(e.target.value as UsageGrouping);
              setSorting([{ id: "total", desc: true }]);
            }}
          >
            {USAGE_GROUPINGS.map((g) => (
              <option key={g} value={g}>
                {GROUP_LABEL[g]}
              </option>
            ))}
          </select>
        </div>
        <div className="field">
          <label htmlFor="usage-filter">Filter</label>
          <input
            id="usage-filter"
            className="input"
            placeholder="name, reagent or mobile phase"
            value={filter}
            onChange={(e) => setFilter(e.target.value)}
          />
        </div>
        <button type="button" className="btn btn-quiet" onClick={exportCsv} disabled={rows.length === 0}>
          Export CSV
        </button>
      </IslandForm>
      {state.kind === "loading" && (
        <p className="text-sm text-[var(--color-muted)]" role="status">
          Loading the usage…
        </p>
      )}
      {state.kind === "error" && (
        <p className="notice notice-danger" role="alert">
          {state.message}
        </p>
      )}
      {state.kind === "ready" && rows.length === 0 && <p className="notice">No usage in this period.</p>}
      {rows.length > 0 && (
        <>
          <div className="card overflow-x-auto">
            <table className="table" aria-label={`Usage per ${groupNoun}`}>
              <thead>
                <tr>
                  {header("label", GROUP_LABEL[shown])}
                  {shown === "project" && header("detail", "Project · client")}
                  {shown !== "reagent" && header("runs", "Runs", true)}
                  {shown !== "reagent" && header("injections", "Injections", true)}
                  <th scope="col">Reagents</th>
                  <th scope="col">Mobile phases</th>
                  {header("total", "Volume", true)}
                  {header("cost", "Cost", true)}
                </tr>
              </thead>
              <tbody>
                {rows.map((r) => (
                  <tr key={r.key} data-project={shown === "project" ? r.key : undefined} data-group={r.key}>
                    <td className="whitespace-nowrap">{shown === "project" || shown === "month" ? <code>{r.label}</code> : r.label}</td>
                    {shown === "project" && <td className="text-sm">{r.detail}</td>}
                    {shown !== "reagent" && <td className="num">{r.runs}</td>}
                    {shown !== "reagent" && <td className="num">{r.injections}</td>}
                    <td className="text-xs">
                      {Object.entries(r.volumes_mL)
                        .filter(([, v]) => v !== 0)
                        .map(([id, v]) => (
                          <div key={id} title={id}>
                            {reagentName(id)}:{" "}
                            <span className="num whitespace-nowrap">{formatVolumeIn(v, units.reagents.get(id) ?? "mL")}</span>
                          </div>
                        ))}
                      {Object.entries(r.masses_g)
                        .filter(([, g]) => g !== 0)
                        .map(([id, g]) => (
                          <div key={id} title={id}>
                            {reagentName(id)}: <span className="num whitespace-nowrap">{g.toFixed(2)} g</span>
                          </div>
                        ))}
                    </td>
                    <td className="text-xs" data-testid="usage-phases">
                      {Object.entries(r.mobilePhases_mL)
                        .filter(([, v]) => v !== 0)
                        .map(([code, v]) => (
                          <div key={code} title={phaseName(code)}>
                            {code === "none" ? "not from a batch" : <code>{code}</code>}:{" "}
                            <span className="num whitespace-nowrap">{formatVolumeIn(v, units.phases)}</span>
                          </div>
                        ))}
                    </td>
                    <td className="num whitespace-nowrap" data-testid="usage-total">
                      {formatVolumeIn(total(r), units.total)}
                    </td>
                    <td className="num">
                      {r.costs.map((c) => (
                        <div key={c.currency}>{formatMoney(c)}</div>
                      ))}
                      {r.uncosted.length > 0 && (
                        <div className="text-xs text-[var(--color-amber)]" title={`No rate for ${r.uncosted.join(", ")}`}>
                          + uncosted
                        </div>
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <figure className="card m-0 p-4">
            <figcaption className="mb-2 text-sm font-semibold">
              {chartSeries.cost ? "Volume and cost" : "Volume"} per {groupNoun}, {from} to {to}
            </figcaption>
            <LoadBoundary fallback={<p className="notice">The chart could not be loaded. The table above has every figure.</p>}>
              <Suspense
                fallback={
                  <p className="text-sm text-[var(--color-muted)]" role="status">
                    Loading the chart…
                  </p>
                }
              >
                <UsageChart
                  series={chartSeries}
                  name={`Bar chart of the ${chartSeries.cost ? "volume and cost" : "volume"} per ${groupNoun}`}
                />
              </Suspense>
            </LoadBoundary>
          </figure>
        </>
      )}
    </div>
  );
}
