/**
 * Label stocks edited as a form (size, margins, rows and columns) with a live drawing of the page,
 * instead of raw JSON. The drawing uses the same geometry as the label PDF (`pageGeometry`).
 */
import type { LabelStock } from "../../lib/schemas/labels";
import { pageGeometry } from "../../lib/labels/stocks";

type Sheet = NonNullable<LabelStock["sheet"]>;

const A4_GRID: Sheet = {
  pageWidth_mm: 210,
  pageHeight_mm: 297,
  columns: 2,
  rows: 6,
  marginLeft_mm: 7.5,
  marginTop_mm: 6,
  gapX_mm: 5,
  gapY_mm: 3,
};

function NumberField({
  label,
  value,
  onChange,
  step = "0.1",
}: {
  label: string;
  value: number;
  onChange: (n: number) => void;
  step?: string;
}) {
  return (
    <label className="field">
      <span className="text-xs">{label}</span>
      <input
        className="input w-24 py-1 text-right"
        type="number"
        step={step}
        min={0}
        value={Number.isFinite(value) ? value : ""}
        onChange={(e) => onChange(e.target.value === "" ? NaN : Number(e.target.value))}
      />
    </label>
  );
}

/** The page (or roll label) to scale, label slots outlined: what the printer will be sent. */
function StockPreview({ stock }: { stock: LabelStock }) {
  let geometry: ReturnType<typeof pageGeometry>;
  try {
    geometry = pageGeometry(stock);
  } catch {
    return null;
  }
  if (!(geometry.width > 0 && geometry.height > 0) || geometry.slots.some((s) => !Number.isFinite(s.x + s.y))) return null;
  const w = stock.width_mm * (72 / 25.4);
  const h = stock.height_mm * (72 / 25.4);
  return (
    <svg
      role="img"
      aria-label={`Preview of ${stock.name}: ${geometry.slots.length} label${geometry.slots.length === 1 ? "" : "s"} per page`}
      viewBox={`0 0 ${geometry.width} ${geometry.height}`}
      className="h-48 w-auto max-w-full rounded border border-[var(--color-rule)] bg-white"
    >
      {geometry.slots.map((s, i) => (
        <rect
          key={i}
          x={s.x}
          y={geometry.height - s.y - h}
          width={w}
          height={h}
          fill="var(--color-teal-wash)"
          stroke="var(--color-teal)"
          strokeWidth={1}
        />
      ))}
    </svg>
  );
}

export function LabelStockEditor({ stocks, onChange }: { stocks: LabelStock[]; onChange: (next: LabelStock[]) => void }) {
  const set = (i: number, patch: Partial<LabelStock>) => onChange(stocks.map((s, j) => (j === i ? { ...s, ...patch } : s)));
  const setSheet = (i: number, patch: Partial<Sheet>) => set(i, { sheet: { ...(stocks[i]!.sheet ?? A4_GRID), ...patch } });
  return (
    <div className="grid gap-4">
      {stocks.map((s, i) => (
        <fieldset
          key={i}
          className="grid gap-3 rounded border border-[var(--color-rule)] p-3 lg:grid-cols-[1fr_auto]"
          aria-label={`Label stock ${s.name}`}
        >
          <div className="grid gap-3">
            <div className="flex flex-wrap items-end gap-3">
              <label className="field">
                <span className="text-xs">Name</span>
                <input className="input w-72 py-1" value={s.name} onChange={(e) => set(i, { name: e.target.value })} />
              </label>
              <label className="field">
                <span className="text-xs">Id (used in links)</span>
                <input className="input w-44 py-1 font-mono text-xs" value={s.id} onChange={(e) => set(i, { id: e.target.value })} />
              </label>
              <label className="field">
                <span className="text-xs">Kind</span>
                <select
                  className="input py-1"
                  value={s.kind}
                  onChange={(e) => {
                    const kind = e.target.value as LabelStock["kind"];
                    set(i, kind === "sheet" ? { kind, sheet: s.sheet ?? A4_GRID } : { kind, sheet: undefined });
                  }}
                >
                  <option value="roll">Roll (one label per page)</option>
                  <option value="sheet">Sheet (a grid per page)</option>
                </select>
              </label>
            </div>
            <div className="flex flex-wrap gap-3">
              <NumberField label="Label width (mm)" value={s.width_mm} onChange={(n) => set(i, { width_mm: n })} />
              <NumberField label="Label height (mm)" value={s.height_mm} onChange={(n) => set(i, { height_mm: n })} />
            </div>
            {s.kind === "sheet" && s.sheet && (
              <div className="flex flex-wrap gap-3">
                <NumberField label="Page width (mm)" value={s.sheet.pageWidth_mm} onChange={(n) => setSheet(i, { pageWidth_mm: n })} />
                <NumberField label="Page height (mm)" value={s.sheet.pageHeight_mm} onChange={(n) => setSheet(i, { pageHeight_mm: n })} />
                <NumberField label="Columns" step="1" value={s.sheet.columns} onChange={(n) => setSheet(i, { columns: n })} />
                <NumberField label="Rows" step="1" value={s.sheet.rows} onChange={(n) => setSheet(i, { rows: n })} />
                <NumberField label="Left margin (mm)" value={s.sheet.marginLeft_mm} onChange={(n) => setSheet(i, { marginLeft_mm: n })} />
                <NumberField label="Top margin (mm)" value={s.sheet.marginTop_mm} onChange={(n) => setSheet(i, { marginTop_mm: n })} />
                <NumberField label="Gap across (mm)" value={s.sheet.gapX_mm} onChange={(n) => setSheet(i, { gapX_mm: n })} />
                <NumberField label="Gap down (mm)" value={s.sheet.gapY_mm} onChange={(n) => setSheet(i, { gapY_mm: n })} />
              </div>
            )}
            <div>
              <button
                type="button"
                className="btn btn-quiet py-1 text-xs"
                disabled={stocks.length === 1}
                onClick={() => onChange(stocks.filter((_, j) => j !== i))}
              >
                Remove this stock
              </button>
            </div>
          </div>
          <StockPreview stock={s} />
        </fieldset>
      ))}
      <div>
        <button
          type="button"
          className="btn btn-quiet"
          onClick={() =>
            onChange([
              ...stocks,
              { id: `stock-${stocks.length + 1}`, name: "New roll, 100 × 50 mm", kind: "roll", width_mm: 100, height_mm: 50 },
            ])
          }
        >
          Add a label stock
        </button>
      </div>
    </div>
  );
}
