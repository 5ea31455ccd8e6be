// Two-factor sign-in with TOTP (RFC 6238: HMAC-SHA-1, 30-second steps, 6 digits, what every
// authenticator app reads from an otpauth:// QR code) and ten one-time recovery codes.
import { createHash, randomBytes } from "node:crypto";
import { decodeBase32IgnorePadding, encodeBase32UpperCaseNoPadding } from "@oslojs/encoding";
import { createTOTPKeyURI, verifyHOTP } from "@oslojs/otp";
import QRCode from "qrcode";
import type { NewKey } from "../../auth/types";
import { RECOVERY_CODE, TOTP_CODE } from "../../schemas/account-security";
import { HttpError } from "../http";
import { execute, select, selectOne } from "../query";

export const TOTP_STEP_S = 30;
export const TOTP_DIGITS = 6;
/** One step either side: a phone clock a little off, or a code typed as it changes. */
const DRIFT_STEPS = 1;
export const RECOVERY_CODE_COUNT = 10;
const ISSUER = "Decant";

export const totpStep = (now: Date) => Math.floor(now.getTime() / 1000 / TOTP_STEP_S);

interface KeyRow {
  secret: string;
  enabled_at: Date | string | null;
  last_step: number | string | null;
}

const keyOf = (userId: number) =>
  selectOne<KeyRow>("SELECT secret, enabled_at, last_step FROM two_factor_keys WHERE user_id = :userId", { replacements: { userId } });

export interface TwoFactorStatus {
  enabled: boolean;
  enabledAt: Date | null;
  recoveryCodesLeft: number;
}

export async function twoFactorStatus(userId: number): Promise<TwoFactorStatus> {
  const [key, codes] = await Promise.all([
    keyOf(userId),
    selectOne<{ n: number | string }>("SELECT COUNT(*) AS n FROM recovery_codes WHERE user_id = :userId AND used_at IS NULL", {
      replacements: { userId },
    }),
  ]);
  const enabledAt = key?.enabled_at ? new Date(key.enabled_at) : null;
  return { enabled: enabledAt !== null, enabledAt, recoveryCodesLeft: Number(codes?.n ?? 0) };
}

/** A new key waiting for its first code; replaces an earlier unconfirmed one. Refused while two-factor is on. */
export async function startSetup(user: { id: number; email: string }, now = new Date()): Promise<NewKey> {
  const existing = await keyOf(user.id);
  if (existing?.enabled_at) throw new HttpError(409, "Two-factor sign-in is already on. Turn it off first to move it to another app.");
  const bytes = new Uint8Array(randomBytes(20));
  const secret = encodeBase32UpperCaseNoPadding(bytes);
  await execute(
    "REPLACE INTO two_factor_keys (user_id, secret, enabled_at, last_step, created_at) VALUES (:userId, :secret, NULL, NULL, :now)",
    { replacements: { userId: user.id, secret, now } },
  );
  const uri = createTOTPKeyURI(ISSUER, user.email, bytes, TOTP_STEP_S, TOTP_DIGITS);
  return { secret: secret.match(/.{1,4}/g)!.join(" "), uri, qr: qrPath(uri) };
}

/** Draws the QR code's dark modules as one path of unit squares, run by run along each row. */
export function qrPath(text: string): { size: number; path: string } {
  const { modules } = QRCode.create(text, { errorCorrectionLevel: "M" });
  const parts: string[] = [];
  for (let row = 0; row < modules.size; row++) {
    let col = 0;
    while (col < modules.size) {
      if (!modules.get(row, col)) {
        col++;
        continue;
      }
      const start = col;
      while (col < modules.size && modules.get(row, col)) col++;
      parts.push(`M${start} ${row}h${col - start}v1h-${col - start}z`);
    }
  }
  return { size: modules.size, path: parts.join("") };
}

/** The time step whose code this is (within the allowed drift), or null. */
function matchingStep(secret: string, code: string, now: Date): number | null {
  if (!TOTP_CODE.test(code)) return null;
  const key = decodeBase32IgnorePadding(secret);
  const current = totpStep(now);
  for (let step = current - DRIFT_STEPS; step <= current + DRIFT_STEPS; step++) {
    if (verifyHOTP(key, BigInt(step), TOTP_DIGITS, code)) return step;
  }
  return null;
}

