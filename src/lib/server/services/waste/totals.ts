// The period totals the safety officer reviews (/waste, /api/waste/summary) and the waste on hand now.
import { periodBounds } from "../../../ledger/period";
import type { Period } from "../../../waste/period";
import { onHandFrom, summaryFrom, UNASSIGNED_STREAM, wasteReportFrom, type StreamSum } from "../../../waste/totals";
import type { WasteOnHand, WasteReport, WasteSummary } from "../../../waste/types";
import { WasteStream } from "../../models/waste";
import { select } from "../../query";
import { getFacilitySettings } from "../facility-settings";
import { listContainers } from "./containers";

// What reaches waste: runs, discards and draws, and the corrections that reverse one of them.
const wasteEntries = (joins = "") => `
  FROM ledger_entries l
  ${joins}
  LEFT JOIN ledger_entries rev ON rev.id = l.reverses_id
 WHERE l.occurred_at >= :start AND l.occurred_at < :end
   AND (l.kind IN ('run', 'discard', 'draw') OR (l.kind = 'correction' AND rev.kind IN ('run', 'discard', 'draw')))`;
const STREAM_OF = `COALESCE(l.waste_stream_id, rev.waste_stream_id, '${UNASSIGNED_STREAM}')`;

/**
 * The ledger's waste volume per stream in the period; `by` names further columns to group by
 * (column → SQL expression), `joins` the tables they come from.
 */
async function streamSums<Key extends object = object>(period: Period, by: Record<string, string> = {}, joins = "") {
  // The facility's local days (a month is its local month).
  const { timeZone } = await getFacilitySettings();
  const [start, end] = periodBounds(period.from, period.to, timeZone);
  const columns = Object.entries(by).map(([name, sql]) => `${sql} AS ${name}, `);
  const groupBy = [...Object.values(by), STREAM_OF].join(", ");
  return select<Key & StreamSum>(
    `SELECT ${columns.join("")}${STREAM_OF} AS stream, SUM(l.volume_ml) AS volume_mL ${wasteEntries(joins)} GROUP BY ${groupBy}`,
    { replacements: { start, end } },
  );
}

/** The fixed contract of `GET /api/waste/summary`: every site stream (0 when nothing went to it), by volume. */
export async function wasteSummary(period: Period): Promise<WasteSummary> {
  const [sums, streams] = await Promise.all([
    streamSums(period),
    WasteStream.findAll({ attributes: ["id", "restrictiveness"], order: [["restrictiveness", "DESC"]] }),
  ]);
  return summaryFrom(
    streams.map((s) => s.id),
    sums,
  );
}

/** The safety officer's view of a period: by stream, room (of the container), project and month. */
export async function wasteReport(period: Period): Promise<WasteReport> {
  const [summary, streams, byRoom, byProject, byMonth] = await Promise.all([
    wasteSummary(period),
    WasteStream.findAll({ attributes: ["id", "name"] }),
    streamSums<{ room: string }>(
      period,
      { room: "COALESCE(c.room, 'not recorded')" },
      "LEFT JOIN waste_containers c ON c.id = l.waste_container_id",
    ),
    streamSums<{ code: string | null; name: string | null }>(
      period,
      { code: "p.code", name: "p.name" },
      "LEFT JOIN projects p ON p.id = l.project_id",
    ),
    streamSums<{ month: string }>(period, {
      month:
        "DATE_FORMAT(l.occurred_at + INTERVAL COALESCE((SELECT o.offset_minutes FROM facility_utc_offsets o WHERE o.starts_at <= l.occurred_at ORDER BY o.starts_at DESC LIMIT 1), 0) MINUTE, '%Y-%m')",
    }),
  ]);
  const streamNames = new Map(streams.map((s) => [s.id, s.name]));
  return wasteReportFrom({ period, summary, streamNames, byRoom, byProject, byMonth });
}

/** Waste on hand now: live containers (collected ones have left), by stream and by room. */
export async function wasteOnHand(now = new Date()): Promise<WasteOnHand> {
  return onHandFrom(await listContainers({ now }));
}
