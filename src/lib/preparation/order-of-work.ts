/**
 * The order of work and the cautions for making a mix, generated from the components actually in
 * it: water first where there is water (acid into water, buffers set before any organic), the
 * organic measured on its own and added last; a neat organic mix takes its additive into the
 * organic. Common laboratory practice, not a standard: the lab's SOPs come first.
 */
import { getReagent } from "../chem/reagents";
import type { RecipeSpec } from "../schemas/recipes";

export interface WorkComponent {
  reagent: string;
  name: string;
  role: "solvent" | "buffer" | "titrant" | "additive";
  unit: "mL" | "g";
  target: number;
}

const fmtVol = (mL: number) => (mL >= 100 ? `${mL.toFixed(0)} mL` : mL >= 10 ? `${mL.toFixed(1)} mL` : `${mL.toFixed(2)} mL`);
const amount = (c: WorkComponent) => (c.unit === "mL" ? fmtVol(c.target) : `${c.target.toFixed(3)} g`);
const lower = (c: WorkComponent) => c.name.toLowerCase();

export function orderOfWork(
  components: readonly WorkComponent[],
  spec: RecipeSpec,
  finalVolume_mL: number,
): { steps: string[]; cautions: string[] } {
  const steps: string[] = [];
  const water = components.find((c) => c.reagent === "water");
  const organics = components.filter((c) => c.role === "solvent" && c.reagent !== "water");
  const salts = components.filter((c) => c.role === "buffer" && c.unit === "g");
  const titrant = components.find((c) => c.role === "titrant");
  const additives = components.filter((c) => c.role === "additive");
  const concentrated = (c: WorkComponent) => getReagent(c.reagent)?.concentrated != null;

  if (water && spec.buffer) {
    const listed = salts.map((s) => `${amount(s)} of ${lower(s)}`).join(" and ");
    steps.push(`Weigh ${listed || "the buffer salt"} and dissolve in about 80 % of the water (${fmtVol(water.target * 0.8)}).`);
    if (titrant) {
      const care = concentrated(titrant) ? " Add it slowly to the solution, never water to the acid or base." : "";
      steps.push(
        `Add the titrant, ${lower(titrant)} (estimate about ${amount(titrant)}), in small portions while you check the pH at ${spec.buffer.temperature_C} °C, until it reads ${spec.buffer.targetPH.toFixed(2)}.${care}`,
      );
    } else {
      steps.push(`Check the pH at ${spec.buffer.temperature_C} °C: it should read ${spec.buffer.targetPH.toFixed(2)}.`);
    }
    steps.push(`Make up to ${fmtVol(water.target)} with water in a volumetric flask and mix.`);
  } else if (water) {
    steps.push(`Measure ${fmtVol(water.target)} of water in a graduated cylinder.`);
  } else if (organics.length) {
    for (const o of organics) steps.push(`Measure ${fmtVol(o.target)} of ${lower(o)} in a graduated cylinder, in a fume hood.`);
  }
  for (const a of additives) {
    const into = water ? "the water" : organics.length === 1 ? `the ${lower(organics[0]!)}` : "the measured solvents";
    const care = concentrated(a)
      ? water
        ? ", slowly, in a fume hood: acid (or base) into water, never the reverse"
        : ", slowly, in a fume hood"
      : "";
    steps.push(`Add ${amount(a)} of ${lower(a)} to ${into}${care}.`);
  }
  if (water && organics.length) {
    for (const o of organics) steps.push(`Measure ${fmtVol(o.target)} of ${lower(o)} separately, in its own cylinder, in a fume hood.`);
    steps.push(
      `Add the ${organics.map(lower).join(" and ")} to the aqueous part and mix; the mix contracts slightly and warms: let it reach room temperature (about ${fmtVol(finalVolume_mL)}), then degas if your method asks for it.`,
    );
  } else if (organics.length > 1) {
    steps.push("Combine the measured solvents and mix.");
  } else {
    steps.push(`Mix well (about ${fmtVol(finalVolume_mL)}).`);
  }
  steps.push("Fill and cap the bottles, and label every bottle before it leaves the bench.");

  // General cautions for making it; the warnings about this particular mix come from the chemistry.
  const cautions: string[] = [];
  if (components.some((c) => getReagent(c.reagent)?.flammable))
    cautions.push(
      "Flammable liquids: work in a fume hood away from ignition sources, keep containers closed, and store the bottles in a flammables cabinet.",
    );
  const strong = components.filter(concentrated);
  if (strong.length)
    cautions.push(
      water
        ? "Concentrated acid or base: wear eye protection, gloves and a lab coat, work in a fume hood, and add it to water — never water to it."
        : "Concentrated acid or base: wear eye protection, gloves and a lab coat, work in a fume hood, and measure it with a pipette.",
    );
  if (organics.length) cautions.push("Organic solvents: wear eye protection and suitable gloves; avoid breathing the vapour.");
  cautions.push("Follow your laboratory's SOPs and local regulations; Decant's figures support them and never replace them.");
  return { steps, cautions };
}
