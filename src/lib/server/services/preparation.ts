/**
 * Recording a batch (`POST /api/batches`). The server recomputes every target from the recipe
 * version with the same pure plan the form used, checks the lots (an expired lot is refused),
 * flags deviations against the facility's tolerances, sets the expiry from the rule table and the
 * lots, and writes batch, components, bottles, stock debits, ledger entries and the audit line in
 * one transaction. The form's idempotency key makes a double click harmless.
 */
import { UniqueConstraintError, type Transaction } from "sequelize";
import { ChemInputError } from "../../chem";
import type { NewLedgerEntry } from "../../ledger/types";
import { batchCodeBase, nextBatchCode } from "../../preparation/batch-code";
import { findDeviations, type Deviation } from "../../preparation/deviations";
import { batchExpiry, lotExpired } from "../../preparation/expiry";
import { assayUsed, lotChemistry } from "../../preparation/lot-assays";
import { preparationPlan, type PlannedComponent } from "../../preparation/plan";
import type { RecordedBatch } from "../../preparation/types";
import type { BatchCreateInput } from "../../schemas/preparation";
import { recordAudit } from "../audit";
import type { SignedInUser } from "../guard";
import { HttpError } from "../http";
import { withIdempotencyKey } from "../idempotency";
import { execute, jsonColumn, select, selectOne } from "../query";
import { getBatch } from "./batches";
import { appendEntries, ensureCatalogueRows } from "./ledger";
import { getPreparationSettings } from "./preparation-settings";
import { getRecipeVersion } from "./recipes";
import { getStockLots } from "./stock-lots";

/** Pairs each planned component with the form's line for the same reagent (in order, for repeats). */
function pairComponents(planned: readonly PlannedComponent[], given: BatchCreateInput["components"]) {
  const used = new Set<number>();
  return planned.map((p, i) => {
    const index = given.findIndex((g, j) => !used.has(j) && g.reagent === p.reagent);
    if (index < 0)
      throw new HttpError(400, `components.${i}.stockLotId: pick the lot of ${p.name} used`, {
        fields: { [`components.${i}.stockLotId`]: `Pick the lot of ${p.name} used` },
      });
    used.add(index);
    return { planned: p, given: given[index]!, index };
  });
}

/**
 * The rooms Decant knows, sorted: those of the instruments, the stock lots and the flammables
 * room limits. The preparation form offers them for "Kept in room"; the first is the default.
 */
export async function knownRooms(transaction?: Transaction): Promise<string[]> {
  const rows = await select<{ room: string | null }>(
    `SELECT room FROM instruments WHERE active = 1 UNION SELECT room FROM stock_lots UNION SELECT room FROM batches`,
    { transaction },
  );
  const limits = await selectOne<{ value: unknown }>("SELECT value FROM settings WHERE `key` = 'flammables.roomLimit_L'", { transaction });
  let limitRooms: string[] = [];
  try {
    const value = jsonColumn(limits?.value);
    if (value && typeof value === "object" && !Array.isArray(value)) limitRooms = Object.keys(value);
  } catch {
    limitRooms = [];
  }
  const rooms = new Set(
    [...rows.map((r) => r.room), ...limitRooms].filter((r): r is string => typeof r === "string" && r.trim() !== "").map((r) => r.trim()),
  );
  return [...rooms].sort((a, b) => a.localeCompare(b));
}

