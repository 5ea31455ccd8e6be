/**
 * The lot's assay in a batch: which assay (and density) each component's target is computed with,
 * and how the form and the batch record say so. Pure; the preparation form and the server use the
 * same functions, so the targets stored are the ones the form showed.
 */
import type { LotDensities, Purities } from "../chem/lot-assay";
import { getReagent } from "../chem/reagents";

/** What a stock lot says about its content (from its certificate of analysis). */
export interface LotAssay {
  reagent: string;
  /** % w/w of the formula substance; null when the lot has none recorded. */
  assayPercent: number | null;
  /** g/mL at 20 °C (solutions); null when none recorded. */
  density_g_mL: number | null;
}

/** Where the assay of a component came from: the lot's certificate, the catalogue's typical value, or none (taken as 100 %). */
export type AssaySource = "lot" | "typical" | "none";

export interface AssayUsed {
  percent: number;
  source: AssaySource;
}

/** `purities` and `densities_g_mL` for the chemistry, from the lots picked (the first lot of each reagent). */
export function lotChemistry(lots: readonly (LotAssay | undefined)[]): { purities: Purities; densities_g_mL: LotDensities } {
  const purities: Record<string, number> = {};
  const densities_g_mL: Record<string, number> = {};
  for (const lot of lots) {
    if (lot === undefined) continue;
    if (lot.assayPercent !== null && !(lot.reagent in purities)) purities[lot.reagent] = lot.assayPercent / 100;
    if (lot.density_g_mL !== null && !(lot.reagent in densities_g_mL)) densities_g_mL[lot.reagent] = lot.density_g_mL;
  }
  return { purities, densities_g_mL };
}

/** The assay a component's target used; null for solvents, whose volumes are of the product as sold. */
export function assayUsed(reagent: string, role: string, lot: LotAssay | undefined): AssayUsed | null {
  if (role === "solvent") return null;
  if (lot?.assayPercent !== null && lot?.assayPercent !== undefined) return { percent: lot.assayPercent, source: "lot" };
  const typical = getReagent(reagent)?.purity_w_w?.value;
  if (typical !== undefined) return { percent: typical * 100, source: "typical" };
  return { percent: 100, source: "none" };
}

/** One line for the form and the batch record. */
export function assayNote(used: AssayUsed | null): string | null {
  if (used === null) return null;
  const p = `${+used.percent.toFixed(2)} %`;
  if (used.source === "lot") return `assay ${p} (lot's certificate)`;
  if (used.source === "typical") return `assay ${p}: catalogue's typical value, no assay recorded for the lot`;
  return "no assay recorded: taken as 100 %";
}
