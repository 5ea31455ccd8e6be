/**
 * The period totals the safety officer reviews, from the ledger's sums per stream and per room,
 * project or month. Pure: the service runs the sums, this shapes and rounds them. Volumes keep the
 * ledger's precision (4 decimals of a mL).
 */
import { monthsIn, type Period } from "./period";
import type { ContainerView, WasteOnHand, WasteReport, WasteSummary } from "./types";

export const roundVolume = (mL: number) => Math.round(mL * 10_000) / 10_000;

/** The stream id of ledger entries that name no stream. */
export const UNASSIGNED_STREAM = "unassigned";

/** One sum of the ledger: a stream's volume in one room, project or month. */
export interface StreamSum {
  stream: string;
  volume_mL: number;
}

/** Every site stream (0 when nothing went to it), largest first, then by id. */
export function summaryFrom(siteStreams: readonly string[], sums: readonly StreamSum[]): WasteSummary {
  const totals = new Map<string, number>(siteStreams.map((id) => [id, 0]));
  for (const s of sums) totals.set(s.stream, roundVolume(s.volume_mL));
  return {
    streams: [...totals]
      .map(([stream, volume_mL]) => ({ stream, volume_mL }))
      .sort((a, b) => b.volume_mL - a.volume_mL || a.stream.localeCompare(b.stream)),
  };
}

function byKey<K>(sums: readonly (StreamSum & { key: K })[]): Map<K, Record<string, number>> {
  const out = new Map<K, Record<string, number>>();
  for (const s of sums) {
    const streams = out.get(s.key) ?? {};
    streams[s.stream] = roundVolume((streams[s.stream] ?? 0) + s.volume_mL);
    out.set(s.key, streams);
  }
  return out;
}

const total = (streams: Record<string, number>) => roundVolume(Object.values(streams).reduce((a, b) => a + b, 0));

export interface ReportSums {
  period: Period;
  summary: WasteSummary;
  /** Stream id → the site's name for it. */
  streamNames: ReadonlyMap<string, string>;
  byRoom: readonly (StreamSum & { room: string })[];
  /** Project code and name are null for entries without a project. */
  byProject: readonly (StreamSum & { code: string | null; name: string | null })[];
  /** Month as YYYY-MM. */
  byMonth: readonly (StreamSum & { month: string })[];
}

/** The report of a period: by stream, room (of the container), project and month (every month of the period). */
export function wasteReportFrom(sums: ReportSums): WasteReport {
  const nameOf = (id: string) => sums.streamNames.get(id) ?? (id === UNASSIGNED_STREAM ? "No stream recorded" : id);
  const rooms = byKey(sums.byRoom.map((s) => ({ ...s, key: s.room })));
  const projects = byKey(sums.byProject.map((s) => ({ ...s, key: s.code ?? "—" })));
  const projectNames = new Map(sums.byProject.map((p) => [p.code ?? "—", p.name ?? "No project"]));
  const months = byKey(sums.byMonth.map((s) => ({ ...s, key: s.month })));
  return {
    period: sums.period,
    streams: sums.summary.streams.map((s) => ({ ...s, name: nameOf(s.stream) })),
    byRoom: [...rooms]
      .map(([room, streams]) => ({ room, streams, volume_mL: total(streams) }))
      .sort((a, b) => a.room.localeCompare(b.room)),
    byProject: [...projects]
      .map(([code, streams]) => ({ projectCode: code, projectName: projectNames.get(code) ?? "", streams, volume_mL: total(streams) }))
      .sort((a, b) => b.volume_mL - a.volume_mL),
    byMonth: monthsIn(sums.period).map((month) => {
      const streams = months.get(month) ?? {};
      return { month, streams, volume_mL: total(streams) };
    }),
    total_mL: roundVolume(sums.summary.streams.reduce((a, s) => a + s.volume_mL, 0)),
  };
}

/** What the live containers hold now, by stream and by room. */
export function onHandFrom(containers: readonly Pick<ContainerView, "streamId" | "room" | "estimated_mL">[]): WasteOnHand {
  const byStream: Record<string, number> = {};
  const byRoom: Record<string, number> = {};
  for (const c of containers) {
    byStream[c.streamId] = (byStream[c.streamId] ?? 0) + c.estimated_mL;
    byRoom[c.room] = (byRoom[c.room] ?? 0) + c.estimated_mL;
  }
  return { byStream, byRoom, total_mL: containers.reduce((a, c) => a + c.estimated_mL, 0) };
}
