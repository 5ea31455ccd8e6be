/**
 * The GHS pictograms of what a waste container may contain, for its page and its label. Pure.
 * From what the ledger routed into it (components at 1 % or more, the label module's cut-off);
 * before anything went in, from the catalogue reagents that belong to the container's stream.
 * A conservative summary, not a classification of the waste.
 */
import { reagents } from "../chem";
import { hazardSummary, type HazardSummary } from "../labels/hazards";

export interface ContainerHazards extends HazardSummary {
  basis: string;
}

export function containerHazards(streamId: string, contents: readonly { reagentId: string; volume_mL: number }[]): ContainerHazards {
  const total = contents.reduce((sum, c) => sum + Math.max(0, c.volume_mL), 0);
  if (total > 0) {
    const summary = hazardSummary(contents.map((c) => ({ reagent: c.reagentId, share_percent: (Math.max(0, c.volume_mL) / total) * 100 })));
    return { ...summary, basis: "from what was routed here, components at 1 % or more" };
  }
  const members = reagents.filter((r) => r.wasteStream.value === streamId);
  const summary = hazardSummary(members.map((r) => ({ reagent: r.id, share_percent: 100 })));
  return { ...summary, basis: "nothing recorded yet: the catalogue reagents of this stream" };
}
