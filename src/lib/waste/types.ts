/**
 * The waste shapes that cross the wire: what the waste services answer, the pages render and the
 * islands receive. Types only; every instant is an ISO 8601 string, every volume mL unless named.
 */
import type { CONTAINER_STATUSES, LOCATION_KINDS } from "../schemas/waste";
import type { AccumulationInfo, AlertKind, FillInfo, WasteLimits } from "./alerts";
import type { Period } from "./period";

export type ContainerStatus = (typeof CONTAINER_STATUSES)[number];
export type LocationKind = (typeof LOCATION_KINDS)[number];

export interface WasteSettings extends WasteLimits {
  /** Room → litres of flammable liquids allowed (example values; fire codes and the institution decide). */
  roomLimits_L: Record<string, number>;
  /** Reagent id → stream id, where the site routes a reagent differently from the catalogue. */
  reagentStreams: Record<string, string>;
}

/** A stream's routing rule as it is in force (the site's value, else the common-practice default). */
export interface StreamRule {
  /** Stable id, e.g. "halogenated-organic"; the catalogue's stream names are ids here. */
  id: string;
  name: string;
  /** Higher is more restrictive: a mix goes to the most restrictive stream it reaches. */
  restrictiveness: number;
  /** Share of the mix (% v/v for liquids, % w/v for solids) from which this stream is reached. */
  minShare_percent: number;
  /** Other streams' mixes that a container of this stream may also take. */
  alsoAccepts: readonly string[];
}

/** A rule in force, and which of its parts are the common-practice default. */
export interface EffectiveRule extends StreamRule {
  defaultMinShare: boolean;
  defaultAlsoAccepts: boolean;
}

export interface StreamView extends EffectiveRule {
  description: string | null;
  /** The common-practice basis of the default, when Decant knows one. */
  basis: string | null;
  /** Live (not collected) containers of the stream. */
  containers: number;
}

export interface ContainerView {
  id: number;
  code: string;
  streamId: string;
  stream: string;
  capacity_mL: number;
  estimated_mL: number;
  fill: FillInfo;
  room: string;
  locationKind: LocationKind;
  locationNote: string | null;
  status: ContainerStatus;
  accumulationStartedAt: string | null;
  accumulation: (Omit<AccumulationInfo, "limitAt"> & { limitAt: string }) | null;
  fullAt: string | null;
  collectedAt: string | null;
  pickupId: number | null;
  pickupReference: string | null;
  /** The instrument draining into this container, if any. */
  instrument: { id: number; name: string } | null;
  lastReading: { at: string; level_mL: number } | null;
  alerts: AlertKind[];
}

export interface ContainerHistory {
  readings: {
    id: number;
    at: string;
    level_mL: number;
    estimatedBefore_mL: number;
    difference_mL: number;
    reader: string | null;
    note: string | null;
  }[];
  events: { at: string; action: string; actor: string | null; detail: unknown }[];
  /** What went in during the current accumulation, per reagent. */
  contents: { reagentId: string; volume_mL: number }[];
}

/** What `POST /api/waste/containers/{id}/readings` answers. */
export interface ReadingResult {
  container: ContainerView;
  estimatedBefore_mL: number;
  difference_mL: number;
}

/** An active instrument, as the container form offers it. */
export interface InstrumentChoice {
  id: number;
  name: string;
  room: string;
  containerId: number | null;
  containerCode: string | null;
}

export type ContainerAcceptance =
  | { ok: true; containerId: number; code: string; streamId: string }
  | { ok: false; containerId: number | null; code: "unknown-container" | "not-in-use" | "unknown-stream" | "wrong-stream"; reason: string };

export interface AlertView {
  containerId: number;
  code: string;
  stream: string;
  room: string;
  kind: AlertKind;
  message: string;
}

export interface AlertCheckResult {
  /** False when another app instance held the lock: this one did nothing. */
  ran: boolean;
  raised: number;
  mailed: number;
  recipients: string[];
}

export interface PickupView {
  id: number;
  reference: string | null;
  status: "requested" | "collected" | "cancelled";
  requestedAt: string;
  requestedBy: string | null;
  collectedAt: string | null;
  manifestRef: string | null;
  note: string | null;
  containers: { id: number; code: string; stream: string; estimated_mL: number }[];
}

export interface StreamTotal {
  stream: string;
  volume_mL: number;
}

/** The fixed contract of `GET /api/waste/summary`: every site stream (0 when nothing went to it), by volume. */
export interface WasteSummary {
  streams: StreamTotal[];
}

export interface WasteReport {
  period: Period;
  streams: (StreamTotal & { name: string })[];
  byRoom: { room: string; streams: Record<string, number>; volume_mL: number }[];
  byProject: { projectCode: string; projectName: string; volume_mL: number; streams: Record<string, number> }[];
  byMonth: { month: string; streams: Record<string, number>; volume_mL: number }[];
  total_mL: number;
}

/** Waste on hand now: live containers, by stream and by room. */
export interface WasteOnHand {
  byStream: Record<string, number>;
  byRoom: Record<string, number>;
  total_mL: number;
}

export interface FlammablesInRoom {
  room: string;
  /** Flammable reagents in stock lots (what is left in the bottles). */
  stock_L: number;
  /** The flammable share of what is left of the live batches (ready or in use) kept in the room. */
  batches_L: number;
  /** The flammable share of the live waste containers in the room. */
  waste_L: number;
  onHand_L: number;
  limit_L: number | null;
  /** "over" at or above the limit, "near" from 80 % of it. */
  state: "ok" | "near" | "over" | "no-limit";
}
