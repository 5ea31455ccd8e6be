// Sign-in throttling at the service level, on a database of this file's own, with a fixed clock:
// failures count against the pair (account, address), the account and the address, each with its
// own limit, and a browser that signed in before (device cookie) is judged on its own failures.
// Over HTTP every test talks from 127.0.0.1; here each case signs in from documentation
// addresses (RFC 5737) instead.
import { beforeAll, beforeEach, describe, expect, it } from "vitest";
import { hashPassword } from "../../src/lib/server/auth/password";
import { signIn, type DeviceCookie } from "../../src/lib/server/auth/sign-in";
import { HttpError } from "../../src/lib/server/http";
import { AuditEntry } from "../../src/lib/server/models/audit";
import { SignInAttempt, User } from "../../src/lib/server/models/auth";
import { changePassword } from "../../src/lib/server/services/account";
import { messagesTo } from "../support/mailbox";
import { useServiceDatabase } from "../support/service-database";

const db = useServiceDatabase();
const RIGHT = "decant-demo";
const START = Date.now();
/** The clock: minutes (and seconds) after the start of the file. */
const at = (seconds: number) => new Date(START + seconds * 1000);

interface Answer {
  status: number;
  retryAfter?: number;
  message?: string;
  device?: DeviceCookie | null;
}

async function attempt(email: string, password: string, ip: string, now: Date, device?: DeviceCookie | null): Promise<Answer> {
  try {
    const result = await signIn(
      { email, password },
      { ip, userAgent: "test", now, cookie: (name) => (device && name === device.name ? device.value : undefined) },
    );
    return { status: 200, device: result.device };
  } catch (error) {
    if (error instanceof HttpError)
      return { status: error.status, retryAfter: Number(error.headers["retry-after"] ?? 0), message: error.message };
    throw error;
  }
}

beforeEach(async () => {
  await SignInAttempt.destroy({ where: {} });
});

describe("one address, many accounts (a campus behind one NAT)", () => {
  const people = Array.from({ length: 20 }, (_, i) => `bench.user${i + 1}@lab.test`);
  beforeAll(async () => {
    const passwordHash = await hashPassword(RIGHT);
    await User.bulkCreate(
      people.map((email, i) => ({
        email,
        name: `Bench User ${i + 1}`,
        role: "technician" as const,
        clientId: null,
        passwordHash,
        lastSignInAt: null,
      })),
    );
  });

  it(
    "10 wrong passwords each for 20 accounts block those 20 pairs only; a 21st account signs in from the same address",
    { timeout: 120_000 },
    async () => {
      const A = "203.0.113.50";
      let second = 0;
      for (const email of people) {
        const answers: number[] = [];
        for (let i = 0; i < 10; i++) answers.push((await attempt(email, `typo ${i}`, A, at(second++))).status);
        // Five are checked and wrong; from then on the pair waits, so the rest are refused unchecked.
        expect(answers, email).toEqual([401, 401, 401, 401, 401, 429, 429, 429, 429, 429]);
      }
      const right = await attempt("tech@demo.test", RIGHT, A, at(second++));
      expect(right.status, "the address limit is not reached by 20 blocked pairs").toBe(200);
      for (const email of people) {
        const blocked = await attempt(email, RIGHT, A, at(second++));
        expect(blocked.status, `${email} from A, right password`).toBe(429);
        // Until the pair's fifth failure (a few minutes ago on this clock) is 15 minutes old.
        expect(blocked.retryAfter).toBeGreaterThan(11 * 60);
        expect(blocked.retryAfter).toBeLessThanOrEqual(15 * 60);
        expect(blocked.message).toMatch(/^Too many attempts\. Try again in 1[2-5] minutes\.$/);
      }
      // The same accounts from another address are not blocked: the pair is, not the account.
      expect((await attempt(people[0]!, RIGHT, "198.51.100.77", at(second++))).status).toBe(200);
      // Once the window has passed, the pair may try again.
      expect((await attempt(people[1]!, RIGHT, A, at(second + 15 * 60))).status).toBe(200);
    },
  );

  it("an address is paused only past its high limit, over every account", { timeout: 120_000 }, async () => {
    const B = "203.0.113.51";
    // 150 failures (the default limit) over 30 accounts, 5 each, spread so no pair fills in 15 minutes … then the 151st waits.
    const emails = Array.from({ length: 30 }, (_, i) => `nobody${i}@lab.test`);
    let n = 0;
    for (let round = 0; round < 5; round++) for (const email of emails) expect((await attempt(email, "x", B, at(n++))).status).toBe(401);
    const next = await attempt("tech@demo.test", RIGHT, B, at(n));
    expect(next.status).toBe(429);
    expect(next.retryAfter).toBeGreaterThan(12 * 60);
    expect((await attempt("tech@demo.test", RIGHT, "203.0.113.52", at(n))).status).toBe(200);
  });
});

