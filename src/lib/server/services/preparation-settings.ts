/** The facility's preparation settings: expiry rules, deviation tolerances, label stocks. */
import type { Transaction } from "sequelize";
import { DEFAULT_LABEL_STOCK_ID, DEFAULT_LABEL_STOCKS } from "../../labels/stocks";
import { DEFAULT_TOLERANCES } from "../../preparation/deviations";
import { DEFAULT_EXPIRY_RULES, type ExpiryRule } from "../../preparation/expiry";
import { preparationSettingsSchema, type PreparationSettings } from "../../schemas/preparation";
import { recordAudit } from "../audit";
import { getSequelize } from "../db";
import type { SignedInUser } from "../guard";
import { execute, jsonColumn, select } from "../query";
import { inTransaction } from "./sql";

const KEYS = {
  expiryRules: "expiry.rules",
  tolerances: "preparation.tolerances",
  labelStocks: "labels.stocks",
  defaultLabelStockId: "labels.defaultStock",
} as const;

async function readSettings(keys: string[], transaction?: Transaction): Promise<Map<string, unknown>> {
  const rows = await select<{ key: string; value: unknown }>("SELECT `key`, value FROM settings WHERE `key` IN (:keys)", {
    replacements: { keys },
    transaction,
  });
  return new Map(rows.map((r) => [r.key, jsonColumn(r.value)]));
}

/** Defaults, with the older single-value keys of the first seed folded in. */
function defaultRules(legacy: Map<string, unknown>): ExpiryRule[] {
  const aqueous = Number(legacy.get("expiry.aqueousBuffer_h"));
  const organic = Number(legacy.get("expiry.organicMix_days"));
  return DEFAULT_EXPIRY_RULES.map((r) => {
    if (r.kind === "aqueous-buffer" && aqueous > 0) return { ...r, shelfLife_h: aqueous };
    if (r.kind === "neat-organic" && organic > 0) return { ...r, shelfLife_h: organic * 24 };
    return { ...r };
  });
}

export async function getPreparationSettings(transaction?: Transaction): Promise<PreparationSettings> {
  const values = await readSettings([...Object.values(KEYS), "expiry.aqueousBuffer_h", "expiry.organicMix_days"], transaction);
  const candidate = {
    expiryRules: values.get(KEYS.expiryRules) ?? defaultRules(values),
    tolerances: values.get(KEYS.tolerances) ?? DEFAULT_TOLERANCES,
    labelStocks: values.get(KEYS.labelStocks) ?? DEFAULT_LABEL_STOCKS,
    defaultLabelStockId: values.get(KEYS.defaultLabelStockId) ?? DEFAULT_LABEL_STOCK_ID,
  };
  const parsed = preparationSettingsSchema.safeParse(candidate);
  // A hand-edited setting that no longer parses falls back to the defaults rather than breaking preparation.
  if (parsed.success) return parsed.data;
  return preparationSettingsSchema.parse({
    expiryRules: defaultRules(values),
    tolerances: DEFAULT_TOLERANCES,
    labelStocks: DEFAULT_LABEL_STOCKS,
    defaultLabelStockId: DEFAULT_LABEL_STOCK_ID,
  });
}

export async function savePreparationSettings(
  settings: PreparationSettings,
  actor: SignedInUser,
  ip: string | null = null,
): Promise<PreparationSettings> {
  const before = await getPreparationSettings();
  await inTransaction(getSequelize(), async (transaction) => {
    for (const [field, key] of Object.entries(KEYS) as [keyof typeof KEYS, string][]) {
      await execute(
        "INSERT INTO settings (`key`, value, updated_by, updated_at) VALUES (?, ?, ?, NOW(3)) ON DUPLICATE KEY UPDATE value = VALUES(value), updated_by = VALUES(updated_by), updated_at = NOW(3)",
        { replacements: [key, JSON.stringify(settings[field]), actor.id], transaction },
      );
    }
    await recordAudit(
      { actorId: actor.id, action: "update", entity: "preparation-settings", entityId: null, ip, before, after: settings },
      transaction,
    );
  });
  return getPreparationSettings();
}