/** Everything checked before a batch is written, and what the checks worked out; every read on the transaction. */
async function checkBatch(input: BatchCreateInput, now: Date, transaction: Transaction) {
  const version = await getRecipeVersion(input.recipeVersionId, transaction);
  if (version.retired) throw new HttpError(409, `recipeVersionId: ${version.code} is retired`);
  if (!version.approved)
    throw new HttpError(409, `recipeVersionId: ${version.code} v${version.version} is not approved yet; a manager approves it first`);

  // The lots come first: their assays set the amounts to weigh.
  const lots = await getStockLots(
    input.components.map((c) => c.stockLotId),
    now,
    transaction,
  );
  const picked = input.components.map((c) => {
    const lot = lots.get(c.stockLotId);
    return lot && lot.reagent === c.reagent ? lot : undefined;
  });
  picked.forEach((lot, i) => {
    const other = picked.findIndex(
      (l) => l !== undefined && lot !== undefined && l.reagent === lot.reagent && l.assayPercent !== lot.assayPercent,
    );
    if (lot && other >= 0 && other < i) {
      const message = `Use one lot of ${lot.reagentName} for the batch, or lots with the same assay: its assay sets the amounts`;
      throw new HttpError(400, `components.${i}.stockLotId: ${message}`, { fields: { [`components.${i}.stockLotId`]: message } });
    }
  });
  let plan;
  try {
    plan = preparationPlan({
      spec: version.spec,
      volume_mL: input.volume_mL,
      temperature_C: input.temperature_C,
      detection_nm: version.detection_nm,
      ...lotChemistry(picked),
    });
  } catch (error) {
    if (error instanceof ChemInputError) throw new HttpError(400, `${error.field ?? "recipe"}: ${error.message}`);
    throw error;
  }
  const pairs = pairComponents(plan.components, input.components);
  for (const { planned, given, index } of pairs) {
    const field = `components.${index}.stockLotId`;
    const lot = lots.get(given.stockLotId);
    if (!lot) throw new HttpError(400, `${field}: no stock lot ${given.stockLotId}`, { fields: { [field]: "No such lot" } });
    if (lot.reagent !== planned.reagent)
      throw new HttpError(400, `${field}: lot ${lot.lotNumber} is ${lot.reagentName}, not ${planned.name}`, {
        fields: { [field]: `Lot ${lot.lotNumber} is ${lot.reagentName}` },
      });
    if (lotExpired(lot.expiresOn, now)) {
      const message = `lot ${lot.lotNumber} of ${lot.reagentName} expired on ${lot.expiresOn} and cannot be used; pick a lot in date`;
      throw new HttpError(400, `${field}: ${message}`, { fields: { [field]: message } });
    }
  }

  if (version.spec.buffer && (input.measuredPH === undefined || input.measuredPH === null)) {
    throw new HttpError(400, "measuredPH: record the pH measured on the aqueous part", {
      fields: { measuredPH: "Record the measured pH" },
    });
  }

  const settings = await getPreparationSettings(transaction);
  const deviations = findDeviations({
    tolerances: settings.tolerances,
    targetPH: version.spec.buffer?.targetPH ?? null,
    measuredPH: input.measuredPH ?? null,
    components: pairs.map(({ planned, given }) => ({
      name: planned.name,
      unit: planned.unit,
      target: planned.target,
      actual: given.actualAmount ?? null,
    })),
  });
  const reason = input.deviationReason?.trim() ?? "";
  const rooms = await knownRooms(transaction);
  if (input.room !== undefined && !rooms.includes(input.room)) {
    const message = `No room "${input.room}" is known; pick one of ${rooms.join(", ") || "the rooms of the instruments and stock lots"}`;
    throw new HttpError(400, `room: ${message}`, { fields: { room: message } });
  }
  const room = input.room ?? rooms[0] ?? null;
  if (deviations.length > 0 && reason.length < 5) {
    throw new HttpError(
      400,
      `deviationReason: outside tolerance (${deviations.map((d) => d.message).join("; ")}); give a reason to record the batch anyway`,
      {
        fields: { deviationReason: "Give a reason for the deviation" },
        deviations,
      },
    );
  }

  const expiry = batchExpiry({
    kind: plan.kind,
    preparedAt: now,
    rules: settings.expiryRules,
    lots: pairs.map((p) => lots.get(p.given.stockLotId)!).map((l) => ({ lotNumber: l.lotNumber, expiresOn: l.expiresOn })),
  });

  const snapshot = {
    recipeId: version.recipeId,
    recipeVersionId: version.versionId,
    code: version.code,
    name: version.name,
    version: version.version,
    spec: version.spec,
    detection_nm: version.detection_nm,
    storage: version.storage,
    kind: plan.kind,
  };
  return { pairs, lots, deviations, reason, room, expiry, snapshot };
}

