// Sessions, invitations, links, role changes and deactivation, over HTTP against the test app.
// No request here fails a sign-in: failures from 127.0.0.1 count towards the per-address
// throttle for the whole run (the throttle itself is tested in sign-in-throttle.test.ts).
import { createHash } from "node:crypto";
import { QueryTypes } from "sequelize";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createSequelize } from "../../src/lib/server/db";
import { testEnv } from "../support/database";
import { client, type Client } from "../support/http";
import { messagesTo, setPasswordLink, waitForMail } from "../support/mailbox";

const PASSWORD = "a long and new password";
const run = Math.random().toString(36).slice(2, 8);
const address = (name: string) => `${name}.${run}@lab.test`;

let sequelize: ReturnType<typeof createSequelize>;
let admin: Client;
let manager: Client;

beforeAll(async () => {
  sequelize = createSequelize(testEnv());
  admin = await client("admin@demo.test");
  manager = await client("manager@demo.test");
});
afterAll(async () => {
  await sequelize?.close();
});

const rows = <T extends object = Record<string, unknown>>(sql: string, replacements: Record<string, unknown> = {}) =>
  sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements });

async function sendJson(c: Client, method: string, path: string, body: unknown) {
  const response = await c.fetch(path, { method, headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
  const text = await response.text();
  return { status: response.status, body: text ? JSON.parse(text) : null };
}

/** Invites a person as the admin and returns the link from the mail they receive. */
async function invite(email: string, role = "technician", extra: Record<string, unknown> = {}) {
  const since = new Date();
  const answer = await sendJson(admin, "POST", "/api/users", { email, name: "Noor Testwell", role, ...extra });
  expect(answer.status, JSON.stringify(answer.body)).toBe(201);
  const mail = await waitForMail(email, { since, subject: /invited/ });
  return { user: answer.body.user as { id: number; email: string; role: string; invited: boolean }, mail, link: setPasswordLink(mail) };
}

/** A signed-in account of its own, made through an invitation. */
async function newMember(name: string, role = "technician") {
  const email = address(name);
  const { user, link } = await invite(email, role);
  const token = link.searchParams.get("token")!;
  const set = await sendJson(await client(), "POST", "/api/auth/set-password", { token, newPassword: PASSWORD, confirmPassword: PASSWORD });
  expect(set.status).toBe(200);
  return { id: user.id, email, session: await client(email, PASSWORD) };
}

const me = async (c: Client) => (await c.fetch("/api/me")).status;

describe("sessions", () => {
  it("sign-out ends the session on the server: the old cookie is refused afterwards", async () => {
    const tech = await client("tech@demo.test");
    expect(await me(tech)).toBe(200);
    const stolen = tech.cookie!;
    const out = await tech.fetch("/api/auth/sign-out", { method: "POST" });
    expect(out.status).toBe(204);
    const replay = await client();
    replay.cookie = stolen;
    expect(await me(replay)).toBe(401);
  });

  it("each sign-in opens a new session id, with an HttpOnly SameSite=Lax cookie", async () => {
    const response = await fetch(`${process.env.E2E_BASE_URL}/api/auth/sign-in`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ email: "safety@demo.test", password: "decant-demo" }),
    });
    const cookie = response.headers.get("set-cookie") ?? "";
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    const second = await client("safety@demo.test");
    expect(second.cookie).not.toBe(cookie.split(";")[0]);
  });

  it("refuses a state-changing JSON request from another origin", async () => {
    const response = await admin.fetch("/api/users", {
      method: "POST",
      headers: { "content-type": "application/json", origin: "http://elsewhere.test" },
      body: JSON.stringify({ email: address("cross"), name: "Cross Site", role: "technician" }),
    });
    expect(response.status).toBe(403);
    expect((await rows("SELECT id FROM users WHERE email = :email", { email: address("cross") })).length).toBe(0);
  });
});

