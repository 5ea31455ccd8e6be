// The site's waste streams and their routing rules (/waste/streams, /api/waste/streams).
import type { Transaction } from "sequelize";
import type { StreamInput, StreamUpdate } from "../../../schemas/waste";
import { DEFAULT_STREAM_BY_ID, effectiveRule } from "../../../waste/streams";
import type { EffectiveRule, StreamRule, StreamView } from "../../../waste/types";
import { getSequelize } from "../../db";
import { HttpError } from "../../http";
import { WasteStream } from "../../models/waste";
import { select } from "../../query";
import { inTransaction } from "../sql";
import { auditWaste, type WasteActor } from "./audit";

/** The rule in force for a stream row, and which of its parts are the common-practice default. */
export function streamRuleOf(row: WasteStream): EffectiveRule {
  const { id, name, restrictiveness, minSharePercent, alsoAccepts } = row;
  return effectiveRule({ id, name, restrictiveness, minShare_percent: minSharePercent, alsoAccepts });
}

/** The site's streams with their effective rules, most restrictive first. */
export async function listStreams(transaction?: Transaction): Promise<StreamView[]> {
  const rows = await WasteStream.findAll({
    order: [
      ["restrictiveness", "DESC"],
      ["id", "ASC"],
    ],
    transaction,
  });
  const counts = await select<{ stream_id: string; n: number }>(
    "SELECT stream_id, COUNT(*) AS n FROM waste_containers WHERE status <> 'collected' GROUP BY stream_id",
    { transaction },
  );
  return rows.map((row) => ({
    ...streamRuleOf(row),
    description: row.description,
    basis: DEFAULT_STREAM_BY_ID[row.id]?.basis ?? null,
    containers: counts.find((c) => c.stream_id === row.id)?.n ?? 0,
  }));
}

/** Every stream's rule in force, for routing a mix. */
export async function streamRules(transaction?: Transaction): Promise<StreamRule[]> {
  return (await WasteStream.findAll({ transaction })).map(streamRuleOf);
}

function streamSnapshot(row: WasteStream) {
  return {
    name: row.name,
    description: row.description,
    restrictiveness: row.restrictiveness,
    minShare_percent: row.minSharePercent,
    alsoAccepts: row.alsoAccepts,
  };
}

async function checkAccepted(ids: readonly string[] | null, self: string, transaction: Transaction) {
  if (!ids) return;
  const known = new Set((await WasteStream.findAll({ attributes: ["id"], transaction })).map((s) => s.id));
  known.add(self);
  for (const id of ids) if (!known.has(id)) throw new HttpError(400, `alsoAccepts: no stream "${id}"`);
}

const fieldsOf = (input: StreamUpdate) => ({
  name: input.name,
  description: input.description,
  restrictiveness: input.restrictiveness,
  minSharePercent: input.minShare_percent,
  alsoAccepts: input.alsoAccepts,
});

export async function createStream(input: StreamInput, ctx: WasteActor): Promise<StreamView> {
  await inTransaction(getSequelize(), async (transaction) => {
    if (await WasteStream.findByPk(input.id, { transaction })) throw new HttpError(409, `id: a stream "${input.id}" exists already`);
    await checkAccepted(input.alsoAccepts, input.id, transaction);
    const row = await WasteStream.create({ id: input.id, ...fieldsOf(input) }, { transaction });
    await auditWaste(
      ctx,
      { action: "waste.stream.create", entity: "waste_stream", entityId: row.id, after: streamSnapshot(row) },
      transaction,
    );
  });
  return (await listStreams()).find((s) => s.id === input.id)!;
}

export async function updateStream(id: string, input: StreamUpdate, ctx: WasteActor): Promise<StreamView> {
  await inTransaction(getSequelize(), async (transaction) => {
    const row = await WasteStream.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw new HttpError(404, `No waste stream "${id}".`);
    await checkAccepted(input.alsoAccepts, id, transaction);
    const before = streamSnapshot(row);
    await row.update(fieldsOf(input), { transaction });
    await auditWaste(
      ctx,
      { action: "waste.stream.update", entity: "waste_stream", entityId: id, before, after: streamSnapshot(row) },
      transaction,
    );
  });
  return (await listStreams()).find((s) => s.id === id)!;
}
