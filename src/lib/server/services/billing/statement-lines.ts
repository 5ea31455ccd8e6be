/**
 * A statement's lines from the ledger: the database sums use per project, reagent, grade and day,
 * and counts injections and prepared batches; `buildStatement` (pure) costs them at the rates in
 * force on each day. Drafts, the period overview and issuing all compute through here.
 */
import type { Transaction } from "sequelize";
import { periodBounds } from "../../../ledger/period";
import { buildStatement, type CountRow, type StatementComputation, type UsageRow } from "../../../billing/statement";
import { HttpError } from "../../http";
import { Client } from "../../models/organisation";
import { select } from "../../query";
import { getFacilitySettings } from "../facility-settings";
import { loadRates } from "./rates";

interface UsageSumRow {
  project_code: string;
  project_name: string;
  reagent_id: string;
  reagent_name: string;
  grade: string | null;
  day: string;
  volume_ml: number | null;
  mass_g: number | null;
}

/** Injections of runs, or batches prepared for a project, per project and day. */
interface CountSumRow {
  project_code: string;
  project_name: string;
  day: string;
  count: number;
}

// Days are the facility's local days: the offset in force at each instant (facility_utc_offsets).
const LOCAL_OCCURRED =
  "(le.occurred_at + INTERVAL COALESCE((SELECT o.offset_minutes FROM facility_utc_offsets o WHERE o.starts_at <= le.occurred_at ORDER BY o.starts_at DESC LIMIT 1), 0) MINUTE)";
const LOCAL_STARTED =
  "(ru.started_at + INTERVAL COALESCE((SELECT o.offset_minutes FROM facility_utc_offsets o WHERE o.starts_at <= ru.started_at ORDER BY o.starts_at DESC LIMIT 1), 0) MINUTE)";

const USAGE_SUMS = `
  SELECT u.project_code, u.project_name, u.reagent_id, u.reagent_name, u.grade, u.day,
         SUM(u.volume_ml) AS volume_ml, SUM(u.mass_g) AS mass_g
    FROM (SELECT p.code AS project_code, p.name AS project_name, le.reagent_id, r.name AS reagent_name,
                 (SELECT sl.grade FROM batch_components bc JOIN stock_lots sl ON sl.id = bc.stock_lot_id
                   WHERE bc.batch_id = le.batch_id AND bc.reagent_id = le.reagent_id ORDER BY bc.id LIMIT 1) AS grade,
                 DATE_FORMAT(${LOCAL_OCCURRED}, '%Y-%m-%d') AS day, le.volume_ml, le.mass_g
            FROM ledger_entries le
            JOIN projects p ON p.id = le.project_id
            JOIN reagents r ON r.id = le.reagent_id
           WHERE p.client_id = :clientId AND le.occurred_at >= :start AND le.occurred_at < :end
             AND le.kind <> 'preparation') u
   GROUP BY u.project_code, u.project_name, u.reagent_id, u.reagent_name, u.grade, u.day`;

const INJECTION_SUMS = `
  SELECT p.code AS project_code, p.name AS project_name, DATE_FORMAT(${LOCAL_STARTED}, '%Y-%m-%d') AS day, SUM(ru.injections) AS count
    FROM runs ru JOIN projects p ON p.id = ru.project_id
   WHERE p.client_id = :clientId AND ru.started_at >= :start AND ru.started_at < :end
   GROUP BY p.code, p.name, day`;

// A batch prepared for a project carries one preparation fee, on the day it was made.
const PREPARATION_COUNTS = `
  SELECT b.project_code, b.project_name, b.day, COUNT(*) AS count FROM (
    SELECT p.code AS project_code, p.name AS project_name, le.batch_id, DATE_FORMAT(MIN(${LOCAL_OCCURRED}), '%Y-%m-%d') AS day
      FROM ledger_entries le JOIN projects p ON p.id = le.project_id
     WHERE p.client_id = :clientId AND le.kind = 'preparation' AND le.batch_id IS NOT NULL
     GROUP BY p.code, p.name, le.batch_id) b
   WHERE b.day >= :startDay AND b.day <= :endDay
   GROUP BY b.project_code, b.project_name, b.day`;

const counts = (rows: CountSumRow[]): CountRow[] =>
  rows.map((r) => ({ projectCode: r.project_code, projectName: r.project_name, day: r.day, count: r.count }));

/** Lines for a client and period from the ledger at the rates in force on each day. */
export async function computeStatement(
  clientId: number,
  periodStart: string,
  periodEnd: string,
  transaction?: Transaction,
): Promise<StatementComputation> {
  const client = await Client.findByPk(clientId, { transaction });
  if (!client) throw new HttpError(404, `clientId: no client ${clientId}`);
  // Summed by the database per day: rates change at most daily.
  const { timeZone } = await getFacilitySettings(transaction);
  const [start, end] = periodBounds(periodStart, periodEnd, timeZone);
  const options = { replacements: { clientId, start, end, startDay: periodStart, endDay: periodEnd }, transaction };
  const usage: UsageRow[] = (await select<UsageSumRow>(USAGE_SUMS, options)).map((u) => ({
    projectCode: u.project_code,
    projectName: u.project_name,
    reagentId: u.reagent_id,
    reagentName: u.reagent_name,
    grade: u.grade,
    day: u.day,
    volume_mL: u.volume_ml ?? 0,
    mass_g: u.mass_g,
  }));
  return buildStatement({
    usage,
    injections: counts(await select<CountSumRow>(INJECTION_SUMS, options)),
    preparations: counts(await select<CountSumRow>(PREPARATION_COUNTS, options)),
    rates: await loadRates(client.kind, client.currency, transaction),
    priceList: client.kind,
    currency: client.currency,
  });
}
