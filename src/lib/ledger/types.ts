// What the usage routes send (`GET /api/usage`) and the usage table receives.
import type { Money } from "../billing/money";
import type { UsageGrouping } from "./usage-groupings";

export interface UsageRow {
  projectCode: string;
  projectName: string;
  clientName: string;
  /** mL per reagent id over the period (corrections included, so a reversed entry counts 0). */
  volumes_mL: Record<string, number>;
  /** g per solid reagent id. */
  masses_g: Record<string, number>;
  runs: number;
  injections: number;
  cost: { amount: number; currency: string };
  /** Reagents used but without a rate in force: not in the cost. */
  uncosted: string[];
}

export interface UsageAnswer {
  from: string;
  to: string;
  groupBy: "project";
  rows: UsageRow[];
}

export type GroupedBy = Exclude<UsageGrouping, "project">;

export interface GroupedUsageRow {
  /** The group: client id, instrument id, reagent id or YYYY-MM; "none" for entries outside any instrument run. */
  key: string;
  label: string;
  /** mL per reagent id. */
  volumes_mL: Record<string, number>;
  /** g per solid reagent id. */
  masses_g: Record<string, number>;
  /** mL per mobile phase (recipe code); "none" for entries not drawn from a batch. */
  mobilePhases_mL: Record<string, number>;
  /** Runs and injections started in the period; null for the reagent grouping (a run is not a reagent's). */
  runs: number | null;
  injections: number | null;
  /** The cost in the group's currency; null when its projects are billed in more than one (see `costs`). */
  cost: Money | null;
  costs: Money[];
  uncosted: string[];
}

export interface GroupedUsageAnswer {
  from: string;
  to: string;
  groupBy: GroupedBy;
  rows: GroupedUsageRow[];
  /** Recipe code → name, for the mobile phases in the rows. */
  mobilePhases: Record<string, string>;
}
