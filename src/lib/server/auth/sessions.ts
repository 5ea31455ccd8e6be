// Sessions that end: an idle limit and an absolute lifetime from the settings (checked on every
// request, in the same read as the session), the steps of a two-factor sign-in, and the list of
// open sessions a person can end from My account.
import { createHash } from "node:crypto";
import { generateIdFromEntropySize } from "lucia";
import type { SessionView, SignInView } from "../../auth/types";
import type { Role } from "../../permissions";
import { parseSignInSettings, SIGN_IN_SETTINGS_KEY } from "../services/sign-in-settings";
import type { SessionSettings } from "../../schemas/sign-in-settings";
import { execute, select, selectOne } from "../query";

/** "signed-in" opens the app; the other two open only the page of their step. */
export type SessionStage = "signed-in" | "second-factor" | "two-factor-setup";

export interface OpenSession {
  id: string;
  userId: number;
  stage: SessionStage;
  sharedBench: boolean;
  createdAt: Date;
  /** When it ends if nothing else happens (idle or absolute, whichever comes first). */
  expiresAt: Date;
}

export interface SessionUser {
  id: number;
  email: string;
  name: string;
  role: Role;
  clientId: number | null;
}

/** A half-finished sign-in (waiting for a code, or for two-factor to be set up) lasts this long. */
export const PENDING_LIFETIME_MS = 10 * 60_000;
/** Activity is written at most once a minute per session, so the idle limit is exact to a minute. */
const TOUCH_EVERY_MS = 60_000;

const MINUTE = 60_000;

/** The moment a signed-in session ends, from when it began and when it was last used. */
export function sessionDeadline(s: { createdAt: Date; lastSeenAt: Date; sharedBench: boolean }, policy: SessionSettings): Date {
  const idle = (s.sharedBench ? policy.sharedBenchIdle_min : policy.idle_min) * MINUTE;
  const absolute = policy.absolute_days * 1440 * MINUTE;
  return new Date(Math.min(s.createdAt.getTime() + absolute, s.lastSeenAt.getTime() + idle));
}

export async function createSession(
  userId: number,
  options: { stage: SessionStage; sharedBench: boolean; ip: string | null; userAgent: string | null; now?: Date },
): Promise<OpenSession> {
  const now = options.now ?? new Date();
  const id = generateIdFromEntropySize(25);
  const policy = await sessionPolicy();
  const expiresAt =
    options.stage === "signed-in"
      ? sessionDeadline({ createdAt: now, lastSeenAt: now, sharedBench: options.sharedBench }, policy)
      : new Date(now.getTime() + PENDING_LIFETIME_MS);
  await execute(
    `INSERT INTO sessions (id, user_id, expires_at, ip, user_agent, created_at, stage, shared_bench, last_seen_at, code_failures)
     VALUES (:id, :userId, :expiresAt, :ip, :userAgent, :now, :stage, :sharedBench, :now, 0)`,
    {
      replacements: {
        id,
        userId,
        expiresAt,
        ip: options.ip?.slice(0, 45) ?? null,
        userAgent: options.userAgent?.slice(0, 255) ?? null,
        now,
        stage: options.stage,
        sharedBench: options.sharedBench,
      },
    },
  );
  return { id, userId, stage: options.stage, sharedBench: options.sharedBench, createdAt: now, expiresAt };
}

async function sessionPolicy(): Promise<SessionSettings> {
  const row = await selectOne<{ value: unknown }>("SELECT value FROM settings WHERE `key` = :key", {
    replacements: { key: SIGN_IN_SETTINGS_KEY },
  });
  return parseSignInSettings(row?.value).sessions;
}

interface SessionRow {
  id: string;
  user_id: number;
  expires_at: Date | string;
  created_at: Date | string;
  last_seen_at: Date | string | null;
  stage: SessionStage;
  shared_bench: number | boolean;
  email: string;
  name: string;
  role: Role;
  client_id: number | null;
  policy: unknown;
  two_factor: number | null;
}

/**
 * The session behind a cookie, or null once it has ended (idle, absolute, or a pending step
 * past its ten minutes; an ended session is deleted). One read joins the user, the settings
 * and whether the user has two-factor on. A signed-in session of a role that must use two-factor,
 * whose user has not set it up, counts as waiting for the set-up.
 */