describe("invitations and one-time links", () => {
  it("mails a link whose token is stored only as its SHA-256, valid for 48 hours, usable once", async () => {
    const email = address("invitee");
    const { user, mail, link } = await invite(email);
    expect(user.invited).toBe(true);
    expect(mail.text).toContain("invited you to Decant");
    expect(mail.html).toContain(link.searchParams.get("token")!);
    expect(mail.from).toContain("decant@facility.test");

    // The link points at the app itself (APP_ORIGIN, or the address it listens on), never at a Host header.
    expect(link.origin).toBe(new URL(process.env.E2E_BASE_URL!).origin);
    const token = link.searchParams.get("token")!;
    expect(Buffer.from(token, "base64url").length).toBe(32);
    const [stored] = await rows<{ token_hash: string; purpose: string; expires_at: Date; created_at: Date }>(
      "SELECT token_hash, purpose, expires_at, created_at FROM auth_tokens WHERE user_id = :id AND used_at IS NULL",
      { id: user.id },
    );
    expect(stored!.purpose).toBe("invitation");
    expect(stored!.token_hash).toBe(createHash("sha256").update(token).digest("hex"));
    expect(JSON.stringify(await rows("SELECT * FROM auth_tokens WHERE user_id = :id", { id: user.id }))).not.toContain(token);
    const lifetime_h = (new Date(stored!.expires_at).getTime() - new Date(stored!.created_at).getTime()) / 3600_000;
    expect(lifetime_h).toBeCloseTo(48, 2);

    // The page behind the link offers the form while the link is good.
    const page = await (await client()).fetch(link.pathname + link.search);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain(email);

    const first = await sendJson(await client(), "POST", "/api/auth/set-password", {
      token,
      newPassword: PASSWORD,
      confirmPassword: PASSWORD,
    });
    expect(first.status).toBe(200);
    expect(first.body.email).toBe(email);
    expect(JSON.stringify(first.body)).not.toMatch(/password|hash/i);
    const second = await sendJson(await client(), "POST", "/api/auth/set-password", {
      token,
      newPassword: "another long password",
      confirmPassword: "another long password",
    });
    expect(second.status).toBe(400);
    expect(second.body.error).toMatch(/^token: .*expired or has already been used/);
    expect((await (await client()).fetch(link.pathname + link.search)).status).toBe(410);

    const member = await client(email, PASSWORD);
    expect(await me(member)).toBe(200);
  });

  it("an expired link does not work", async () => {
    const { user, link } = await invite(address("late"));
    await sequelize.query("UPDATE auth_tokens SET expires_at = NOW(3) - INTERVAL 1 MINUTE WHERE user_id = :id", {
      replacements: { id: user.id },
    });
    const token = link.searchParams.get("token")!;
    const answer = await sendJson(await client(), "POST", "/api/auth/set-password", {
      token,
      newPassword: PASSWORD,
      confirmPassword: PASSWORD,
    });
    expect(answer.status).toBe(400);
    expect(
      (await rows<{ password_hash: string | null }>("SELECT password_hash FROM users WHERE id = :id", { id: user.id }))[0]!.password_hash,
    ).toBeNull();
  });

  it("a newer link replaces the older one", async () => {
    const { user, link } = await invite(address("twice"));
    const since = new Date();
    expect((await sendJson(admin, "POST", `/api/users/${user.id}/link`, {})).status).toBe(200);
    const newer = setPasswordLink(await waitForMail(address("twice"), { since }));
    expect(newer.searchParams.get("token")).not.toBe(link.searchParams.get("token"));
    const old = await sendJson(await client(), "POST", "/api/auth/set-password", {
      token: link.searchParams.get("token"),
      newPassword: PASSWORD,
      confirmPassword: PASSWORD,
    });
    expect(old.status).toBe(400);
    const fresh = await sendJson(await client(), "POST", "/api/auth/set-password", {
      token: newer.searchParams.get("token"),
      newPassword: PASSWORD,
      confirmPassword: PASSWORD,
    });
    expect(fresh.status).toBe(200);
  });

  it("records the invitation in the audit log with actor, time and address", async () => {
    const { user } = await invite(address("audited"));
    const [entry] = await rows<{ actor_id: number; ip: string; created_at: Date; after: string | Record<string, unknown> }>(
      "SELECT a.actor_id, a.ip, a.created_at, a.after FROM audit_log a WHERE a.action = 'user-invited' AND a.entity_id = :id",
      { id: String(user.id) },
    );
    const [adminUser] = await rows<{ id: number }>("SELECT id FROM users WHERE email = 'admin@demo.test'");
    expect(entry!.actor_id).toBe(adminUser!.id);
    expect(entry!.ip).toMatch(/127\.0\.0\.1/);
    expect(Date.now() - new Date(entry!.created_at).getTime()).toBeLessThan(60_000);
  });

  it("answers 400 naming the field for bad input, 409 for an address already in use", async () => {
    const bad = await sendJson(admin, "POST", "/api/users", { email: "not-an-address", name: "X", role: "technician" });
    expect(bad.status).toBe(400);
    expect(bad.body.error).toMatch(/^email: /);
    const noOrg = await sendJson(admin, "POST", "/api/users", { email: address("contact"), name: "Y", role: "client" });
    expect(noOrg.status).toBe(400);
    expect(noOrg.body.error).toMatch(/clientId/);
    const badRole = await sendJson(admin, "POST", "/api/users", { email: address("chief"), name: "Z", role: "overlord" });
    expect(badRole.status).toBe(400);
    expect(badRole.body.error).toMatch(/^role: /);
    const taken = await sendJson(admin, "POST", "/api/users", { email: "tech@demo.test", name: "Again", role: "technician" });
    expect(taken.status).toBe(409);
    const notJson = await admin.fetch("/api/users", { method: "POST", headers: { "content-type": "application/json" }, body: "{" });
    expect(notJson.status).toBe(400);
  });

  it("invites a client contact into their organisation", async () => {
    const [org] = await rows<{ id: number; name: string }>("SELECT id, name FROM clients WHERE kind = 'external' ORDER BY id LIMIT 1");
    const { user } = await invite(address("contact-ok"), "client", { clientId: org!.id });
    const list = (await (await admin.fetch("/api/users")).json()) as { items: { id: number; clientName: string | null; role: string }[] };
    const row = list.items.find((u) => u.id === user.id)!;
    expect(row.role).toBe("client");
    expect(row.clientName).toBe(org!.name);
    expect(JSON.stringify(list)).not.toMatch(/password|argon2/i);
  });
});

