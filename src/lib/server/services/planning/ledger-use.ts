/**
 * What the ledger records for a method's runs over a period: how many runs and injections (with
 * blanks), what one mL pumped on each channel contained, and the waste stream each reagent was
 * booked to. Runs whose entries were reversed by a correction do not count.
 */
import { getReagent } from "../../../chem/reagents";
import { swapped, type ChannelContent, type TodayRate } from "../../../planning/savings";
import type { VariantParams } from "../../../schemas/planning";
import { rateInForce } from "../../../billing/rates";
import { select, selectOne } from "../../query";
import { loadRates } from "../usage";

export interface MethodLedgerUse {
  runs: number;
  injections: number;
  contents: Record<string, ChannelContent>;
  streams: Record<string, string>;
  /** mL the ledger records by reagent (run entries, corrections included). */
  byReagent_mL: Record<string, number>;
  total_mL: number;
}

const NOT_REVERSED = `NOT EXISTS (SELECT 1 FROM ledger_entries o JOIN ledger_entries c ON c.reverses_id = o.id
                                   WHERE o.source_id = CONCAT('run:', r.id))`;

export async function methodLedgerUse(methodId: number, from: Date, to: Date): Promise<MethodLedgerUse> {
  const counts = await selectOne<{ runs: number; injections: number | null }>(
    `SELECT COUNT(*) AS runs, SUM(r.injections + r.blanks) AS injections FROM runs r
      WHERE r.method_id = :methodId AND r.started_at >= :from AND r.started_at < :to AND ${NOT_REVERSED}`,
    { replacements: { methodId, from, to } },
  );
  const grouped = await select<{
    channel: string | null;
    batch_id: number | null;
    reagent_id: string;
    stream: string | null;
    volume: number;
    mass: number | null;
  }>(
    `SELECT le.channel, le.batch_id, le.reagent_id, le.waste_stream_id AS stream, SUM(le.volume_ml) AS volume, SUM(le.mass_g) AS mass
       FROM runs r JOIN ledger_entries le ON le.source_id = CONCAT('run:', r.id)
      WHERE r.method_id = :methodId AND r.started_at >= :from AND r.started_at < :to AND le.kind = 'run' AND ${NOT_REVERSED}
      GROUP BY le.channel, le.batch_id, le.reagent_id, le.waste_stream_id`,
    { replacements: { methodId, from, to } },
  );
  // Entries written without a channel (older imports, the demo data) take it from the run's batch per channel.
  const batchChannel = new Map<number, string>();
  if (grouped.some((g) => g.channel === null)) {
    const assignments = await select<{ channel_batches: unknown }>(
      "SELECT DISTINCT r.channel_batches FROM runs r WHERE r.method_id = :methodId AND r.started_at >= :from AND r.started_at < :to",
      { replacements: { methodId, from, to } },
    );
    for (const a of assignments) {
      const map = (typeof a.channel_batches === "string" ? JSON.parse(a.channel_batches) : a.channel_batches) as Record<
        string,
        number | null
      >;
      for (const [ch, batch] of Object.entries(map ?? {})) if (typeof batch === "number") batchChannel.set(batch, ch);
    }
  }
  const rows = grouped.map((g) => ({ ...g, channel: g.channel ?? (g.batch_id === null ? null : (batchChannel.get(g.batch_id) ?? null)) }));
  const perChannel: Record<string, number> = {};
  for (const r of rows) if (r.channel) perChannel[r.channel] = (perChannel[r.channel] ?? 0) + Number(r.volume);
  const contents: Record<string, ChannelContent> = {};
  const streamVolume: Record<string, { stream: string; volume: number }> = {};
  const byReagent_mL: Record<string, number> = {};
  let total = 0;
  for (const r of rows) {
    const volume = Number(r.volume);
    byReagent_mL[r.reagent_id] = (byReagent_mL[r.reagent_id] ?? 0) + volume;
    total += volume;
    if (r.stream && volume > (streamVolume[r.reagent_id]?.volume ?? -1)) streamVolume[r.reagent_id] = { stream: r.stream, volume };
    const channelTotal = r.channel ? perChannel[r.channel] : undefined;
    if (!r.channel || !channelTotal) continue;
    const c = (contents[r.channel] ??= { mL_per_mL: {}, g_per_mL: {} });
    if (volume > 0) c.mL_per_mL[r.reagent_id] = (c.mL_per_mL[r.reagent_id] ?? 0) + volume / channelTotal;
    if (r.mass) c.g_per_mL[r.reagent_id] = (c.g_per_mL[r.reagent_id] ?? 0) + Number(r.mass) / channelTotal;
  }
  const streams = Object.fromEntries(Object.entries(streamVolume).map(([k, v]) => [k, v.stream]));
  return { runs: Number(counts?.runs ?? 0), injections: Number(counts?.injections ?? 0), contents, streams, byReagent_mL, total_mL: total };
}

/** The main liquid on each channel: the reagent with the largest share. */
export function mainSolvents(contents: Record<string, ChannelContent>): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [channel, c] of Object.entries(contents)) {
    const [best] = Object.entries(c.mL_per_mL).sort((a, b) => b[1] - a[1]);
    if (best) out[channel] = best[0];
  }
  return out;
}

/** The stream a reagent goes to: as booked for this method, else the catalogue's. */
export function streamOf(streams: Record<string, string>, reagentId: string): string {
  return streams[reagentId] ?? getReagent(reagentId)?.wasteStream.value ?? "unassigned";
}

/** Today's internal price of every reagent with a general (not grade-specific) rate. */
export async function todayRates(now: Date): Promise<Record<string, TodayRate>> {
  const rates = await loadRates();
  const currency = rates.find((r) => r.kind === "reagent" && r.priceList === "internal")?.currency ?? "EUR";
  const out: Record<string, TodayRate> = {};
  for (const id of new Set(rates.filter((r) => r.kind === "reagent" && r.reagentId).map((r) => r.reagentId!))) {
    const rate = rateInForce(rates, { kind: "reagent", reagentId: id, priceList: "internal", currency, at: now });
    if (rate && (rate.unit === "L" || rate.unit === "g"))
      out[id] = { unit: rate.unit, amount_minor: rate.amount_minor, currency: rate.currency };
  }
  return out;
}

/**
 * The ledger shows what the channels held in past runs; when the method's current version came
 * from a variant that changed the organic solvent, its channel holds the new solvent from now on.
 */
export async function withCurrentSolvents(methodId: number, use: MethodLedgerUse): Promise<MethodLedgerUse> {
  const current = await selectOne<{ params: unknown; origin: string }>(
    `SELECT va.params, mv.origin FROM method_versions mv LEFT JOIN method_variants va ON va.id = mv.variant_id
      WHERE mv.method_id = ? AND mv.approved_at IS NOT NULL ORDER BY mv.version DESC LIMIT 1`,
    { replacements: [methodId] },
  );
  const params = current?.params
    ? ((typeof current.params === "string" ? JSON.parse(current.params) : current.params) as VariantParams)
    : null;
  const s = params?.substitution;
  if (!s) return use;
  const blend = typeof s.to === "string" ? { [s.to]: 100 } : (s.to as Record<string, number>);
  const contents = { ...use.contents };
  contents[s.channel] = swapped(contents[s.channel] ?? { mL_per_mL: { [s.from]: 1 }, g_per_mL: {} }, { [s.from]: blend })!;
  const streams = { ...use.streams };
  for (const r of Object.keys(blend)) if (!streams[r] && streams[s.from]) streams[r] = streams[s.from]!;
  return { ...use, contents, streams };
}