export async function validateSession(sessionId: string, now = new Date()): Promise<{ session: OpenSession; user: SessionUser } | null> {
  if (sessionId.length > 64) return null;
  const row = await selectOne<SessionRow>(
    `SELECT s.id, s.user_id, s.expires_at, s.created_at, s.last_seen_at, s.stage, s.shared_bench,
            u.email, u.name, u.role, u.client_id,
            (SELECT value FROM settings WHERE \`key\` = :key) AS policy,
            (SELECT 1 FROM two_factor_keys t WHERE t.user_id = u.id AND t.enabled_at IS NOT NULL) AS two_factor
       FROM sessions s JOIN users u ON u.id = s.user_id
      WHERE s.id = :sessionId AND u.active = 1`,
    { replacements: { sessionId, key: SIGN_IN_SETTINGS_KEY } },
  );
  if (!row) return null;
  const policy = parseSignInSettings(row.policy).sessions;
  const createdAt = new Date(row.created_at);
  const sharedBench = Boolean(row.shared_bench);
  let stage = row.stage;
  let expiresAt = new Date(row.expires_at);
  if (stage === "signed-in") {
    const lastSeenAt = new Date(row.last_seen_at ?? row.created_at);
    expiresAt = sessionDeadline({ createdAt, lastSeenAt, sharedBench }, policy);
    if (now >= expiresAt) return (await endSessionById(sessionId), null);
    if (now.getTime() - lastSeenAt.getTime() >= TOUCH_EVERY_MS) {
      expiresAt = sessionDeadline({ createdAt, lastSeenAt: now, sharedBench }, policy);
      await execute("UPDATE sessions SET last_seen_at = :now, expires_at = :expiresAt WHERE id = :sessionId", {
        replacements: { now, expiresAt, sessionId },
      });
    }
    if (policy.twoFactorRoles.includes(row.role) && !row.two_factor) stage = "two-factor-setup";
  } else if (now >= expiresAt) {
    return (await endSessionById(sessionId), null);
  }
  return {
    session: { id: row.id, userId: row.user_id, stage, sharedBench, createdAt, expiresAt },
    user: { id: row.user_id, email: row.email, name: row.name, role: row.role, clientId: row.client_id },
  };
}

export async function endSessionById(sessionId: string): Promise<void> {
  await execute("DELETE FROM sessions WHERE id = :sessionId", { replacements: { sessionId } });
}

/** A wrong code during a sign-in; returns how many the session has had. */
export async function countCodeFailure(sessionId: string): Promise<number> {
  await execute("UPDATE sessions SET code_failures = code_failures + 1 WHERE id = :sessionId", { replacements: { sessionId } });
  const row = await selectOne<{ n: number }>("SELECT code_failures AS n FROM sessions WHERE id = :sessionId", {
    replacements: { sessionId },
  });
  return Number(row?.n ?? 0);
}

export const sessionHandle = (sessionId: string) => createHash("sha256").update(sessionId, "utf8").digest("hex").slice(0, 16);

export async function listSessions(userId: number, currentId: string | null, now = new Date()): Promise<SessionView[]> {
  const rows = await select<SessionRow & { ip: string | null; user_agent: string | null }>(
    `SELECT s.id, s.created_at, s.last_seen_at, s.expires_at, s.ip, s.user_agent, s.shared_bench
       FROM sessions s WHERE s.user_id = :userId AND s.stage = 'signed-in' AND s.expires_at > :now
      ORDER BY COALESCE(s.last_seen_at, s.created_at) DESC LIMIT 100`,
    { replacements: { userId, now } },
  );
  return rows.map((r) => ({
    handle: sessionHandle(r.id),
    current: r.id === currentId,
    createdAt: new Date(r.created_at).toISOString(),
    lastSeenAt: new Date(r.last_seen_at ?? r.created_at).toISOString(),
    expiresAt: new Date(r.expires_at).toISOString(),
    ip: r.ip,
    userAgent: r.user_agent,
    sharedBench: Boolean(r.shared_bench),
  }));
}

/** Ends one of the user's sessions by its handle; false when the user has no such session. */
export async function endSessionByHandle(userId: number, handle: string): Promise<boolean> {
  const result = await execute("DELETE FROM sessions WHERE user_id = :userId AND LEFT(SHA2(id, 256), 16) = :handle", {
    replacements: { userId, handle },
  });
  return result.affectedRows > 0;
}

/** Ends every session of the user, or every one but `keepId`; returns how many ended. */
export async function endUserSessions(userId: number, keepId: string | null): Promise<number> {
  const result = await execute(`DELETE FROM sessions WHERE user_id = :userId${keepId ? " AND id <> :keepId" : ""}`, {
    replacements: { userId, keepId },
  });
  return result.affectedRows;
}

/** The account's recent sign-ins and failed attempts, newest first. */
export async function recentSignIns(email: string, limit = 15): Promise<SignInView[]> {
  const rows = await select<{
    created_at: Date | string;
    ip: string;
    user_agent: string | null;
    succeeded: number | boolean;
    step: "password" | "code";
  }>(
    "SELECT created_at, ip, user_agent, succeeded, step FROM sign_in_attempts WHERE email = :email ORDER BY created_at DESC, id DESC LIMIT :limit",
    { replacements: { email, limit } },
  );
  return rows.map((r) => ({
    at: new Date(r.created_at).toISOString(),
    ip: r.ip,
    userAgent: r.user_agent,
    succeeded: Boolean(r.succeeded),
    step: r.step,
  }));
}
