// User administration: invite, change role, deactivate / reactivate, resend a link.
import { UniqueConstraintError } from "sequelize";
import type { InviteUserInput, UpdateUserInput } from "../../schemas/auth";
import type { Role } from "../../permissions";
import type { ClientOption, UserRow } from "../../users/types";
import { invitationMail, resetMail } from "../account-mail";
import { recordAudit } from "../audit";
import { lucia } from "../auth/lucia";
import { issueToken } from "../auth/tokens";
import { getSequelize } from "../db";
import { withTwoFactor } from "../auth/two-factor";
import { HttpError } from "../http";
import { sendMail } from "../mail";
import { User } from "../models/auth";
import { Client } from "../models/organisation";
import { inTransaction } from "./sql";

/** Who does it, from where, and the origin for links in e-mails. */
export interface ActorContext {
  actor: { id: number; name: string; role: Role };
  ip: string | null;
  origin: string;
}

export async function listClientOptions(): Promise<ClientOption[]> {
  const clients = await Client.findAll({ where: { active: true }, order: [["name", "ASC"]], attributes: ["id", "name", "kind"] });
  return clients.map((c) => ({ id: c.id, name: c.name, kind: c.kind }));
}

function toRow(user: User, clientNames: Map<number, string>): UserRow {
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    clientId: user.clientId,
    clientName: user.clientId ? (clientNames.get(user.clientId) ?? null) : null,
    active: user.active,
    invited: user.passwordHash === null,
    lastSignInAt: user.lastSignInAt ? user.lastSignInAt.toISOString() : null,
    createdAt: user.createdAt.toISOString(),
  };
}

async function clientNames(): Promise<Map<number, string>> {
  return new Map((await Client.findAll({ attributes: ["id", "name"] })).map((c) => [c.id, c.name]));
}

/** Every account, by name. Password hashes never leave this module. */
export async function listUsers(): Promise<UserRow[]> {
  const [users, names] = await Promise.all([User.findAll({ order: [["name", "ASC"]] }), clientNames()]);
  const twoFactor = await withTwoFactor(users.map((u) => u.id));
  return users.map((u) => ({ ...toRow(u, names), twoFactor: twoFactor.has(u.id) }));
}

async function requireClient(clientId: number | null | undefined): Promise<number> {
  if (clientId == null)
    throw new HttpError(400, "clientId: A client contact needs a client organisation", {
      fields: { clientId: "A client contact needs a client organisation" },
    });
  if (!(await Client.findByPk(clientId)))
    throw new HttpError(400, "clientId: No such client organisation", { fields: { clientId: "No such client organisation" } });
  return clientId;
}

/** Only an administrator may hand out the administrator role or change an administrator's account. */
function assertMayTouchAdmin(actorRole: Role, ...roles: (Role | undefined)[]) {
  if (actorRole !== "admin" && roles.includes("admin")) {
    throw new HttpError(403, "Only an administrator may grant the administrator role or change an administrator's account.", {
      missingPermission: "manage:settings",
    });
  }
}

function linkFor(origin: string, token: string) {
  return `${origin}/set-password?token=${encodeURIComponent(token)}`;
}

/** Mails the link; a relay failure is reported, not thrown, since the account change stands. */
async function deliver(mail: Parameters<typeof sendMail>[0]): Promise<boolean> {
  try {
    await sendMail(mail);
    return true;
  } catch (error) {
    console.error(`decant: could not send "${mail.subject}" to ${mail.to}: ${error instanceof Error ? error.message : error}`);
    return false;
  }
}

