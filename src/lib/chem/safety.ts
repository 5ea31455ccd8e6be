/**
 * Warning sentences about reagents. Where a reagent can hurt someone the
 * sentence gives the usual caution and defers to the lab's own SOPs.
 */
import type { Reagent } from "./reagents";
import { type ChemWarning, pushWarning } from "./warnings";

/** `intoWater`: the mix has water to add it to; a neat organic mix has none, so the caution says what it is added to. */
export function concentratedWarning(r: Reagent, warnings: ChemWarning[], intoWater = true): void {
  if (r.concentrated === null) return;
  const kind = r.concentrated === "acid" ? "acid" : "base";
  const message = !intoWater
    ? `${r.name} is a concentrated ${kind}: measure it with a pipette and add it slowly to the solvent, wear eye and skin protection, work in a fume hood, and follow your lab's SOP.`
    : r.form === "solid"
      ? `${r.name} is a corrosive ${kind} that heats the water as it dissolves: add it slowly to the water while stirring, never water to it, wear eye and skin protection, and follow your lab's SOP.`
      : `${r.name} is a concentrated ${kind}: add it slowly to the water, never water to the ${kind}, wear eye and skin protection, work in a fume hood, and follow your lab's SOP.`;
  pushWarning(warnings, { code: "concentrated-reagent", message, reagent: r.id });
}

export function flammableWarning(r: Reagent, warnings: ChemWarning[]): void {
  if (!r.flammable) return;
  pushWarning(warnings, {
    code: "flammable",
    message: `${r.name} is flammable: keep it away from ignition sources, work in a fume hood, and follow your lab's SOP for flammable liquids.`,
    reagent: r.id,
  });
}

export function nonVolatileWarning(r: Reagent, warnings: ChemWarning[]): void {
  if (r.volatile || r.role === "solvent") return;
  pushWarning(warnings, {
    code: "non-volatile-buffer",
    message: `${r.name} is not volatile: the mobile phase is unsuitable for mass-spectrometric detection (common practice).`,
    reagent: r.id,
  });
}

export function uvCutoffWarning(r: Reagent, detectionWavelength_nm: number | undefined, warnings: ChemWarning[]): void {
  const cutoff = r.uvCutoff_nm?.value;
  if (detectionWavelength_nm === undefined || cutoff === undefined || cutoff <= detectionWavelength_nm) return;
  const note = r.uvCutoff_nm?.note !== undefined ? ` (${r.uvCutoff_nm.note})` : "";
  pushWarning(warnings, {
    code: "uv-cutoff",
    message: `${r.name} absorbs below about ${cutoff} nm${note}, above the detection wavelength of ${detectionWavelength_nm} nm: expect a high baseline and poor sensitivity.`,
    reagent: r.id,
  });
}
