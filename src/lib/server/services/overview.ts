import { QueryTypes } from "sequelize";
import { getSequelize } from "../db";

const DAY = 86_400_000;

export interface ProjectVolume {
  projectCode: string;
  projectName: string;
  clientName: string;
  volume_mL: number;
  runs: number;
}

/** Volume drawn per project over the last `days` days, optionally for one client organisation. */
export async function recentUsageByProject(days: number, clientId: number | null = null, now = new Date()): Promise<ProjectVolume[]> {
  const rows = await getSequelize().query<{ code: string; name: string; client: string; volume: string; runs: number }>(
    `SELECT p.code, p.name, c.name AS client, COALESCE(SUM(l.volume_ml), 0) AS volume,
            COUNT(DISTINCT CASE WHEN l.kind = 'run' THEN l.source_id END) AS runs
       FROM projects p
       JOIN clients c ON c.id = p.client_id
       LEFT JOIN ledger_entries l ON l.project_id = p.id AND l.occurred_at >= :since AND l.occurred_at < :until
      WHERE (:clientId IS NULL OR p.client_id = :clientId)
      GROUP BY p.id, p.code, p.name, c.name
      ORDER BY volume DESC, p.code`,
    { type: QueryTypes.SELECT, replacements: { since: new Date(now.getTime() - days * DAY), until: now, clientId } },
  );
  return rows.map((r) => ({ projectCode: r.code, projectName: r.name, clientName: r.client, volume_mL: Number(r.volume), runs: Number(r.runs) }));
}

export interface ContainerFill {
  code: string;
  stream: string;
  room: string;
  where: string | null;
  capacity_mL: number;
  estimated_mL: number;
  fillPercent: number;
  status: string;
  accumulationStartedAt: string | null;
}

/** Live waste containers (not yet collected), fullest first. */
export async function liveContainers(): Promise<ContainerFill[]> {
  const rows = await getSequelize().query<{ code: string; stream: string; room: string; location_note: string | null; capacity_ml: number; estimated_volume_ml: string; status: string; accumulation_started_at: Date | null }>(
    `SELECT c.code, s.name AS stream, c.room, c.location_note, c.capacity_ml, c.estimated_volume_ml, c.status, c.accumulation_started_at
       FROM waste_containers c JOIN waste_streams s ON s.id = c.stream_id
      WHERE c.status <> 'collected'`,
    { type: QueryTypes.SELECT },
  );
  return rows
    .map((r) => {
      const estimated = Number(r.estimated_volume_ml);
      return {
        code: r.code,
        stream: r.stream,
        room: r.room,
        where: r.location_note,
        capacity_mL: r.capacity_ml,
        estimated_mL: estimated,
        fillPercent: r.capacity_ml ? Math.round((estimated / r.capacity_ml) * 100) : 0,
        status: r.status,
        accumulationStartedAt: r.accumulation_started_at ? new Date(r.accumulation_started_at).toISOString() : null,
      };
    })
    .sort((a, b) => b.fillPercent - a.fillPercent);
}

export interface FlammablesInRoom {
  room: string;
  onHand_L: number;
}

/** Flammable liquids on hand per room, from the remaining quantity of unexpired stock lots. */
export async function flammablesByRoom(): Promise<FlammablesInRoom[]> {
  const rows = await getSequelize().query<{ room: string; remaining: string }>(
    `SELECT COALESCE(l.room, 'unassigned') AS room, SUM(l.remaining) AS remaining
       FROM stock_lots l JOIN reagents r ON r.id = l.reagent_id
      WHERE r.flammable = 1 AND r.unit = 'mL'
      GROUP BY COALESCE(l.room, 'unassigned') ORDER BY room`,
    { type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ room: r.room, onHand_L: Number(r.remaining) / 1000 }));
}