/** Creates the account (no password yet) and mails a one-time link to choose one. */
export async function inviteUser(input: InviteUserInput, ctx: ActorContext): Promise<{ user: UserRow; mailSent: boolean }> {
  assertMayTouchAdmin(ctx.actor.role, input.role);
  const clientId = input.role === "client" ? await requireClient(input.clientId) : null;
  let created: { user: User; token: string };
  try {
    created = await inTransaction(getSequelize(), async (transaction) => {
      const user = await User.create(
        { email: input.email, name: input.name, role: input.role, clientId, passwordHash: null, lastSignInAt: null },
        { transaction },
      );
      const { token } = await issueToken(user.id, "invitation", ctx.actor.id, { transaction });
      await recordAudit(
        {
          actorId: ctx.actor.id,
          action: "user-invited",
          entity: "user",
          entityId: user.id,
          ip: ctx.ip,
          after: { email: user.email, name: user.name, role: user.role, clientId },
        },
        transaction,
      );
      return { user, token };
    });
  } catch (error) {
    if (error instanceof UniqueConstraintError) {
      throw new HttpError(409, "email: There is already an account with this e-mail address", {
        fields: { email: "There is already an account with this e-mail address" },
      });
    }
    throw error;
  }
  const mailSent = await deliver(
    invitationMail({
      to: created.user.email,
      name: created.user.name,
      role: created.user.role,
      invitedBy: ctx.actor.name,
      link: linkFor(ctx.origin, created.token),
    }),
  );
  return { user: toRow(created.user, await clientNames()), mailSent };
}

async function findUser(id: number): Promise<User> {
  const user = await User.findByPk(id);
  if (!user) throw new HttpError(404, "No such user.");
  return user;
}

/** Changes role and organisation, or deactivates / reactivates; deactivation ends every session at once. */
export async function updateUser(id: number, input: UpdateUserInput, ctx: ActorContext): Promise<UserRow> {
  const user = await findUser(id);
  if (user.id === ctx.actor.id && (input.role !== undefined || input.active !== undefined || input.clientId !== undefined)) {
    throw new HttpError(409, "You cannot change your own role or deactivate yourself; ask another administrator.");
  }
  assertMayTouchAdmin(ctx.actor.role, user.role, input.role);

  const role = input.role ?? user.role;
  const clientId = role === "client" ? await requireClient(input.clientId !== undefined ? input.clientId : user.clientId) : null;
  const before = { role: user.role, clientId: user.clientId, active: user.active };
  const active = input.active ?? user.active;

  await inTransaction(getSequelize(), async (transaction) => {
    await user.update({ role, clientId, active }, { transaction });
    if (before.role !== role || before.clientId !== clientId) {
      await recordAudit(
        {
          actorId: ctx.actor.id,
          action: "user-role-changed",
          entity: "user",
          entityId: user.id,
          ip: ctx.ip,
          before: { role: before.role, clientId: before.clientId },
          after: { role, clientId },
        },
        transaction,
      );
    }
    if (before.active !== active) {
      await recordAudit(
        {
          actorId: ctx.actor.id,
          action: active ? "user-reactivated" : "user-deactivated",
          entity: "user",
          entityId: user.id,
          ip: ctx.ip,
          before: { active: before.active },
          after: { active },
        },
        transaction,
      );
    }
  });
  // A changed role or a deactivation takes effect now, not when the session would have expired.
  if (!active || before.role !== role || before.clientId !== clientId) await lucia.invalidateUserSessions(user.id);
  return toRow(user, await clientNames());
}

/** Sends a fresh link: an invitation while no password is chosen, a reset link after. */
export async function resendLink(
  id: number,
  ctx: ActorContext,
): Promise<{ user: UserRow; mailSent: boolean; purpose: "invitation" | "reset" }> {
  const user = await findUser(id);
  assertMayTouchAdmin(ctx.actor.role, user.role);
  if (!user.active) throw new HttpError(409, "This account is deactivated; reactivate it first.");
  const purpose = user.passwordHash === null ? "invitation" : "reset";
  const { token } = await issueToken(user.id, purpose, ctx.actor.id);
  await recordAudit({
    actorId: ctx.actor.id,
    action: purpose === "invitation" ? "user-invited" : "password-reset-sent",
    entity: "user",
    entityId: user.id,
    ip: ctx.ip,
    after: { email: user.email, resent: true },
  });
  const link = linkFor(ctx.origin, token);
  const mail =
    purpose === "invitation"
      ? invitationMail({ to: user.email, name: user.name, role: user.role, invitedBy: ctx.actor.name, link })
      : resetMail({ to: user.email, name: user.name, link });
  return { user: toRow(user, await clientNames()), mailSent: await deliver(mail), purpose };
}
