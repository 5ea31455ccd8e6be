/**
 * What the usage chart draws: each group of the usage table (in the table's order, after its
 * filter) with its total volume and, where the groups have one, its cost. Pure and free of the
 * chart library, so the usage island can caption the chart before the library has loaded.
 */
import { formatMoney, type Money } from "../billing/money";
import { formatVolume } from "../format";

export interface UsageChartGroup {
  label: string;
  volume_mL: number;
  /** One amount per currency the group is billed in; empty when it has no cost. */
  costs: readonly Money[];
}

export interface UsageChartSeries {
  labels: string[];
  volumes_mL: number[];
  /**
   * Cost per group in minor units of one currency (null for a group without a cost). Null when
   * no group has a cost, or when the groups are billed in more than one currency: amounts in
   * different currencies cannot share an axis.
   */
  cost: { currency: string; amounts: (number | null)[] } | null;
  /** The chart's figures as one sentence for assistive technology. */
  description: string;
}

export function usageChartSeries(groups: readonly UsageChartGroup[]): UsageChartSeries {
  const currencies = [...new Set(groups.flatMap((g) => g.costs.map((c) => c.currency)))].sort();
  const hasCost = groups.some((g) => g.costs.some((c) => c.amount !== 0));
  const currency = currencies.length === 1 && hasCost ? currencies[0]! : null;
  const parts = groups.map((g) => {
    const money = currency === null ? "" : g.costs.map((c) => `, ${formatMoney(c)}`).join("");
    return `${g.label}: ${formatVolume(g.volume_mL)}${money}`;
  });
  const several = currencies.length > 1 ? ` Costs are in ${currencies.join(" and ")}: the table lists them.` : "";
  return {
    labels: groups.map((g) => g.label),
    volumes_mL: groups.map((g) => g.volume_mL),
    cost: currency === null ? null : { currency, amounts: groups.map((g) => g.costs[0]?.amount ?? null) },
    description: `${parts.join("; ")}.${several}`,
  };
}
