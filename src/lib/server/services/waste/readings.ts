// Level readings and a container's history (/waste/containers/{id}, its readings route).
import type { ReadingInput } from "../../../schemas/waste";
import type { ContainerHistory, ReadingResult } from "../../../waste/types";
import { getSequelize } from "../../db";
import { HttpError } from "../../http";
import { WasteContainer, WasteReading } from "../../models/waste";
import { select } from "../../query";
import { inTransaction } from "../sql";
import { auditWaste, storedJson, type WasteActor } from "./audit";
import { estimateAt, getContainer } from "./containers";

const tenth = (mL: number) => Math.round(mL * 10) / 10;

/** Readings (newest first), the last 50 audit events and what went in during the current accumulation. */
export async function containerHistory(id: number): Promise<ContainerHistory> {
  const readings = await select<{
    id: number;
    read_at: Date;
    level_ml: number;
    estimated_before_ml: number;
    reader: string | null;
    note: string | null;
  }>(
    `SELECT r.id, r.read_at, r.level_ml, r.estimated_before_ml, u.name AS reader, r.note
       FROM waste_readings r LEFT JOIN users u ON u.id = r.reader_id WHERE r.container_id = :id ORDER BY r.read_at DESC, r.id DESC`,
    { replacements: { id } },
  );
  const events = await select<{ created_at: Date; action: string; actor: string | null; after: unknown }>(
    `SELECT a.created_at, a.action, u.name AS actor, a.after FROM audit_log a LEFT JOIN users u ON u.id = a.actor_id
      WHERE a.entity = 'waste_container' AND a.entity_id = :id ORDER BY a.created_at DESC, a.id DESC LIMIT 50`,
    { replacements: { id: String(id) } },
  );
  const contents = await select<{ reagent_id: string; v: number }>(
    `SELECT l.reagent_id, SUM(l.volume_ml) AS v FROM ledger_entries l JOIN waste_containers c ON c.id = l.waste_container_id
      WHERE c.id = :id AND (c.accumulation_started_at IS NULL OR l.occurred_at >= c.accumulation_started_at)
      GROUP BY l.reagent_id HAVING SUM(l.volume_ml) > 0 ORDER BY v DESC`,
    { replacements: { id } },
  );
  return {
    readings: readings.map((r) => ({
      id: r.id,
      at: r.read_at.toISOString(),
      level_mL: r.level_ml,
      estimatedBefore_mL: r.estimated_before_ml,
      difference_mL: tenth(r.level_ml - r.estimated_before_ml),
      reader: r.reader,
      note: r.note,
    })),
    events: events.map((e) => ({ at: e.created_at.toISOString(), action: e.action, actor: e.actor, detail: storedJson(e.after) })),
    contents: contents.map((c) => ({ reagentId: c.reagent_id, volume_mL: tenth(c.v) })),
  };
}

/** Records a level reading; the difference from Decant's estimate is stored with it. */
export async function recordReading(id: number, input: ReadingInput, ctx: WasteActor): Promise<ReadingResult> {
  const readAt = input.readAt ? new Date(input.readAt) : new Date();
  if (readAt.getTime() > Date.now() + 5 * 60_000) throw new HttpError(400, "readAt: cannot be in the future");
  const result = await inTransaction(getSequelize(), async (transaction) => {
    const container = await WasteContainer.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!container) throw new HttpError(404, `No waste container with id ${id}.`);
    if (container.status === "collected") throw new HttpError(409, `${container.code} was collected; a reading no longer applies.`);
    if (container.accumulationStartedAt && readAt < container.accumulationStartedAt)
      throw new HttpError(400, "readAt: before this container started accumulating");
    if (input.level_mL > container.capacityMl * 1.2)
      throw new HttpError(400, `level_mL: more than the container's capacity (${container.capacityMl} mL) allows`);
    const before = await estimateAt(id, readAt, transaction);
    const reading = await WasteReading.create(
      { containerId: id, readAt, levelMl: input.level_mL, estimatedBeforeMl: before, readerId: ctx.actor.id, note: input.note },
      { transaction },
    );
    const difference = Math.round((input.level_mL - before) * 10_000) / 10_000;
    await container.update({ estimatedVolumeMl: await estimateAt(id, new Date(), transaction) }, { transaction });
    await auditWaste(
      ctx,
      {
        action: "waste.reading",
        entity: "waste_container",
        entityId: id,
        before: { estimated_mL: before },
        after: { readingId: reading.id, level_mL: input.level_mL, difference_mL: difference, readAt: readAt.toISOString() },
      },
      transaction,
    );
    return { estimatedBefore_mL: tenth(before), difference_mL: tenth(difference) };
  });
  return { container: await getContainer(id), ...result };
}
