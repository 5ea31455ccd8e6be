/** Instruments (`/instruments`, `/api/instruments`): their pump channels and the waste container each drains to. */
import { UniqueConstraintError } from "sequelize";
import type { InstrumentSummary } from "../../ledger/types";
import type { InstrumentInput } from "../../schemas/instruments";
import { recordAudit } from "../audit";
import { getSequelize } from "../db";
import type { SignedInUser } from "../guard";
import { HttpError } from "../http";
import { Instrument } from "../models/ledger";
import { jsonColumn, select, selectOne } from "../query";
import { inTransaction } from "./sql";

export async function listInstruments(): Promise<InstrumentSummary[]> {
  const rows = await select<{
    id: number;
    name: string;
    kind: string;
    room: string;
    channels: unknown;
    waste_container_id: number | null;
    code: string | null;
    stream: string | null;
    active: number;
    runs: number;
  }>(
    `SELECT i.id, i.name, i.kind, i.room, i.channels, i.waste_container_id, c.code, s.name AS stream, i.active,
            (SELECT COUNT(*) FROM runs r WHERE r.instrument_id = i.id) AS runs
       FROM instruments i LEFT JOIN waste_containers c ON c.id = i.waste_container_id LEFT JOIN waste_streams s ON s.id = c.stream_id
      ORDER BY i.name`,
  );
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    kind: r.kind,
    room: r.room,
    channels: jsonColumn<string[]>(r.channels),
    wasteContainerId: r.waste_container_id,
    wasteContainerCode: r.code,
    wasteStream: r.stream,
    active: Boolean(r.active),
    runs: r.runs,
  }));
}

/** Containers an instrument can drain to (not yet collected). */
export async function openWasteContainers() {
  return select<{ id: number; code: string; room: string; stream: string }>(
    "SELECT c.id, c.code, c.room, s.name AS stream FROM waste_containers c JOIN waste_streams s ON s.id = c.stream_id WHERE c.status <> 'collected' ORDER BY c.code",
  );
}

async function checkContainer(id: number | null) {
  if (id === null) return;
  const row = await selectOne("SELECT id FROM waste_containers WHERE id = ? AND status <> 'collected'", { replacements: [id] });
  if (!row)
    throw new HttpError(400, "wasteContainerId: no waste container in use with this id", {
      fields: { wasteContainerId: "no waste container in use with this id" },
    });
}

/** What a form sets on an instrument, and what the audit line keeps of it. */
const fields = (i: InstrumentInput | Instrument) => ({
  name: i.name,
  kind: i.kind,
  room: i.room,
  channels: i.channels,
  wasteContainerId: i.wasteContainerId,
  active: i.active,
});

function duplicateName(error: unknown, name: string): never {
  if (error instanceof UniqueConstraintError)
    throw new HttpError(409, `name: an instrument called ${name} exists already`, { fields: { name: "is taken" } });
  throw error;
}

export async function createInstrument(input: InstrumentInput, actor: SignedInUser): Promise<{ id: number }> {
  await checkContainer(input.wasteContainerId);
  return inTransaction(getSequelize(), async (transaction) => {
    const created = await Instrument.create(fields(input), { transaction }).catch((e: unknown) => duplicateName(e, input.name));
    await recordAudit(
      { actorId: actor.id, action: "instrument.create", entity: "instrument", entityId: created.id, after: fields(created) },
      transaction,
    );
    return { id: created.id };
  });
}

export async function updateInstrument(id: number, input: InstrumentInput, actor: SignedInUser): Promise<{ id: number }> {
  await checkContainer(input.wasteContainerId);
  return inTransaction(getSequelize(), async (transaction) => {
    const instrument = await Instrument.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!instrument) throw new HttpError(404, `id: no instrument ${id}`);
    const before = fields(instrument);
    instrument.set(fields(input));
    await instrument.save({ transaction }).catch((e: unknown) => duplicateName(e, input.name));
    await recordAudit(
      { actorId: actor.id, action: "instrument.update", entity: "instrument", entityId: id, before, after: fields(instrument) },
      transaction,
    );
    return { id };
  });
}
