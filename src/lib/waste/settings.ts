/**
 * The waste settings as stored (rows of the settings table, JSON values) and as used. Pure: the
 * service reads the rows, this decides what they mean. A missing or unreadable value takes its
 * example value, so a damaged setting never stops the waste pages.
 */
import { EXAMPLE_LIMITS } from "./alerts";
import type { WasteSettings } from "./types";

/** The settings key of each waste setting. */
export const WASTE_SETTING_KEYS = {
  fullThreshold_percent: "waste.fullThreshold_percent",
  accumulationLimit_days: "waste.accumulationLimit_days",
  accumulationWarning_days: "waste.accumulationWarning_days",
  roomLimits_L: "flammables.roomLimit_L",
  reagentStreams: "waste.reagentStreams",
} as const satisfies Record<keyof WasteSettings, string>;

function numberOr(value: unknown, fallback: number): number {
  if (typeof value === "number" && Number.isFinite(value)) return value;
  if (typeof value === "string" && value.trim() !== "" && Number.isFinite(Number(value))) return Number(value);
  return fallback;
}

/** An object of `pick`ed values (entries `pick` refuses are left out); {} for anything but an object. */
function recordOf<T>(value: unknown, pick: (x: unknown) => T | undefined): Record<string, T> {
  if (typeof value === "string") {
    try {
      value = JSON.parse(value);
    } catch {
      return {};
    }
  }
  if (!value || typeof value !== "object" || Array.isArray(value)) return {};
  const out: Record<string, T> = {};
  for (const [key, x] of Object.entries(value)) {
    const picked = pick(x);
    if (picked !== undefined) out[key] = picked;
  }
  return out;
}

/** The settings in force, from the stored value of each key (`stored(key)`, undefined when absent). */
export function wasteSettingsFrom(stored: (key: string) => unknown): WasteSettings {
  const keys = WASTE_SETTING_KEYS;
  return {
    fullThreshold_percent: numberOr(stored(keys.fullThreshold_percent), EXAMPLE_LIMITS.fullThreshold_percent),
    accumulationLimit_days: numberOr(stored(keys.accumulationLimit_days), EXAMPLE_LIMITS.accumulationLimit_days),
    accumulationWarning_days: numberOr(stored(keys.accumulationWarning_days), EXAMPLE_LIMITS.accumulationWarning_days),
    roomLimits_L: recordOf(stored(keys.roomLimits_L), (x) => (Number.isFinite(Number(x)) ? Number(x) : undefined)),
    reagentStreams: recordOf(stored(keys.reagentStreams), (x) => (typeof x === "string" ? x : undefined)),
  };
}
