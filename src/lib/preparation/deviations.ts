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

/** An actual this many times the target, or this many times smaller, is a slip (a unit, a decimal point), not a deviation. */
export const IMPLAUSIBLE_FACTOR = 10;

/** A titrant this many times off its computed estimate suggests a wrong reagent or concentration. */
export const TITRANT_FAR_FACTOR = 3;

interface MadeComponent {
  name: string;
  unit: string;
  target: number;
  actual: number | null | undefined;
  /** "titrant": added until the pH reads right, so its amount varies by nature. */
  role?: string | undefined;
}

/**
 * Actuals that cannot be recorded: blank (press "As planned" to copy the target), or off by 10×
 * or more (refused with the field named). The form and the service refuse the same ones.
 */
export function actualsProblems(components: readonly MadeComponent[]): Deviation[] {
  const out: Deviation[] = [];
  components.forEach((c, i) => {
    const field = `components.${i}.actualAmount`;
    if (c.actual == null || !Number.isFinite(c.actual)) {
      out.push({ field, message: `Record the ${c.name.toLowerCase()} actually used, or press "As planned"` });
      return;
    }
    if (c.role === "titrant" || !(c.target > 0)) return;
    const ratio = c.actual / c.target;
    // 1e-9: exactly ten times a target that carries a float's last digit still counts.
    if (ratio >= IMPLAUSIBLE_FACTOR * (1 - 1e-9) || ratio <= (1 / IMPLAUSIBLE_FACTOR) * (1 + 1e-9))
      out.push({
        field,
        message: `${fmt(c.actual)} ${c.unit} is ${ratio >= 1 ? `${times(ratio)}× the` : `1/${times(1 / ratio)} of the`} target ${fmt(c.target)} ${c.unit}: check the unit and the decimal point`,
      });
  });
  return out;
}

export function findDeviations(input: {
  tolerances: Tolerances;
  targetPH?: number | null | undefined;
  measuredPH?: number | null | undefined;
  components: readonly MadeComponent[];
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
    if (c.role === "titrant") {
      // Added until the pH reads right: compared with the estimate for information, flagged only when far off.
      const ratio = c.actual / c.target;
      if (ratio > TITRANT_FAR_FACTOR || ratio < 1 / TITRANT_FAR_FACTOR)
        out.push({
          field: `components.${i}.actualAmount`,
          message: `${c.name} (titrant): ${fmt(c.actual)} ${c.unit} is far from the estimate ${fmt(c.target)} ${c.unit}; check the reagent and its concentration`,
        });
      return;
    }
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

/** 9.9999 → "10", 12.34 → "12.3". */
const times = (n: number) => String(Math.round(n * 10) / 10);

function fmt(n: number): string {
  return n >= 100 ? n.toFixed(0) : n >= 10 ? n.toFixed(1) : n >= 1 ? n.toFixed(2) : n.toPrecision(3);
}