/**
 * Accepts a code once: the step is stored with a conditional UPDATE, so the same code (or an
 * earlier one) is refused afterwards, even when two requests bring it at the same moment.
 */
async function acceptStep(userId: number, step: number, enabling: boolean, now: Date): Promise<boolean> {
  const result = await execute(
    `UPDATE two_factor_keys SET last_step = :step${enabling ? ", enabled_at = :now" : ""}
      WHERE user_id = :userId AND (last_step IS NULL OR last_step < :step) AND enabled_at IS ${enabling ? "" : "NOT "}NULL`,
    { replacements: { userId, step, now } },
  );
  return result.affectedRows === 1;
}

export type CodeCheck = "accepted" | "wrong" | "replayed" | "recovery-used";

/** Checks a sign-in's second factor: an app code, or an unused recovery code (which is then used up). */
export async function checkSecondFactor(userId: number, code: string, now = new Date()): Promise<CodeCheck> {
  const key = await keyOf(userId);
  if (!key?.enabled_at) return "wrong";
  if (RECOVERY_CODE.test(code)) {
    const used = await execute(
      "UPDATE recovery_codes SET used_at = :now WHERE user_id = :userId AND code_hash = :hash AND used_at IS NULL",
      {
        replacements: { userId, hash: recoveryHash(userId, code), now },
      },
    );
    if (used.affectedRows === 1) return "accepted";
    const known = await selectOne("SELECT id FROM recovery_codes WHERE user_id = :userId AND code_hash = :hash", {
      replacements: { userId, hash: recoveryHash(userId, code) },
    });
    return known ? "recovery-used" : "wrong";
  }
  const step = matchingStep(key.secret, code, now);
  if (step === null) return "wrong";
  return (await acceptStep(userId, step, false, now)) ? "accepted" : "replayed";
}

/** The first code from the new key turns two-factor on and brings ten recovery codes, shown once. */
export async function confirmSetup(userId: number, code: string, now = new Date()): Promise<string[]> {
  const key = await keyOf(userId);
  if (!key) throw new HttpError(409, "Start the set-up first: there is no new key waiting for a code.");
  if (key.enabled_at) throw new HttpError(409, "Two-factor sign-in is already on.");
  const step = matchingStep(key.secret, code, now);
  if (step === null || !(await acceptStep(userId, step, true, now))) {
    throw new HttpError(400, "code: That code is not right. Check the app shows Decant and your address, and type the code it shows now.", {
      fields: { code: "That code is not right" },
    });
  }
  return replaceRecoveryCodes(userId, now);
}

const recoveryHash = (userId: number, code: string) => createHash("sha256").update(`${userId}:${code}`, "utf8").digest("hex");

/** Ten new codes (80 random bits each); the earlier ones stop working. Only their hashes are kept. */
export async function replaceRecoveryCodes(userId: number, now = new Date()): Promise<string[]> {
  const codes = Array.from({ length: RECOVERY_CODE_COUNT }, () => encodeBase32UpperCaseNoPadding(new Uint8Array(randomBytes(10))));
  await execute("DELETE FROM recovery_codes WHERE user_id = :userId", { replacements: { userId } });
  await execute(
    `INSERT INTO recovery_codes (user_id, code_hash, used_at, created_at) VALUES ${codes.map((_, i) => `(:userId, :h${i}, NULL, :now)`).join(", ")}`,
    { replacements: { userId, now, ...Object.fromEntries(codes.map((c, i) => [`h${i}`, recoveryHash(userId, c)])) } },
  );
  return codes.map((c) => c.match(/.{4}/g)!.join("-"));
}

export async function turnOffTwoFactor(userId: number): Promise<void> {
  await execute("DELETE FROM recovery_codes WHERE user_id = :userId", { replacements: { userId } });
  await execute("DELETE FROM two_factor_keys WHERE user_id = :userId", { replacements: { userId } });
}

/** Users (of the given ids) that have two-factor on. */
export async function withTwoFactor(userIds: number[]): Promise<Set<number>> {
  if (userIds.length === 0) return new Set();
  const rows = await select<{ user_id: number }>(
    "SELECT user_id FROM two_factor_keys WHERE enabled_at IS NOT NULL AND user_id IN (:userIds)",
    {
      replacements: { userIds },
    },
  );
  return new Set(rows.map((r) => r.user_id));
}
