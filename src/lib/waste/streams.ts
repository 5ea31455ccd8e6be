/**
 * Waste streams and the rule that routes a mix to one of them. Pure: no I/O, no server imports;
 * the run form, the server and the tests all use the same function.
 *
 * The rule: every reagent in the chem catalogue belongs to a stream (a site may override that per
 * reagent). A mix goes to the most restrictive stream among those its components reach: a stream
 * is reached when the components that belong to it make up at least the stream's minimum share of
 * the mix. The minimum share is what keeps 0.1 % formic acid in acetonitrile out of the corrosive
 * stream while a TFA-containing eluent still goes to halogenated waste (threshold 0).
 *
 * The defaults below are common practice (source key CPwaste), not a regulation: the institution's
 * hazardous-waste rules and local regulations decide, and the safety officer edits them in Decant.
 */
import { getReagent, type WasteStream } from "../chem";
import type { EffectiveRule, StreamRule } from "./types";

export interface DefaultStream extends StreamRule {
  description: string;
  /** Why the default is what it is (shown on screen next to the value). */
  basis: string;
}

/** Common-practice defaults (CPwaste). Every value is editable by the safety officer. */
export const DEFAULT_STREAMS: readonly DefaultStream[] = [
  {
    id: "aqueous",
    name: "Aqueous",
    restrictiveness: 1,
    minShare_percent: 0,
    alsoAccepts: [],
    description: "Organic-free buffers and salt solutions; local discharge limits apply.",
    basis: "Common practice: only mixes with no organic solvent and no corrosive or halogenated part.",
  },
  {
    id: "non-halogenated-organic",
    name: "Non-halogenated organic",
    restrictiveness: 2,
    minShare_percent: 0,
    alsoAccepts: ["aqueous"],
    description: "Acetonitrile, methanol, ethanol, 2-propanol, THF and their aqueous mixes.",
    basis: "Common practice: any organic solvent makes the whole mix solvent waste; aqueous rinses may join it.",
  },
  {
    id: "acidic-corrosive",
    name: "Acidic / corrosive",
    restrictiveness: 3,
    minShare_percent: 10,
    alsoAccepts: [],
    description: "Concentrated acids and acid-rich mixes.",
    basis:
      "Common practice: dilute acid modifiers (0.1 % formic acid) follow the main solvent; from 10 % v/v an acid makes the mix corrosive. Some sites decide by pH instead.",
  },
  {
    id: "basic-corrosive",
    name: "Basic / corrosive",
    restrictiveness: 3,
    minShare_percent: 10,
    alsoAccepts: [],
    description: "Concentrated bases (ammonia solution, hydroxides) and base-rich mixes.",
    basis: "Common practice, as for acids: a base at 10 % or more makes the mix corrosive.",
  },
  {
    id: "halogenated-organic",
    name: "Halogenated organic",
    restrictiveness: 4,
    minShare_percent: 0,
    alsoAccepts: ["non-halogenated-organic", "aqueous"],
    description: "Chlorinated solvents; TFA-containing waste at sites that treat it so.",
    basis:
      "Common practice: any halogenated component makes the mix halogenated waste; a non-halogenated mix may go here (at a higher disposal cost), never the reverse.",
  },
];

export const DEFAULT_STREAM_BY_ID: Readonly<Record<string, DefaultStream>> = Object.fromEntries(DEFAULT_STREAMS.map((s) => [s.id, s]));

/** One part of a mix as the ledger records it: liquids in mL, solids in g. */
export interface MixPart {
  reagentId: string;
  volume_mL?: number | null | undefined;
  mass_g?: number | null | undefined;
}

export interface StreamAssignment {
  /** The stream the mix goes to. */
  streamId: string;
  /** Share of the mix (%) per stream, before thresholds. */
  shares: Record<string, number>;
  /** Streams whose minimum share the mix reaches. */
  reached: string[];
  /** One sentence saying why, for the run form and the refusal message. */
  reason: string;
}

export class WasteRuleError extends Error {}

/** The stream a reagent goes to: the site's override, else the chem catalogue's stream. */
export function reagentStream(reagentId: string, overrides: Readonly<Record<string, string>> = {}): string {
  const override = overrides[reagentId];
  if (override) return override;
  const reagent = getReagent(reagentId);
  if (!reagent) throw new WasteRuleError(`${reagentId}: not in the reagent catalogue, so its waste stream is unknown`);
  return reagent.wasteStream.value satisfies WasteStream;
}