describe("one account, many addresses (someone who knows a manager's address)", () => {
  it(
    "120 wrong passwords from 12 addresses: a browser that signed in before gets in at once; a new browser is refused with a stated wait; one mail",
    { timeout: 180_000 },
    async () => {
      const owner = "manager@demo.test";
      const mailStart = new Date();
      // The manager's own browser signed in yesterday and keeps its device cookie.
      const own = await attempt(owner, RIGHT, "192.0.2.10", at(-86_400));
      expect(own.status).toBe(200);
      const device = own.device!;
      expect(device.name).toMatch(/^decant_device_/);

      const addresses = Array.from({ length: 12 }, (_, i) => `198.51.100.${i + 1}`);
      const statuses: number[] = [];
      // One attempt every 30 s (the longest delay), round the 12 addresses: an hour in all.
      for (let k = 0; k < 120; k++) statuses.push((await attempt(owner, `guess ${k}`, addresses[k % 12]!, at(30 * k))).status);
      expect(statuses.every((s) => s === 401 || s === 429)).toBe(true);
      // NIST SP 800-63B §5.2.2: no more than 100 consecutive failures are checked.
      expect(statuses.filter((s) => s === 401)).toHaveLength(100);
      expect(statuses.slice(100).every((s) => s === 429)).toBe(true);

      const later = at(30 * 100 + 15);
      const known = await attempt(owner, RIGHT, addresses[0]!, later, device);
      expect(known.status, "the owner's own browser, even from an attacked address").toBe(200);
      const fresh = await attempt(owner, RIGHT, "192.0.2.99", later);
      expect(fresh.status).toBe(429);
      expect(fresh.retryAfter).toBe(3600 - (30 * 100 + 15));
      expect(fresh.message).toBe("Too many attempts. Try again in 10 minutes.");
      // A forged or foreign device cookie is a new browser.
      const forged = await attempt(owner, RIGHT, "192.0.2.98", later, { name: device.name, value: `${device.value.slice(0, 23)}AAAA` });
      expect(forged.status).toBe(429);

      // One mail to the owner and one to the administrator, not one per attempt.
      await new Promise((r) => setTimeout(r, 500));
      const toOwner = (await messagesTo(owner)).filter(
        (m) => /paused/.test(m.subject) && Date.parse(m.receivedAt) >= mailStart.getTime() - 1000,
      );
      const toAdmin = (await messagesTo("admin@demo.test")).filter(
        (m) => /paused for manager@demo\.test/.test(m.subject) && Date.parse(m.receivedAt) >= mailStart.getTime() - 1000,
      );
      expect(toOwner).toHaveLength(1);
      expect(toAdmin).toHaveLength(1);
      expect(toOwner[0]!.text).toMatch(/100 wrong passwords/);
      expect(toOwner[0]!.text).toMatch(/A browser you have signed in on before still lets you in/);
      expect(await AuditEntry.count({ where: { action: "sign-in-locked" } })).toBe(1);
    },
  );

  it("after 10 failures each attempt waits 1 s, 2 s, 4 s … as the answer says", async () => {
    const email = "safety@demo.test";
    for (let i = 0; i < 10; i++) expect((await attempt(email, "x", `198.51.100.${20 + i}`, at(i))).status).toBe(401);
    const waits: number[] = [];
    let t = 9; // the moment of the tenth failure
    for (let i = 0; i < 4; i++) {
      const refused = await attempt(email, "x", "198.51.100.40", at(t));
      expect(refused.status).toBe(429);
      waits.push(refused.retryAfter!);
      t += refused.retryAfter!;
      expect((await attempt(email, "x", `198.51.100.${41 + i}`, at(t))).status).toBe(401);
    }
    expect(waits).toEqual([1, 2, 4, 8]);
  });

  it("a known browser's own wrong passwords pause that browser only", async () => {
    const email = "client@demo.test";
    const { device } = await attempt(email, RIGHT, "192.0.2.30", at(0));
    for (let i = 0; i < 5; i++) expect((await attempt(email, "x", "192.0.2.30", at(1 + i), device)).status).toBe(401);
    expect((await attempt(email, RIGHT, "192.0.2.30", at(10), device)).status).toBe(429);
    // Its failures were not counted against the account or the pair for other browsers.
    expect((await attempt(email, RIGHT, "192.0.2.30", at(11))).status).toBe(200);
  });
});

describe("what counts", () => {
  it("a success resets the pair: four failures, a sign-in, then one more failure does not pause", async () => {
    const ip = "203.0.113.11";
    for (let i = 1; i <= 4; i++) await attempt("tech@demo.test", "wrong", ip, at(i));
    expect((await attempt("tech@demo.test", RIGHT, ip, at(5))).status).toBe(200);
    expect((await attempt("tech@demo.test", "wrong", ip, at(6))).status).toBe(401);
    expect((await attempt("tech@demo.test", RIGHT, ip, at(7))).status).toBe(200);
  });

  it("answers the same for an unknown address and a wrong password", async () => {
    const unknown = await attempt("nobody@demo.test", "whatever", "203.0.113.12", at(0));
    const wrong = await attempt("tech@demo.test", "whatever", "203.0.113.13", at(0));
    expect(unknown.status).toBe(401);
    expect(unknown.message).toBe(wrong.message);
    expect(await AuditEntry.count({ where: { action: "sign-in-failed", ip: "203.0.113.13" } })).toBe(1);
  });
});

describe("account state at sign-in", () => {
  it("a deactivated account cannot sign in, even with the right password", async () => {
    await User.update({ active: false }, { where: { email: "ines.halvorsen@demo.test" } });
    expect((await attempt("ines.halvorsen@demo.test", RIGHT, "203.0.113.20", at(0))).status).toBe(401);
    await User.update({ active: true }, { where: { email: "ines.halvorsen@demo.test" } });
    expect((await attempt("ines.halvorsen@demo.test", RIGHT, "203.0.113.21", at(1))).status).toBe(200);
  });

  it("after a password change the old password no longer works", async () => {
    const user = (await User.findOne({ where: { email: "ines.halvorsen@demo.test" } }))!;
    await changePassword(
      user.id,
      { currentPassword: RIGHT, newPassword: "a different long password", confirmPassword: "a different long password" },
      { ip: "203.0.113.22" },
    );
    expect((await attempt("ines.halvorsen@demo.test", RIGHT, "203.0.113.23", at(0))).status).toBe(401);
    expect((await attempt("ines.halvorsen@demo.test", "a different long password", "203.0.113.24", at(1))).status).toBe(200);
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
    expect((await attempt("pending@demo.test", "", "203.0.113.25", at(0))).status).toBe(401);
  });
});

void db;
