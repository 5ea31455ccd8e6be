/**
 * The facility's time zone, locale and currency (`/api/settings/facility`): the one place pages,
 * services, labels, statements and the digest read them from.
 */
import type { Sequelize, Transaction } from "sequelize";
import { offsetChanges } from "../../format";
import { DEFAULT_FACILITY, type FacilitySettings, type FacilitySettingsPatch } from "../../schemas/facility";
import { recordAudit } from "../audit";
import { getSequelize } from "../db";
import type { SignedInUser } from "../guard";
import { execute, jsonColumn, select } from "../query";
import { inTransaction } from "./sql";

const KEYS: Record<keyof FacilitySettings, string> = {
  timeZone: "facility.timeZone",
  locale: "facility.locale",
  currency: "facility.currency",
};

/** The years the offset table covers: those a stored instant may fall in (`lib/schemas/fields.ts`). */
const OFFSET_YEARS = [1970, 2199] as const;

/** A JSON string column: the driver hands it over as JSON text or already parsed (a bare string), by the server's metadata. */
function textSetting(value: unknown): unknown {
  if (typeof value !== "string") return value;
  try {
    return jsonColumn<unknown>(value);
  } catch {
    return value;
  }
}

export async function getFacilitySettings(transaction?: Transaction): Promise<FacilitySettings> {
  const rows = await select<{ key: string; value: unknown }>("SELECT `key`, value FROM settings WHERE `key` IN (:keys)", {
    replacements: { keys: Object.values(KEYS) },
    transaction,
  });
  const values = new Map(rows.map((r) => [r.key, textSetting(r.value)]));
  const read = (field: keyof FacilitySettings) => {
    const value = values.get(KEYS[field]);
    return typeof value === "string" && value !== "" ? value : DEFAULT_FACILITY[field];
  };
  return { timeZone: read("timeZone"), locale: read("locale"), currency: read("currency") };
}

/**
 * Makes `ledger_daily` sum the local days of `timeZone`: the zone's offsets go into
 * `facility_utc_offsets` (read by the insert trigger) and the sums are rebuilt from the entries,
 * all in the caller's transaction, so usage never sees half of one zone and half of another.
 * Entries inserted meanwhile wait on the rebuild's locks and land in the new zone's days.
 */
export async function applyTimeZone(timeZone: string, on: { transaction: Transaction; sequelize?: Sequelize }): Promise<void> {
  const changes = offsetChanges(timeZone, ...OFFSET_YEARS);
  const { transaction } = on;
  const options = { transaction, ...(on.sequelize ? { sequelize: on.sequelize } : {}) };
  await execute("DELETE FROM facility_utc_offsets", options);
  // The first offset reaches back, the last forward, to the ends of DATETIME.
  const rows = changes.map((c, i) => [
    i === 0 ? new Date("1000-01-01T00:00:00Z") : c.startsAt,
    i + 1 < changes.length ? changes[i + 1]!.startsAt : new Date("9999-12-31T00:00:00Z"),
    c.offsetMinutes,
  ]);
  for (let i = 0; i < rows.length; i += 200) {
    const chunk = rows.slice(i, i + 200);
    await execute(
      `INSERT INTO facility_utc_offsets (starts_at, ends_at, offset_minutes) VALUES ${chunk.map(() => "(?, ?, ?)").join(", ")}`,
      {
        replacements: chunk.flat(),
        ...options,
      },
    );
  }
  await execute("DELETE FROM ledger_daily", options);
  // Offsets first: each offset's span is one range read of the occurred_at index.
  await execute(
    `INSERT INTO ledger_daily (day, project_id, reagent_id, volume_ml, mass_g, entries)
     SELECT DATE(e.occurred_at + INTERVAL o.offset_minutes MINUTE), e.project_id, e.reagent_id, SUM(e.volume_ml), SUM(e.mass_g), COUNT(*)
       FROM facility_utc_offsets o
       STRAIGHT_JOIN ledger_entries e ON e.occurred_at >= o.starts_at AND e.occurred_at < o.ends_at
      WHERE e.project_id IS NOT NULL
      GROUP BY DATE(e.occurred_at + INTERVAL o.offset_minutes MINUTE), e.project_id, e.reagent_id`,
    options,
  );
}

/** Writes the changed fields; a new zone rebuilds the per-day sums in the same transaction. */
export async function saveFacilitySettings(
  patch: FacilitySettingsPatch,
  actor: SignedInUser | null,
  ip: string | null = null,
): Promise<FacilitySettings> {
  return inTransaction(getSequelize(), async (transaction) => {
    // One change at a time: the zone's row is the lock (created first when it is missing).
    await execute("INSERT IGNORE INTO settings (`key`, value, updated_by, updated_at) VALUES (?, ?, NULL, NOW(3))", {
      replacements: [KEYS.timeZone, JSON.stringify(DEFAULT_FACILITY.timeZone)],
      transaction,
    });
    await select("SELECT `key` FROM settings WHERE `key` = ? FOR UPDATE", { replacements: [KEYS.timeZone], transaction });
    const before = await getFacilitySettings(transaction);
    const after: FacilitySettings = { ...before, ...Object.fromEntries(Object.entries(patch).filter(([, v]) => v !== undefined)) };
    for (const field of Object.keys(KEYS) as (keyof FacilitySettings)[]) {
      if (after[field] === before[field]) continue;
      await execute(
        "INSERT INTO settings (`key`, value, updated_by, updated_at) VALUES (?, ?, ?, NOW(3)) ON DUPLICATE KEY UPDATE value = VALUES(value), updated_by = VALUES(updated_by), updated_at = NOW(3)",
        { replacements: [KEYS[field], JSON.stringify(after[field]), actor?.id ?? null], transaction },
      );
    }
    if (after.timeZone !== before.timeZone) await applyTimeZone(after.timeZone, { transaction });
    if (JSON.stringify(after) !== JSON.stringify(before)) {
      await recordAudit(
        { actorId: actor?.id ?? null, action: "update", entity: "facility-settings", entityId: null, ip, before, after },
        transaction,
      );
    }
    return after;
  });
}