const round = (x: number, digits = 4) => Math.round(x * 10 ** digits) / 10 ** digits;

/**
 * Routes a mix to a stream. Shares: liquids as % v/v of the total liquid volume, solids as % w/v
 * (g per 100 mL of liquid). Streams missing from `rules` fall back to the common-practice default.
 */
export function assignWasteStream(
  parts: readonly MixPart[],
  rules: readonly StreamRule[] = DEFAULT_STREAMS,
  overrides: Readonly<Record<string, string>> = {},
): StreamAssignment {
  const liquid = parts.reduce((sum, p) => sum + Math.max(0, p.volume_mL ?? 0), 0);
  if (!(liquid > 0)) throw new WasteRuleError("the mix has no liquid volume to route");
  const shares: Record<string, number> = {};
  for (const part of parts) {
    const amount = (part.volume_mL ?? 0) + (part.mass_g ?? 0);
    if (!Number.isFinite(amount) || amount < 0) throw new WasteRuleError(`${part.reagentId}: amount must be a non-negative number`);
    if (amount === 0) continue;
    const stream = reagentStream(part.reagentId, overrides);
    shares[stream] = (shares[stream] ?? 0) + (amount / liquid) * 100;
  }
  const byId = new Map(rules.map((r) => [r.id, r]));
  const ruleOf = (id: string): StreamRule =>
    byId.get(id) ?? DEFAULT_STREAM_BY_ID[id] ?? { id, name: id, restrictiveness: 0, minShare_percent: 0, alsoAccepts: [] };
  const present = Object.keys(shares);
  const reached = present.filter((id) => shares[id]! > 0 && shares[id]! >= ruleOf(id).minShare_percent);
  // When nothing reaches its threshold (a mix of trace parts only), stay on the safe side.
  const candidates = reached.length ? reached : present;
  const most = (a: string, b: string) => ruleOf(b).restrictiveness - ruleOf(a).restrictiveness || a.localeCompare(b);
  const streamId = [...candidates].sort(most)[0]!;
  const rule = ruleOf(streamId);
  const share = round(shares[streamId]!, 3);
  const below = present
    .filter((id) => !reached.includes(id))
    .map((id) => `${ruleOf(id).name} ${round(shares[id]!, 3)} % (below ${ruleOf(id).minShare_percent} %)`);
  const reason =
    `${rule.name}: its components make up ${share} % of the mix` +
    (rule.minShare_percent > 0 ? ` (threshold ${rule.minShare_percent} %)` : "") +
    (candidates.length > 1 ? `, the most restrictive of ${candidates.map((id) => ruleOf(id).name).join(", ")}` : "") +
    (below.length ? `; not reached: ${below.join(", ")}` : "") +
    ".";
  return {
    streamId,
    shares: Object.fromEntries(present.map((id) => [id, round(shares[id]!)])),
    reached: [...reached].sort(most),
    reason,
  };
}

/** True when a container of `containerStream` may take a mix routed to `mixStream`. */
export function streamAccepts(containerStream: StreamRule, mixStream: string): boolean {
  return containerStream.id === mixStream || containerStream.alsoAccepts.includes(mixStream);
}

/** A stream as the site stored it: null where the site keeps the common-practice default. */
export interface StoredStream {
  id: string;
  name: string;
  restrictiveness: number;
  minShare_percent: number | null;
  alsoAccepts: readonly string[] | null;
}

/** The rule in force for a stored stream, and which of its parts are the default. */
export function effectiveRule(stream: StoredStream): EffectiveRule {
  const fallback = DEFAULT_STREAM_BY_ID[stream.id];
  // The column is JSON: anything but a list counts as "not set".
  const accepts = Array.isArray(stream.alsoAccepts) ? stream.alsoAccepts : null;
  return {
    id: stream.id,
    name: stream.name,
    restrictiveness: stream.restrictiveness,
    minShare_percent: stream.minShare_percent ?? fallback?.minShare_percent ?? 0,
    alsoAccepts: accepts ?? fallback?.alsoAccepts ?? [],
    defaultMinShare: stream.minShare_percent === null,
    defaultAlsoAccepts: accepts === null,
  };
}
