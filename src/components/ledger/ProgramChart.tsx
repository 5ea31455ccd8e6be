import type { ProgramRow } from "../../lib/schemas/methods";

const COLOURS: Record<string, string> = { B: "#145f66", C: "#8a4b08", D: "#6b3fa0", flow: "#5f6b77" };

/** The gradient program drawn as lines: %B, %C, %D against time, and the flow (dashed, right axis). */
export default function ProgramChart({
  rows,
  width = 560,
  height = 220,
}: {
  rows: readonly ProgramRow[];
  width?: number;
  height?: number;
}) {
  const valid = rows.filter((r) => Number.isFinite(r.time_min) && Number.isFinite(r.flow_mL_min));
  const pad = { left: 40, right: 48, top: 12, bottom: 30 };
  const w = width - pad.left - pad.right;
  const h = height - pad.top - pad.bottom;
  const tMax = Math.max(1, ...valid.map((r) => r.time_min));
  const fMax = Math.max(0.1, ...valid.map((r) => r.flow_mL_min)) * 1.15;
  const x = (t: number) => pad.left + (t / tMax) * w;
  const yPct = (p: number) => pad.top + h - (p / 100) * h;
  const yFlow = (f: number) => pad.top + h - (f / fMax) * h;
  const channels = (["B", "C", "D"] as const).filter((ch) => valid.some((r) => r[ch] > 0));
  const path = (pts: [number, number][]) => pts.map(([px, py], i) => `${i ? "L" : "M"}${px.toFixed(1)},${py.toFixed(1)}`).join(" ");
  const ticks = Array.from({ length: 6 }, (_, i) => (tMax * i) / 5);
  const summary = channels.length
    ? channels.map((ch) => `%${ch} from ${valid[0]?.[ch] ?? 0} to ${valid[valid.length - 1]?.[ch] ?? 0}`).join(", ")
    : "isocratic on A";
  return (
    <figure className="m-0">
      <svg
        viewBox={`0 0 ${width} ${height}`}
        width="100%"
        role="img"
        aria-label={`Gradient program over ${tMax} min: ${summary}`}
        className="block max-w-full"
      >
        <rect x={pad.left} y={pad.top} width={w} height={h} fill="#fbfaf7" stroke="#dcd8cf" />
        {[0, 25, 50, 75, 100].map((p) => (
          <g key={p}>
            <line x1={pad.left} x2={pad.left + w} y1={yPct(p)} y2={yPct(p)} stroke="#ece8df" />
            <text x={pad.left - 6} y={yPct(p) + 4} textAnchor="end" fontSize="10" fill="#5f6b77">
              {p}%
            </text>
          </g>
        ))}
        {ticks.map((t) => (
          <text key={t} x={x(t)} y={pad.top + h + 16} textAnchor="middle" fontSize="10" fill="#5f6b77">
            {Number(t.toFixed(1))}
          </text>
        ))}
        <text x={pad.left + w / 2} y={height - 2} textAnchor="middle" fontSize="10" fill="#5f6b77">
          time, min
        </text>
        <text x={pad.left + w + 6} y={pad.top + 8} fontSize="10" fill={COLOURS.flow}>
          {fMax.toFixed(2)}
        </text>
        <text x={pad.left + w + 6} y={pad.top + h} fontSize="10" fill={COLOURS.flow}>
          0 mL/min
        </text>
        {valid.length > 1 && (
          <path
            d={path(valid.map((r) => [x(r.time_min), yFlow(r.flow_mL_min)]))}
            fill="none"
            stroke={COLOURS.flow}
            strokeDasharray="5 4"
            strokeWidth="1.5"
          />
        )}
        {valid.length > 1 &&
          channels.map((ch) => (
            <path key={ch} d={path(valid.map((r) => [x(r.time_min), yPct(r[ch])]))} fill="none" stroke={COLOURS[ch]} strokeWidth="2.25" />
          ))}
        {channels.map((ch) =>
          valid.map((r, i) => <circle key={`${ch}${i}`} cx={x(r.time_min)} cy={yPct(r[ch])} r="2.5" fill={COLOURS[ch]} />),
        )}
      </svg>
      <figcaption className="mt-1 flex flex-wrap gap-4 text-xs text-[var(--color-muted)]">
        {channels.map((ch) => (
          <span key={ch}>
            <span
              aria-hidden="true"
              style={{ display: "inline-block", width: 14, height: 3, background: COLOURS[ch], verticalAlign: "middle", marginRight: 4 }}
            />
            %{ch}
          </span>
        ))}
        <span>
          <span
            aria-hidden="true"
            style={{ display: "inline-block", width: 14, borderTop: `2px dashed ${COLOURS.flow}`, verticalAlign: "middle", marginRight: 4 }}
          />
          flow
        </span>
      </figcaption>
    </figure>
  );
}
