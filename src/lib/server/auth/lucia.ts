import { Lucia, TimeSpan, type Adapter, type DatabaseSession, type DatabaseUser } from "lucia";
import { Op, QueryTypes } from "sequelize";
import { getSequelize } from "../db";
import type { Role } from "../../permissions";
import { Session } from "../models/auth";

/** What the app reads about the signed-in user on every request. */
export interface SessionUserAttributes {
  email: string;
  name: string;
  role: Role;
  clientId: number | null;
}

interface SessionUserRow {
  id: string;
  user_id: number;
  expires_at: Date | string;
  email: string;
  name: string;
  role: Role;
  client_id: number | null;
}

const toDatabaseSession = (s: Session): DatabaseSession => ({ id: s.id, userId: s.userId, expiresAt: s.expiresAt, attributes: {} });

/** Lucia's adapter over the Sequelize models: sessions live in MariaDB, shared by every app instance. */
export class SequelizeSessionAdapter implements Adapter {
  /**
   * Runs on every signed-in request, so it is one plain join read straight into lucia's shapes,
   * without building model instances (about a third of a signed-in JSON read's time otherwise).
   */
  async getSessionAndUser(sessionId: string): Promise<[DatabaseSession | null, DatabaseUser | null]> {
    const [row] = await getSequelize().query<SessionUserRow>(
      `SELECT s.id, s.user_id, s.expires_at, u.email, u.name, u.role, u.client_id
         FROM sessions s JOIN users u ON u.id = s.user_id
        WHERE s.id = :sessionId AND u.active = 1`,
      { type: QueryTypes.SELECT, replacements: { sessionId } },
    );
    if (!row) return [null, null];
    return [
      { id: row.id, userId: row.user_id, expiresAt: new Date(row.expires_at), attributes: {} },
      { id: row.user_id, attributes: { email: row.email, name: row.name, role: row.role, clientId: row.client_id } },
    ];
  }

  async getUserSessions(userId: number): Promise<DatabaseSession[]> {
    return (await Session.findAll({ where: { userId } })).map(toDatabaseSession);
  }

  async setSession(session: DatabaseSession): Promise<void> {
    await Session.create({ id: session.id, userId: session.userId, expiresAt: session.expiresAt, ip: null, userAgent: null } as never);
  }

  async updateSessionExpiration(sessionId: string, expiresAt: Date): Promise<void> {
    await Session.update({ expiresAt }, { where: { id: sessionId } });
  }

  async deleteSession(sessionId: string): Promise<void> {
    await Session.destroy({ where: { id: sessionId } });
  }

  async deleteUserSessions(userId: number): Promise<void> {
    await Session.destroy({ where: { userId } });
  }

  async deleteExpiredSessions(): Promise<void> {
    await Session.destroy({ where: { expiresAt: { [Op.lte]: new Date() } } });
  }
}

/**
 * Lucia names the cookie and makes session ids; sessions.ts decides when a session ends (idle and
 * absolute limits from the settings), so the cookie itself may outlive any session.
 */
export const lucia = new Lucia(new SequelizeSessionAdapter(), {
  sessionExpiresIn: new TimeSpan(365, "d"),
  sessionCookie: {
    name: "decant_session",
    expires: true,
    attributes: { sameSite: "lax" },
  },
  getUserAttributes: (attributes) => attributes,
});

declare module "lucia" {
  interface Register {
    Lucia: typeof lucia;
    UserId: number;
    DatabaseUserAttributes: SessionUserAttributes;
  }
}
