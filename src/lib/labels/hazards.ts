/**
 * The hazard summary printed on a bottle: GHS pictograms, signal word and short hazard
 * statements of the components present at 1 % or more (the generic GHS cut-off for most health
 * hazard classes). This is a conservative simplification, not a classification of the mixture:
 * the label says so and defers to the lab's SOPs and the suppliers' safety data sheets.
 */
import { getReagent, type GhsPictogram } from "../chem";

/** UN GHS hazard statements, short wording (GHS Rev. 10, Annex 3). */
export const HAZARD_STATEMENTS: Readonly<Record<string, string>> = {
  H225: "Highly flammable liquid and vapour",
  H226: "Flammable liquid and vapour",
  H290: "May be corrosive to metals",
  H301: "Toxic if swallowed",
  H302: "Harmful if swallowed",
  H311: "Toxic in contact with skin",
  H312: "Harmful in contact with skin",
  H314: "Causes severe skin burns and eye damage",
  H315: "Causes skin irritation",
  H318: "Causes serious eye damage",
  H319: "Causes serious eye irritation",
  H331: "Toxic if inhaled",
  H332: "Harmful if inhaled",
  H335: "May cause respiratory irritation",
  H336: "May cause drowsiness or dizziness",
  H351: "Suspected of causing cancer",
  H360FD: "May damage fertility; may damage the unborn child",
  H370: "Causes damage to organs",
  H400: "Very toxic to aquatic life",
  H412: "Harmful to aquatic life with long lasting effects",
  EUH019: "May form explosive peroxides",
};

/** Order in which pictograms are shown (physical, then health, then environment). */
const PICTOGRAM_ORDER: GhsPictogram[] = ["GHS01", "GHS02", "GHS03", "GHS04", "GHS05", "GHS06", "GHS08", "GHS07", "GHS09"];

/** Cut-off (percent of the mix, v/v or w/v) at or above which a component's hazards are shown. */
export const HAZARD_CUTOFF_PERCENT = 1;

export interface HazardSummary {
  pictograms: GhsPictogram[];
  signalWord: "Danger" | "Warning" | null;
  /** "H225 Highly flammable liquid and vapour", … */
  statements: string[];
  /** Reagents whose hazards are included. */
  from: string[];
}

/** `share_percent`: the component's share of the finished mix (v/v for liquids, w/v for solids). */
export function hazardSummary(components: readonly { reagent: string; share_percent: number }[]): HazardSummary {
  const pictograms = new Set<GhsPictogram>();
  const codes = new Set<string>();
  const from: string[] = [];
  let signal: HazardSummary["signalWord"] = null;
  for (const c of components) {
    const r = getReagent(c.reagent);
    if (!r || c.share_percent < HAZARD_CUTOFF_PERCENT) continue;
    if (r.ghs.pictograms.length === 0 && r.ghs.signalWord === null) continue;
    from.push(r.id);
    for (const p of r.ghs.pictograms) pictograms.add(p);
    for (const h of r.ghs.hazardStatements) codes.add(h);
    if (r.ghs.signalWord === "Danger") signal = "Danger";
    else if (r.ghs.signalWord === "Warning" && signal === null) signal = "Warning";
  }
  // GHS precedence: with the skull and crossbones, the exclamation mark is not shown.
  if (pictograms.has("GHS06")) pictograms.delete("GHS07");
  return {
    pictograms: PICTOGRAM_ORDER.filter((p) => pictograms.has(p)),
    signalWord: signal,
    statements: [...codes].sort().map((code) => (HAZARD_STATEMENTS[code] ? `${code} ${HAZARD_STATEMENTS[code]}` : code)),
    from,
  };
}