describe("forgotten password", () => {
  it("answers the same for an address with and without an account, and mails only the account", async () => {
    const member = await newMember("forgetful");
    const unknown = address("nobody");
    const since = new Date();
    const known = await sendJson(await client(), "POST", "/api/auth/forgot-password", { email: member.email });
    const none = await sendJson(await client(), "POST", "/api/auth/forgot-password", { email: unknown });
    expect(known).toEqual(none);
    expect(known.status).toBe(202);
    const mail = await waitForMail(member.email, { since, subject: /new Decant password/ });
    const link = setPasswordLink(mail);
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(await messagesTo(unknown)).toEqual([]);

    // Setting a password through a reset link ends the account's live sessions.
    expect(await me(member.session)).toBe(200);
    const reset = await sendJson(await client(), "POST", "/api/auth/set-password", {
      token: link.searchParams.get("token"),
      newPassword: "reset long password",
      confirmPassword: "reset long password",
    });
    expect(reset.status).toBe(200);
    expect(await me(member.session)).toBe(401);
    expect(await me(await client(member.email, "reset long password"))).toBe(200);
  });
});

describe("my account", () => {
  it("changing the password ends the other sessions and keeps this one", async () => {
    const member = await newMember("changer");
    const otherBrowser = await client(member.email, PASSWORD);
    const wrong = await sendJson(member.session, "POST", "/api/account/password", {
      currentPassword: "not my password",
      newPassword: "brand new long password",
      confirmPassword: "brand new long password",
    });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error).toMatch(/^currentPassword: /);
    const mismatch = await sendJson(member.session, "POST", "/api/account/password", {
      currentPassword: PASSWORD,
      newPassword: "brand new long password",
      confirmPassword: "brand new long passwort",
    });
    expect(mismatch.status).toBe(400);
    expect(mismatch.body.error).toMatch(/^confirmPassword: /);

    const changed = await sendJson(member.session, "POST", "/api/account/password", {
      currentPassword: PASSWORD,
      newPassword: "brand new long password",
      confirmPassword: "brand new long password",
    });
    expect(changed.status).toBe(204);
    expect(await me(member.session)).toBe(200);
    expect(await me(otherBrowser)).toBe(401);
    expect(await me(await client(member.email, "brand new long password"))).toBe(200);
    const audit = await rows("SELECT id FROM audit_log WHERE action = 'password-changed' AND actor_id = :id", { id: member.id });
    expect(audit.length).toBe(1);
  });
});

