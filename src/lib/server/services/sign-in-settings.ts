/** The facility's sign-in limits, session lifetimes and rate limits: one settings row, with defaults. */
import { getFacilitySettings } from "./facility-settings";
import { DEFAULT_SIGN_IN_SETTINGS, signInSettingsSchema, type SignInSettings } from "../../schemas/sign-in-settings";
import { recordAudit } from "../audit";
import type { SignedInUser } from "../guard";
import { execute, selectOne } from "../query";

export const SIGN_IN_SETTINGS_KEY = "sign-in";

let parsedFrom: { raw: string; settings: SignInSettings } | null = null;

/**
 * The stored value merged over the defaults. A value that no longer parses (edited by hand) falls
 * back to the defaults rather than locking everyone out. The parse is kept for the same text, as
 * the session check reads the row on every request.
 */
export function parseSignInSettings(value: unknown): SignInSettings {
  if (value === null || value === undefined) return DEFAULT_SIGN_IN_SETTINGS;
  const raw = typeof value === "string" ? value : JSON.stringify(value);
  if (parsedFrom?.raw === raw) return parsedFrom.settings;
  let settings = DEFAULT_SIGN_IN_SETTINGS;
  try {
    const parsed = signInSettingsSchema.safeParse(JSON.parse(raw));
    if (parsed.success) settings = parsed.data;
  } catch {
    // keep the defaults
  }
  parsedFrom = { raw, settings };
  return settings;
}

export async function getSignInSettings(): Promise<SignInSettings> {
  const row = await selectOne<{ value: unknown }>("SELECT value FROM settings WHERE `key` = :key", {
    replacements: { key: SIGN_IN_SETTINGS_KEY },
  });
  return parseSignInSettings(row?.value);
}

export async function saveSignInSettings(input: SignInSettings, actor: SignedInUser, ip: string | null): Promise<SignInSettings> {
  const before = await getSignInSettings();
  await execute(
    "INSERT INTO settings (`key`, value, updated_by, updated_at) VALUES (:key, :value, :actor, NOW(3)) ON DUPLICATE KEY UPDATE value = VALUES(value), updated_by = VALUES(updated_by), updated_at = NOW(3)",
    { replacements: { key: SIGN_IN_SETTINGS_KEY, value: JSON.stringify(input), actor: actor.id } },
  );
  await recordAudit({ actorId: actor.id, action: "update", entity: "sign-in-settings", entityId: null, ip, before, after: input });
  return getSignInSettings();
}

/** The facility's IANA time zone, for the times the sign-in mails and pages show. */
export async function facilityTimeZone(): Promise<string> {
  return (await getFacilitySettings()).timeZone;
}
