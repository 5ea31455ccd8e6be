import { createHash, randomBytes } from "node:crypto";
import { Op, type Transaction } from "sequelize";
import { AuthToken } from "../models/auth";

/** Invitation and reset links work once, for 48 hours. */
export const TOKEN_LIFETIME_MS = 48 * 3600_000;

export type TokenPurpose = AuthToken["purpose"];

/** Only this digest is stored; the token itself exists in the e-mailed link alone. */
export function hashToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

/**
 * Issues a one-time token for a user (32 random bytes, base64url in the link). Earlier unused
 * links of that user stop working, so only the newest mail counts.
 */
export async function issueToken(
  userId: number,
  purpose: TokenPurpose,
  createdBy: number | null,
  options: { transaction?: Transaction; now?: Date } = {},
): Promise<{ token: string; expiresAt: Date }> {
  const now = options.now ?? new Date();
  const token = randomBytes(32).toString("base64url");
  const expiresAt = new Date(now.getTime() + TOKEN_LIFETIME_MS);
  await AuthToken.update({ usedAt: now }, { where: { userId, usedAt: null }, transaction: options.transaction });
  await AuthToken.create(
    { userId, purpose, tokenHash: hashToken(token), expiresAt, usedAt: null, createdBy },
    { transaction: options.transaction },
  );
  return { token, expiresAt };
}

/** The token's record while it is unused and unexpired; null otherwise. Does not use it up. */
export async function findUsableToken(token: string, now = new Date()): Promise<AuthToken | null> {
  return AuthToken.findOne({ where: { tokenHash: hashToken(token), usedAt: null, expiresAt: { [Op.gt]: now } } });
}

/**
 * Uses a token up and returns its record, or null when it is unknown, expired or used. The
 * conditional UPDATE makes this safe when the same link is submitted twice at once.
 */
export async function consumeToken(token: string, transaction: Transaction, now = new Date()): Promise<AuthToken | null> {
  const tokenHash = hashToken(token);
  const [affected] = await AuthToken.update(
    { usedAt: now },
    { where: { tokenHash, usedAt: null, expiresAt: { [Op.gt]: now } }, transaction },
  );
  if (affected !== 1) return null;
  return AuthToken.findOne({ where: { tokenHash }, transaction });
}

/** How many links of a purpose a user was sent since a moment; used to cap reset mails. */
export async function tokensIssuedSince(userId: number, purpose: TokenPurpose, since: Date): Promise<number> {
  return AuthToken.count({ where: { userId, purpose, createdAt: { [Op.gt]: since } } });
}