describe("user administration", () => {
  it("deactivation ends the user's live sessions at once; reactivation lets them back in", async () => {
    const member = await newMember("leaver");
    const secondBrowser = await client(member.email, PASSWORD);
    expect(await me(member.session)).toBe(200);
    const off = await sendJson(manager, "PATCH", `/api/users/${member.id}`, { active: false });
    expect(off.status).toBe(200);
    expect(off.body.user.active).toBe(false);
    expect(await me(member.session)).toBe(401);
    expect(await me(secondBrowser)).toBe(401);
    expect((await rows("SELECT id FROM sessions WHERE user_id = :id", { id: member.id })).length).toBe(0);
    const audit = await rows<{ actor_id: number; ip: string }>(
      "SELECT actor_id, ip FROM audit_log WHERE action = 'user-deactivated' AND entity_id = :id",
      { id: String(member.id) },
    );
    expect(audit.length).toBe(1);
    expect(audit[0]!.ip).toBeTruthy();

    const on = await sendJson(manager, "PATCH", `/api/users/${member.id}`, { active: true });
    expect(on.status).toBe(200);
    expect(await me(await client(member.email, PASSWORD))).toBe(200);
  });

  it("a role change applies at once and is audited with before and after", async () => {
    const member = await newMember("mover");
    expect((await member.session.fetch("/api/batches")).status).toBe(200);
    const changed = await sendJson(manager, "PATCH", `/api/users/${member.id}`, { role: "safety" });
    expect(changed.status).toBe(200);
    expect(changed.body.user.role).toBe("safety");
    // The old session carried the old role; it has ended.
    expect(await me(member.session)).toBe(401);
    const again = await client(member.email, PASSWORD);
    expect(((await (await again.fetch("/api/me")).json()) as { role: string }).role).toBe("safety");
    const [entry] = await rows<{ before: unknown; after: unknown }>(
      "SELECT `before`, `after` FROM audit_log WHERE action = 'user-role-changed' AND entity_id = :id",
      { id: String(member.id) },
    );
    const parse = (v: unknown) => (typeof v === "string" ? JSON.parse(v) : v);
    expect(parse(entry!.before)).toMatchObject({ role: "technician" });
    expect(parse(entry!.after)).toMatchObject({ role: "safety" });
  });

  it("keeps the administrator role to administrators and stops people changing themselves", async () => {
    const member = await newMember("climber");
    const grant = await sendJson(manager, "PATCH", `/api/users/${member.id}`, { role: "admin" });
    expect(grant.status).toBe(403);
    const [adminUser] = await rows<{ id: number }>("SELECT id FROM users WHERE email = 'admin@demo.test'");
    const touchAdmin = await sendJson(manager, "PATCH", `/api/users/${adminUser!.id}`, { active: false });
    expect(touchAdmin.status).toBe(403);
    const self = await sendJson(admin, "PATCH", `/api/users/${adminUser!.id}`, { role: "technician" });
    expect(self.status).toBe(409);
    const toClient = await sendJson(admin, "PATCH", `/api/users/${member.id}`, { role: "client" });
    expect(toClient.status).toBe(400);
    expect(toClient.body.error).toMatch(/clientId/);
    const nothing = await sendJson(admin, "PATCH", `/api/users/${member.id}`, {});
    expect(nothing.status).toBe(400);
    const unknown = await sendJson(admin, "PATCH", "/api/users/999999", { active: false });
    expect(unknown.status).toBe(404);
    const badId = await sendJson(admin, "PATCH", "/api/users/abc", { active: false });
    expect(badId.status).toBe(400);
    expect(badId.body.error).toMatch(/^id: /);
  });
});
