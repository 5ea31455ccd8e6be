// Where a mix goes, and whether a container takes it (/api/waste/route; the run logger asks too).
import type { Transaction } from "sequelize";
import { assignWasteStream, streamAccepts, type MixPart, type StreamAssignment } from "../../../waste/streams";
import type { ContainerAcceptance } from "../../../waste/types";
import { WasteContainer, WasteStream } from "../../models/waste";
import { readWasteSettings } from "./settings";
import { streamRuleOf, streamRules } from "./streams";

/** The stream a mix goes to under this site's rules and reagent overrides. */
export async function wasteStreamForMix(parts: readonly MixPart[], transaction?: Transaction): Promise<StreamAssignment> {
  const [rules, settings] = await Promise.all([streamRules(transaction), readWasteSettings(transaction)]);
  return assignWasteStream(parts, rules, settings.reagentStreams);
}

/**
 * May a mix routed to `mixStream` go into this container? The run logger calls this before it
 * writes a run and refuses the run with `reason` when the answer is no. `container` is the
 * container's id (or an object carrying it, e.g. an instrument's current container).
 */
export async function checkContainerAccepts(
  container: number | { id: number },
  mixStream: string,
  options: { transaction?: Transaction } = {},
): Promise<ContainerAcceptance> {
  const id = typeof container === "number" ? container : container.id;
  const { transaction } = options;
  const row = await WasteContainer.findByPk(id, { transaction });
  if (!row) return { ok: false, containerId: null, code: "unknown-container", reason: `There is no waste container with id ${id}.` };
  const streams = await WasteStream.findAll({ transaction });
  const own = streams.find((s) => s.id === row.streamId);
  const mix = streams.find((s) => s.id === mixStream);
  if (!mix || !own) {
    return {
      ok: false,
      containerId: id,
      code: "unknown-stream",
      reason: `${row.code}: the mix's waste stream "${mixStream}" is not one of the site's streams; ask the safety officer where it goes.`,
    };
  }
  if (row.status !== "in_use") {
    const state = row.status === "full" ? "marked full" : row.status === "awaiting_pickup" ? "waiting for pickup" : "collected";
    return {
      ok: false,
      containerId: id,
      code: "not-in-use",
      reason: `${row.code} is ${state}; route the instrument to another ${own.name.toLowerCase()} container first.`,
    };
  }
  if (!streamAccepts(streamRuleOf(own), mixStream)) {
    return {
      ok: false,
      containerId: id,
      code: "wrong-stream",
      reason: `${row.code} is a ${own.name.toLowerCase()} container and does not take ${mix.name.toLowerCase()} waste; this mix must go to a ${mix.name.toLowerCase()} container. Follow your institution's hazardous-waste procedures.`,
    };
  }
  return { ok: true, containerId: id, code: row.code, streamId: row.streamId };
}
