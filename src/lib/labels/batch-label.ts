/** What a batch's bottle label says, from the batch as recorded. Pure: the batch page previews the same content the PDF prints. */
import { componentShares, preparationPlan, type PlannedComponent } from "../preparation/plan";
import type { BatchDetail } from "../preparation/types";
import { hazardSummary } from "./hazards";
import type { LabelContent } from "./layout";

export function labelContentOf(batch: BatchDetail): LabelContent {
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
  const when = (iso: string) => iso.slice(0, 16).replace("T", " ");
  const deviation = batch.deviations.length
    ? `${batch.deviations.map((d) => d.message.split(" (tolerance")[0]).join("; ")}. Reason: ${batch.deviationReason ?? "not given"}`
    : null;
  return {
    code: batch.code,
    name: batch.recipeName,
    composition: batch.composition + (batch.measuredPH !== null ? ` · measured pH ${batch.measuredPH.toFixed(2)}` : ""),
    prepared: `${when(batch.preparedAt)} UTC`,
    // The expiry and the storage line come from the batch's one expiry computation (`batch.expiry`).
    expires: batch.expiry.expires,
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
