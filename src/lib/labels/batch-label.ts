/** What a batch's bottle label says, from the batch as recorded. Pure: the batch page previews the same content the PDF prints. */
import { componentShares, preparationPlan, type PlannedComponent } from "../preparation/plan";
import { formatLabelInstant } from "../format";
import type { BatchDetail } from "../preparation/types";
import { hazardSummary } from "./hazards";
import type { LabelContent } from "./layout";

/** `timeZone`: the facility's; the label shows its wall-clock times and the zone's name. */
export function labelContentOf(batch: BatchDetail, timeZone: string): LabelContent {
  // Older batches recorded without components take them from their recipe's plan.
  let parts: PlannedComponent[] = batch.components.map((c) => ({
    reagent: c.reagent,
    name: c.name,
    role: "solvent",
    unit: c.unit,
    target: c.actual ?? c.target,
  }));
  if (parts.length === 0 && batch.spec) {
    try {
      parts = preparationPlan({ spec: batch.spec, volume_mL: batch.volume_mL }).components;
    } catch {
      parts = [];
    }
  }
  const hazards = hazardSummary(componentShares({ components: parts, finalVolume_mL: batch.volume_mL }));
  const deviation = batch.deviations.length
    ? `${batch.deviations.map((d) => d.message.split(" (tolerance")[0]).join("; ")}. Reason: ${batch.deviationReason ?? "not given"}`
    : null;
  return {
    code: batch.code,
    name: batch.recipeName,
    composition: batch.composition + (batch.measuredPH !== null ? ` · measured pH ${batch.measuredPH.toFixed(2)}` : ""),
    prepared: formatLabelInstant(batch.preparedAt, timeZone),
    expires: formatLabelInstant(batch.expiresAt, timeZone),
    preparer: batch.preparedBy,
    bottles: batch.bottles,
    storage: batch.storage,
    pictograms: hazards.pictograms,
    signalWord: hazards.signalWord,
    hazardStatements: hazards.statements,
    deviation,
    channel: batch.channel,
  };
}
