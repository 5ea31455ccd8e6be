// Sign-in throttling and account state at the service level, on a database of this file's own.
// Over HTTP every test talks from 127.0.0.1, and five failures would lock the whole run out; here
// each case signs in from its own documentation address (RFC 5737) instead.
import { beforeEach, describe, expect, it } from "vitest";
import { HttpError } from "../../src/lib/server/http";
import { signIn } from "../../src/lib/server/auth/sign-in";
import { changePassword } from "../../src/lib/server/services/account";
import { AuditEntry } from "../../src/lib/server/models/audit";
import { SignInAttempt, User } from "../../src/lib/server/models/auth";
import { useTestDatabase } from "../support/database";

const db = useTestDatabase();
const RIGHT = "decant-demo";

async function attempt(email: string, password: string, ip: string) {
  try {
    await signIn({ email, password }, { ip, userAgent: null });
    return { status: 200, headers: {} as Record<string, string> };
  } catch (error) {
    if (error instanceof HttpError) return { status: error.status, headers: error.headers, message: error.message };
    throw error;
  }
}

/** Moves every recorded attempt back in time, as if the minutes had passed. */
async function age(minutes: number) {
  await db.sequelize.query("UPDATE sign_in_attempts SET created_at = created_at - INTERVAL :minutes MINUTE", { replacements: { minutes } });
}

beforeEach(async () => {
  await SignInAttempt.destroy({ where: {} });
});

describe("sign-in throttling", () => {
  it("answers 429 with Retry-After on the sixth wrong password in a row, even when the sixth is right", async () => {
    const ip = "203.0.113.7";
    for (let i = 1; i <= 5; i++) expect((await attempt("tech@demo.test", `wrong ${i}`, ip)).status, `attempt ${i}`).toBe(401);
    const sixth = await attempt("tech@demo.test", "wrong 6", ip);
    expect(sixth.status).toBe(429);
    const retryAfter = Number(sixth.headers["retry-after"]);
    expect(retryAfter).toBeGreaterThan(14 * 60);
    expect(retryAfter).toBeLessThanOrEqual(15 * 60);
    expect((await attempt("tech@demo.test", RIGHT, ip)).status).toBe(429);
  });

  it("lets the right password in once the 15-minute window has passed", async () => {
    const ip = "203.0.113.8";
    for (let i = 1; i <= 5; i++) await attempt("manager@demo.test", "wrong", ip);
    expect((await attempt("manager@demo.test", RIGHT, ip)).status).toBe(429);
    await age(14);
    expect((await attempt("manager@demo.test", RIGHT, ip)).status, "still inside the window").toBe(429);
    await age(2);
    expect((await attempt("manager@demo.test", RIGHT, ip)).status).toBe(200);
  });

  it("counts per account: failures spread over many addresses still lock the account", async () => {
    for (let i = 1; i <= 5; i++) await attempt("safety@demo.test", "wrong", `198.51.100.${i}`);
    expect((await attempt("safety@demo.test", RIGHT, "198.51.100.99")).status).toBe(429);
    // Another account from a fresh address is not affected.
    expect((await attempt("client@demo.test", RIGHT, "198.51.100.99")).status).toBe(200);
  });

  it("counts per address: failures spread over many accounts lock the address", async () => {
    const ip = "203.0.113.9";
    for (let i = 1; i <= 5; i++) await attempt(`nobody${i}@demo.test`, "wrong", ip);
    expect((await attempt("admin@demo.test", RIGHT, ip)).status).toBe(429);
    expect((await attempt("admin@demo.test", RIGHT, "203.0.113.10")).status).toBe(200);
  });

  it("does not count successful sign-ins, and four failures do not lock", async () => {
    const ip = "203.0.113.11";
    for (let i = 1; i <= 4; i++) await attempt("tech@demo.test", "wrong", ip);
    expect((await attempt("tech@demo.test", RIGHT, ip)).status).toBe(200);
    expect((await attempt("tech@demo.test", RIGHT, ip)).status).toBe(200);
  });

  it("answers the same for an unknown address and a wrong password", async () => {
    const unknown = await attempt("nobody@demo.test", "whatever", "203.0.113.12");
    const wrong = await attempt("tech@demo.test", "whatever", "203.0.113.13");
    expect(unknown.status).toBe(401);
    expect(unknown.message).toBe(wrong.message);
    const failures = await AuditEntry.count({ where: { action: "sign-in-failed", ip: "203.0.113.13" } });
    expect(failures).toBe(1);
  });
});

describe("account state at sign-in", () => {
  it("a deactivated account cannot sign in, even with the right password", async () => {
    await User.update({ active: false }, { where: { email: "ines.halvorsen@demo.test" } });
    expect((await attempt("ines.halvorsen@demo.test", RIGHT, "203.0.113.20")).status).toBe(401);
    await User.update({ active: true }, { where: { email: "ines.halvorsen@demo.test" } });
    expect((await attempt("ines.halvorsen@demo.test", RIGHT, "203.0.113.21")).status).toBe(200);
  });

  it("after a password change the old password no longer works", async () => {
    const user = (await User.findOne({ where: { email: "ines.halvorsen@demo.test" } }))!;
    await changePassword(
      user.id,
      { currentPassword: RIGHT, newPassword: "a different long password", confirmPassword: "a different long password" },
      { ip: "203.0.113.22" },
    );
    expect((await attempt("ines.halvorsen@demo.test", RIGHT, "203.0.113.23")).status).toBe(401);
    expect((await attempt("ines.halvorsen@demo.test", "a different long password", "203.0.113.24")).status).toBe(200);
  });

  it("an invited account without a password cannot sign in", async () => {
    await User.create({
      email: "pending@demo.test",
      name: "Pending Person",
      role: "technician",
      clientId: null,
      passwordHash: null,
      lastSignInAt: null,
    });
    expect((await attempt("pending@demo.test", "", "203.0.113.25")).status).toBe(401);
  });
});
