/**
 * When a waste container needs attention. Pure: the overview, the waste page, the scheduled
 * check and the tests share these rules.
 *
 * The limits are settings with example values. How full a container may get and how long waste
 * may accumulate are decided by the institution's rules and local regulations, not by Decant.
 */

export interface WasteLimits {
  /** A container at or above this fill (% of capacity) is near full; example 80 %. */
  fullThreshold_percent: number;
  /** The site's accumulation limit (days from the first drop of waste); example 180 days. */
  accumulationLimit_days: number;
  /** Warn this many days before the limit; example 14 days. */
  accumulationWarning_days: number;
}

export const EXAMPLE_LIMITS: WasteLimits = { fullThreshold_percent: 80, accumulationLimit_days: 180, accumulationWarning_days: 14 };

export type FillState = "ok" | "near-full" | "over-capacity";

export interface FillInfo {
  /** Rounded down, so 79.9 % never shows as 80 %. */
  percent: number;
  state: FillState;
}

export function fillState(estimated_mL: number, capacity_mL: number, threshold_percent: number): FillInfo {
  if (!(capacity_mL > 0)) return { percent: 0, state: "ok" };
  const exact = (Math.max(0, estimated_mL) / capacity_mL) * 100;
  const state: FillState = exact > 100 ? "over-capacity" : exact >= threshold_percent ? "near-full" : "ok";
  return { percent: Math.floor(exact), state };
}

export type AccumulationState = "ok" | "approaching" | "over";

export interface AccumulationInfo {
  /** Whole days since accumulation started. */
  days: number;
  /** Days left until the limit (negative once over). */
  daysLeft: number;
  /** The date the limit is reached. */
  limitAt: Date;
  state: AccumulationState;
}

const DAY = 86_400_000;

export function accumulationState(
  startedAt: Date,
  now: Date,
  limits: Pick<WasteLimits, "accumulationLimit_days" | "accumulationWarning_days">,
): AccumulationInfo {
  const limitAt = new Date(startedAt.getTime() + limits.accumulationLimit_days * DAY);
  const days = Math.floor((now.getTime() - startedAt.getTime()) / DAY);
  const daysLeft = Math.ceil((limitAt.getTime() - now.getTime()) / DAY);
  const state: AccumulationState = now >= limitAt ? "over" : daysLeft <= limits.accumulationWarning_days ? "approaching" : "ok";
  return { days, daysLeft, limitAt, state };
}

export type AlertKind = "near-full" | "over-capacity" | "accumulation-approaching" | "accumulation-over";

export interface ContainerForAlerts {
  status: "in_use" | "full" | "awaiting_pickup" | "collected";
  capacity_mL: number;
  estimated_mL: number;
  accumulationStartedAt: Date | null;
}

/**
 * The alerts a container raises now. A collected container raises none; a container awaiting
 * pickup still raises the accumulation alerts (the clock runs until it leaves the site) but no
 * fill alert (it is already on its way out).
 */
export function containerAlerts(container: ContainerForAlerts, limits: WasteLimits, now: Date): AlertKind[] {
  if (container.status === "collected") return [];
  const alerts: AlertKind[] = [];
  if (container.status === "in_use" || container.status === "full") {
    const fill = fillState(container.estimated_mL, container.capacity_mL, limits.fullThreshold_percent);
    if (fill.state === "over-capacity") alerts.push("over-capacity");
    else if (fill.state === "near-full") alerts.push("near-full");
  }
  if (container.accumulationStartedAt) {
    const acc = accumulationState(container.accumulationStartedAt, now, limits);
    if (acc.state === "over") alerts.push("accumulation-over");
    else if (acc.state === "approaching") alerts.push("accumulation-approaching");
  }
  return alerts;
}

export const ALERT_TEXT: Record<AlertKind, string> = {
  "near-full": "at or above the fill threshold",
  "over-capacity": "over its capacity (by the estimate)",
  "accumulation-approaching": "approaching the site's accumulation limit",
  "accumulation-over": "past the site's accumulation limit",
};

/** What an alert's sentence names: the container, its fill and its accumulation (a ContainerView has all three). */
export interface AlertSubject {
  code: string;
  fill: Pick<FillInfo, "percent">;
  accumulation: Pick<AccumulationInfo, "days" | "daysLeft"> | null;
}

/** The sentence the pages, the API and the alert mail show for an alert. */
export function alertMessage(c: AlertSubject, kind: AlertKind, limits: WasteLimits): string {
  switch (kind) {
    case "near-full":
      return `${c.code} is at ${c.fill.percent} % of its capacity (threshold ${limits.fullThreshold_percent} %); request a pickup or swap the container.`;
    case "over-capacity":
      return `${c.code} is estimated above its capacity (${c.fill.percent} %); check the level and stop routing waste into it.`;
    case "accumulation-approaching":
      return `${c.code} has been accumulating for ${c.accumulation?.days ?? "?"} days; the site's limit (${limits.accumulationLimit_days} days) is reached in ${c.accumulation?.daysLeft ?? "?"} days.`;
    case "accumulation-over":
      return `${c.code} has been accumulating for ${c.accumulation?.days ?? "?"} days, past the site's limit of ${limits.accumulationLimit_days} days.`;
  }
}
