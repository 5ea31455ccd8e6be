// Device cookies (OWASP, "Slow down online guessing attacks with device cookies"): a browser that
// has signed in to an account carries a cookie signed for that account, and its attempts are
// judged apart from everyone else's, so failures from elsewhere cannot keep the real user out.
import { createHmac, randomBytes, timingSafeEqual } from "node:crypto";
import { execute, selectOne } from "../query";

const KEY_SETTING = "sign-in.deviceKey";
/** Half a year: a browser used at least that often keeps its standing. */
export const DEVICE_COOKIE_MAX_AGE_S = 183 * 86_400;
/** Sent to the sign-in routes only. */
export const DEVICE_COOKIE_PATH = "/api/auth";

let key: Buffer | null = null;

/** The signing key, made once for the whole installation and kept in the database (every instance shares it). */
async function signingKey(): Promise<Buffer> {
  if (key) return key;
  await execute("INSERT IGNORE INTO settings (`key`, value, updated_at) VALUES (:key, :value, NOW(3))", {
    replacements: { key: KEY_SETTING, value: JSON.stringify(randomBytes(32).toString("base64url")) },
  });
  const row = await selectOne<{ value: unknown }>("SELECT value FROM settings WHERE `key` = :key", { replacements: { key: KEY_SETTING } });
  const text = typeof row?.value === "string" && row.value.startsWith('"') ? (JSON.parse(row.value) as string) : row?.value;
  if (typeof text !== "string" || text.length < 40) throw new Error("the device-cookie key in settings is not usable");
  key = Buffer.from(text, "base64url");
  return key;
}

const mac = (secret: Buffer, text: string) => createHmac("sha256", secret).update(text, "utf8").digest("base64url");

/** One cookie per account, so several people can sign in on one bench computer; the name does not show the account. */
export async function deviceCookieName(userId: number): Promise<string> {
  return `decant_device_${mac(await signingKey(), `name:${userId}`).slice(0, 12)}`;
}

/** A new cookie value for the account: a random nonce and its signature. */
export async function issueDeviceCookie(userId: number): Promise<{ name: string; value: string; nonce: string }> {
  const secret = await signingKey();
  const nonce = randomBytes(16).toString("base64url");
  return { name: await deviceCookieName(userId), value: `${nonce}.${mac(secret, `device:${userId}:${nonce}`)}`, nonce };
}

/** The nonce of a cookie signed for this account, or null for a missing, foreign or forged one. */
export async function verifiedDevice(userId: number, value: string | undefined): Promise<string | null> {
  if (!value || value.length > 120) return null;
  const [nonce, signature] = value.split(".");
  if (!nonce || !signature || nonce.length !== 22) return null;
  const expected = Buffer.from(mac(await signingKey(), `device:${userId}:${nonce}`));
  const given = Buffer.from(signature);
  return given.length === expected.length && timingSafeEqual(given, expected) ? nonce : null;
}
