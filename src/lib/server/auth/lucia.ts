import { Lucia, TimeSpan, type Adapter, type DatabaseSession, type DatabaseUser } from "lucia";
import { Op } from "sequelize";
import type { Role } from "../../permissions";
import { Session, User } from "../models/auth";

/** What the app reads about the signed-in user on every request. */
export interface SessionUserAttributes {
  email: string;
  name: string;
  role: Role;
  clientId: number | null;
}

const toDatabaseSession = (s: Session): DatabaseSession => ({ id: s.id, userId: s.userId, expiresAt: s.expiresAt, attributes: {} });

/** Lucia's adapter over the Sequelize models: sessions live in MariaDB, shared by every app instance. */
export class SequelizeSessionAdapter implements Adapter {
  async getSessionAndUser(sessionId: string): Promise<[DatabaseSession | null, DatabaseUser | null]> {
    const session = await Session.findByPk(sessionId, { include: [{ model: User, required: true }] });
    const user = (session as (Session & { User?: User }) | null)?.User;
    if (!session || !user || !user.active) return [null, null];
    return [
      toDatabaseSession(session),
      { id: user.id, attributes: { email: user.email, name: user.name, role: user.role, clientId: user.clientId } },
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

export const lucia = new Lucia(new SequelizeSessionAdapter(), {
  // Sessions last 12 hours and are extended while in use (lucia renews them past half-life).
  sessionExpiresIn: new TimeSpan(12, "h"),
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
