// The waste limits and room limits the safety officer sets (/waste/settings, /api/waste/settings).
import type { Transaction } from "sequelize";
import type { WasteSettingsInput } from "../../../schemas/waste";
import { WASTE_SETTING_KEYS, wasteSettingsFrom } from "../../../waste/settings";
import type { WasteSettings } from "../../../waste/types";
import { getSequelize } from "../../db";
import { HttpError } from "../../http";
import { Setting } from "../../models/audit";
import { WasteStream } from "../../models/waste";
import { inTransaction } from "../sql";
import { auditWaste, type WasteActor } from "./audit";

/** The waste limits and room limits; a missing setting takes its example value. */
export async function readWasteSettings(transaction?: Transaction): Promise<WasteSettings> {
  const rows = await Setting.findAll({ where: { key: Object.values(WASTE_SETTING_KEYS) }, transaction });
  return wasteSettingsFrom((key) => rows.find((r) => r.key === key)?.value);
}

export async function updateWasteSettings(input: WasteSettingsInput, ctx: WasteActor): Promise<WasteSettings> {
  const streams = new Set((await WasteStream.findAll({ attributes: ["id"] })).map((s) => s.id));
  for (const [reagent, stream] of Object.entries(input.reagentStreams)) {
    if (!streams.has(stream)) throw new HttpError(400, `reagentStreams.${reagent}: no stream "${stream}"`);
  }
  return inTransaction(getSequelize(), async (transaction) => {
    const before = await readWasteSettings(transaction);
    for (const [field, key] of Object.entries(WASTE_SETTING_KEYS) as [keyof typeof WASTE_SETTING_KEYS, string][]) {
      await Setting.upsert({ key, value: input[field], updatedBy: ctx.actor.id }, { transaction });
    }
    const after = await readWasteSettings(transaction);
    await auditWaste(ctx, { action: "waste.settings.update", entity: "settings", entityId: "waste", before, after }, transaction);
    return after;
  });
}
