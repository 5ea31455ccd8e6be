/** Deviations of a made batch from its targets, against the facility's tolerances. */

export interface Tolerances {
  /** Allowed |measured − target| pH. */
  pH: number;
  /** Allowed |actual − target| / target, percent. */
  amount_percent: number;
}

/** Defaults (common practice); a manager edits them in the preparation settings. */
export const DEFAULT_TOLERANCES: Tolerances = { pH: 0.05, amount_percent: 2 };

export interface Deviation {
  /** The form field it is about, e.g. "measuredPH" or "components.2.actualAmount". */
  field: string;
  message: string;
}

export function findDeviations(input: {
  tolerances: Tolerances;
  targetPH?: number | null | undefined;
  measuredPH?: number | null | undefined;
  components: readonly { name: string; unit: string; target: number; actual: number | null | undefined }[];
}): Deviation[] {
  const out: Deviation[] = [];
  const { tolerances: tol } = input;
  if (input.targetPH != null && input.measuredPH != null) {
    const d = input.measuredPH - input.targetPH;
    if (Math.abs(d) > tol.pH + 1e-9)
      out.push({
        field: "measuredPH",
        message: `pH ${input.measuredPH.toFixed(2)} is ${d > 0 ? "+" : ""}${d.toFixed(2)} from the target ${input.targetPH.toFixed(2)} (tolerance ±${tol.pH})`,
      });
  }
  input.components.forEach((c, i) => {
    if (c.actual == null || !(c.target > 0)) return;
    const pct = ((c.actual - c.target) / c.target) * 100;
    if (Math.abs(pct) > tol.amount_percent + 1e-9) {
      out.push({
        field: `components.${i}.actualAmount`,
        message: `${c.name}: ${fmt(c.actual)} ${c.unit} is ${pct > 0 ? "+" : ""}${pct.toFixed(1)} % from the target ${fmt(c.target)} ${c.unit} (tolerance ±${tol.amount_percent} %)`,
      });
    }
  });
  return out;
}

function fmt(n: number): string {
  return n >= 100 ? n.toFixed(0) : n >= 10 ? n.toFixed(1) : n >= 1 ? n.toFixed(2) : n.toPrecision(3);
}