export async function recordBatch(
  input: BatchCreateInput,
  actor: SignedInUser,
  ip: string | null = null,
  now = new Date(),
): Promise<RecordedBatch> {
  const { value: batchId, replayed } = await withIdempotencyKey("batch", input.idempotencyKey, async (transaction) => {
    const { pairs, lots, deviations, reason, room, expiry, snapshot } = await checkBatch(input, now, transaction);
    const batchId = await insertBatch({ ...input, room: room ?? undefined }, snapshot, expiry, deviations, reason, actor, now, transaction);
    await ensureCatalogueRows(
      pairs.map((p) => p.planned.reagent),
      transaction,
    );
    const ledger: NewLedgerEntry[] = [];
    for (const { planned, given } of pairs) {
      const actual = given.actualAmount ?? planned.target;
      const assay = assayUsed(planned.reagent, planned.role, lots.get(given.stockLotId));
      await execute(
        `INSERT INTO batch_components (batch_id, reagent_id, stock_lot_id, role, unit, target_amount, actual_amount, assay_percent, assay_source)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)`,
        {
          replacements: [
            batchId,
            planned.reagent,
            given.stockLotId,
            planned.role,
            planned.unit,
            planned.target.toFixed(5),
            given.actualAmount == null ? null : given.actualAmount.toFixed(5),
            assay ? assay.percent.toFixed(3) : null,
            assay?.source ?? null,
          ],
          transaction,
        },
      );
      await execute(
        "UPDATE stock_lots SET remaining = GREATEST(0, remaining - ?), opened_on = COALESCE(opened_on, ?), updated_at = NOW(3) WHERE id = ?",
        {
          replacements: [actual.toFixed(3), now.toISOString().slice(0, 10), given.stockLotId],
          transaction,
        },
      );
      ledger.push({
        occurredAt: now,
        projectId: null,
        kind: "preparation",
        batchId,
        reagentId: planned.reagent,
        volume_mL: planned.unit === "mL" ? actual : 0,
        mass_g: planned.unit === "g" ? actual : null,
        channel: null,
        wasteStreamId: null,
        wasteContainerId: null,
        sourceKind: "manual",
        sourceId: `batch:${batchId}`,
        authorId: actor.id,
      });
    }
    await appendEntries(ledger, transaction);
    for (let n = 1; n <= input.bottles; n++) {
      await execute(
        "INSERT INTO batch_bottles (batch_id, number, status, updated_by, created_at, updated_at) VALUES (?, ?, 'ready', ?, NOW(3), NOW(3))",
        { replacements: [batchId, n, actor.id], transaction },
      );
    }
    await recordAudit(
      {
        actorId: actor.id,
        action: "record",
        entity: "batch",
        entityId: batchId,
        ip,
        after: { ...input, room, expiresAt: expiry.expiresAt.toISOString(), deviations },
      },
      transaction,
    );
    return batchId;
  });
  return { created: !replayed, batch: await getBatch(batchId, now) };
}

/**
 * Inserts the batch row under the next free code of the day. Two batches recorded at the same
 * moment can deadlock on the day's code range; the idempotent transaction is tried again.
 */
async function insertBatch(
  input: BatchCreateInput,
  snapshot: object,
  expiry: { expiresAt: Date; reason: string },
  deviations: Deviation[],
  reason: string,
  actor: SignedInUser,
  now: Date,
  transaction: Transaction,
): Promise<number> {
  const base = batchCodeBase(now);
  for (let attempt = 0; attempt < 5; attempt++) {
    const taken = (
      await select<{ code: string }>("SELECT code FROM batches WHERE code = ? OR code LIKE ? FOR UPDATE", {
        replacements: [base, `${base}-%`],
        transaction,
      })
    ).map((r) => r.code);
    const code = nextBatchCode(base, taken);
    try {
      const { insertId } = await execute(
        `INSERT INTO batches (code, recipe_version_id, spec_snapshot, volume_ml, remaining_ml, bottles, bottle_size_ml, temperature_c, measured_ph, ph_temperature_c,
                              prepared_by, prepared_at, expires_at, expiry_reason, status, idempotency_key, deviations, deviation_reason, room, created_at, updated_at)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 'ready', ?, ?, ?, ?, NOW(3), NOW(3))`,
        {
          transaction,
          replacements: [
            code,
            input.recipeVersionId,
            JSON.stringify(snapshot),
            input.volume_mL,
            input.volume_mL,
            input.bottles,
            input.bottleSize_mL,
            input.temperature_C,
            input.measuredPH ?? null,
            input.phMeterTemperature_C ?? null,
            actor.id,
            now,
            expiry.expiresAt,
            expiry.reason.slice(0, 300),
            input.idempotencyKey,
            deviations.length ? JSON.stringify(deviations) : null,
            deviations.length ? reason : null,
            input.room ?? null,
          ],
        },
      );
      return insertId;
    } catch (error) {
      if (error instanceof UniqueConstraintError && JSON.stringify(error.fields ?? {}).includes("code")) continue;
      throw error;
    }
  }
  throw new HttpError(503, "Could not allot a batch code; try again.");
}
