// The sign-in security routes over HTTP against the test app: cookies, open sessions and their
// ending, recent sign-ins, two-factor on and off, and the per-user rate limit. Each test uses an
// account of its own (made through an invitation), so the demo accounts stay as they are.
import { decodeBase32IgnorePadding } from "@oslojs/encoding";
import { generateHOTP } from "@oslojs/otp";
import { beforeAll, describe, expect, it } from "vitest";
import type { AccountSecurityView, NewKey } from "../../src/lib/auth/types";
import { totpStep } from "../../src/lib/server/auth/two-factor";
import { BASE_URL, client, type Client } from "../support/http";
import { setPasswordLink, waitForMail } from "../support/mailbox";

const PASSWORD = "a long and new password";
const run = Math.random().toString(36).slice(2, 8);
let admin: Client;

beforeAll(async () => {
  admin = await client("admin@demo.test");
});

async function send(c: Client, method: string, path: string, body?: unknown) {
  const response = await c.fetch(path, {
    method,
    headers: body === undefined ? {} : { "content-type": "application/json" },
    body: body === undefined ? null : JSON.stringify(body),
  });
  const text = await response.text();
  return { status: response.status, headers: response.headers, body: text ? JSON.parse(text) : null };
}

async function newMember(name: string, role = "technician") {
  const email = `${name}.${run}@lab.test`;
  const since = new Date();
  expect((await send(admin, "POST", "/api/users", { email, name: "Sam Keel", role })).status).toBe(201);
  const token = setPasswordLink(await waitForMail(email, { since, subject: /invited/ })).searchParams.get("token");
  expect(
    (await send(await client(), "POST", "/api/auth/set-password", { token, newPassword: PASSWORD, confirmPassword: PASSWORD })).status,
  ).toBe(200);
  return email;
}

const me = async (c: Client) => (await c.fetch("/api/me")).status;
const codeNow = (secret: string) => generateHOTP(decodeBase32IgnorePadding(secret.replace(/ /g, "")), BigInt(totpStep(new Date())), 6);

describe("cookies of a sign-in", () => {
  it("sets the session cookie first, then a signed device cookie for the sign-in routes only; a shared bench gets a browser-session cookie", async () => {
    const email = await newMember("cookies");
    const response = await fetch(`${BASE_URL}/api/auth/sign-in`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ email, password: PASSWORD }),
    });
    expect(response.status).toBe(200);
    expect(await response.json()).toEqual({ user: { email, role: "technician" }, next: null });
    const [session, device] = response.headers.getSetCookie();
    expect(session).toMatch(/^decant_session=\w+;/);
    expect(session).toMatch(/Max-Age=\d+/);
    expect(device).toMatch(/^decant_device_[\w-]{12}=[\w-]{22}\.[\w-]{43};/);
    expect(device).toMatch(/Path=\/api\/auth/);
    expect(device).toMatch(/HttpOnly/i);
    expect(device).toMatch(/SameSite=Strict/i);

    const bench = await fetch(`${BASE_URL}/api/auth/sign-in`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ email, password: PASSWORD, sharedBench: true }),
    });
    expect(bench.headers.getSetCookie()[0]).not.toMatch(/Max-Age/);
  });
});

describe("open sessions and recent sign-ins on My account", () => {
  it("lists each browser without its session id, ends one by its handle, then signs out everywhere else", async () => {
    const email = await newMember("sessions");
    const here = await client(email, PASSWORD);
    const phone = await client(email, PASSWORD);
    const tablet = await client(email, PASSWORD);
    // One wrong password, shown among the recent sign-ins.
    expect((await send(await client(), "POST", "/api/auth/sign-in", { email, password: "not it" })).status).toBe(401);

    const view = (await send(here, "GET", "/api/account/sessions")).body as AccountSecurityView;
    expect(view.sessions).toHaveLength(3);
    expect(view.sessions.filter((s) => s.current)).toHaveLength(1);
    for (const c of [here, phone, tablet]) expect(JSON.stringify(view)).not.toContain(c.cookie!.split("=")[1]);
    expect(view.signIns.slice(0, 4).map((s) => s.succeeded)).toEqual([false, true, true, true]);
    expect(view.signIns[0]!.ip).toMatch(/127\.0\.0\.1/);
    expect(view.limits).toEqual({ idle_min: 720, absolute_days: 30, sharedBenchIdle_min: 15 });

    const other = view.sessions.find((s) => !s.current)!;
    expect((await send(here, "DELETE", `/api/account/sessions/${other.handle}`)).status).toBe(204);
    expect([await me(phone), await me(tablet)].sort()).toEqual([200, 401]);
    expect((await send(here, "DELETE", `/api/account/sessions/${other.handle}`)).status).toBe(404);
    // Another person cannot end this person's sessions by handle.
    const mine = (await send(here, "GET", "/api/account/sessions")).body as AccountSecurityView;
    expect((await send(admin, "DELETE", `/api/account/sessions/${mine.sessions[0]!.handle}`)).status).toBe(404);

    expect((await send(here, "DELETE", "/api/account/sessions", { keep: "this" })).status).toBe(200);
    expect([await me(here), await me(phone), await me(tablet)]).toEqual([200, 401, 401]);
    expect((await send(here, "DELETE", "/api/account/sessions", { keep: "none" })).status).toBe(200);
    expect(await me(here)).toBe(401);
  });
});

describe("two-factor sign-in over HTTP", () => {
  it("turns on with the password and a first code, then asks for a code at sign-in, and turns off again", async () => {
    const email = await newMember("totp");
    const c = await client(email, PASSWORD);
    const wrongPassword = await send(c, "POST", "/api/auth/two-factor/setup", { password: "not it" });
    expect(wrongPassword.status).toBe(400);
    expect(wrongPassword.body.error).toMatch(/^password: /);
    const key = (await send(c, "POST", "/api/auth/two-factor/setup", { password: PASSWORD })).body as NewKey;
    expect(key.uri).toContain(`secret=${key.secret.replace(/ /g, "")}`);
    expect(key.qr.path).toMatch(/^M\d+ \d+h\d+v1h-\d+z/);
    const on = await send(c, "POST", "/api/auth/two-factor/confirm", { code: codeNow(key.secret) });
    expect(on.status).toBe(200);
    expect(on.body.recoveryCodes).toHaveLength(10);
    expect(on.body.recoveryCodes[0]).toMatch(/^[A-Z2-7]{4}(-[A-Z2-7]{4}){3}$/);

    // The password step alone opens nothing.
    const later = await client();
    const first = await send(later, "POST", "/api/auth/sign-in", { email, password: PASSWORD });
    expect(first.status).toBe(200);
    expect(first.body.next).toBe("/sign-in/code");
    expect(
      first.headers.getSetCookie().some((s) => s.startsWith("decant_device_")),
      "no device cookie yet",
    ).toBe(false);
    expect(await me(later)).toBe(401);
    expect((await later.fetch("/home")).headers.get("location")).toMatch(/^\/sign-in\?next=/);
    expect((await later.fetch("/sign-in")).headers.get("location")).toMatch(/^\/sign-in\/code\?next=/);
    expect(
      (await send(later, "POST", "/api/auth/two-factor", { code: codeNow(key.secret) === "123456" ? "654321" : "123456" })).status,
    ).toBe(401);
    // A recovery code, typed in lower case with spaces, is accepted.
    const second = await send(later, "POST", "/api/auth/two-factor", { code: on.body.recoveryCodes[1].toLowerCase().replace(/-/g, " ") });
    expect(second.status).toBe(200);
    expect(await me(later)).toBe(200);
    expect(later.others.size, "the finished sign-in brought a device cookie").toBe(1);

    const status = (await send(later, "GET", "/api/account/sessions")).body as AccountSecurityView;
    expect(status.twoFactor).toMatchObject({ enabled: true, recoveryCodesLeft: 9, required: false });
    expect((await send(later, "DELETE", "/api/account/two-factor", { password: PASSWORD })).status).toBe(200);
    const plain = await send(await client(), "POST", "/api/auth/sign-in", { email, password: PASSWORD });
    expect(plain.body.next).toBeNull();
  });

  it("an administrator can reset a person's two-factor (lost phone and codes): it is off and their sessions end", async () => {
    const email = await newMember("lostphone");
    const c = await client(email, PASSWORD);
    const key = (await send(c, "POST", "/api/auth/two-factor/setup", { password: PASSWORD })).body as NewKey;
    expect((await send(c, "POST", "/api/auth/two-factor/confirm", { code: codeNow(key.secret) })).status).toBe(200);
    const listed = (await send(admin, "GET", "/api/users")).body as { items: { id: number; email: string; twoFactor: boolean }[] };
    const row = listed.items.find((u) => u.email === email)!;
    expect(row.twoFactor).toBe(true);
    expect((await send(admin, "DELETE", `/api/users/${row.id}/two-factor`)).body).toEqual({ wasOn: true });
    expect(await me(c)).toBe(401);
    expect((await send(await client(), "POST", "/api/auth/sign-in", { email, password: PASSWORD })).body.next).toBeNull();
  });

  it("a code step without a password step behind it answers 401", async () => {
    expect((await send(await client(), "POST", "/api/auth/two-factor", { code: "123456" })).status).toBe(401);
    expect((await send(await client(), "POST", "/api/auth/two-factor/confirm", { code: "123456" })).status).toBe(401);
  });
});

describe("rate limits on expensive routes", () => {
  it("a burst of label PDFs beyond the limit answers 429 with Retry-After, per person", async () => {
    const email = await newMember("printer");
    const c = await client(email, PASSWORD);
    const batches = (await (await c.fetch("/api/batches")).json()) as { items: { id: number }[] };
    const url = `/api/batches/${batches.items[0]!.id}/label.pdf?copies=1`;
    let served = 0;
    let refusal: Response | null = null;
    const started = Date.now();
    // The bucket holds 30 and refills at 30 a minute while the PDFs are made, so a few more than 30 get through.
    while (served < 60) {
      const response = await c.fetch(url);
      if (response.status === 429) {
        refusal = response;
        break;
      }
      expect(response.status).toBe(200);
      await response.arrayBuffer();
      served++;
    }
    const refilled = ((Date.now() - started) / 1000) * (30 / 60);
    expect(refusal, "a 429 came").not.toBeNull();
    expect(served).toBeGreaterThanOrEqual(30);
    expect(served).toBeLessThanOrEqual(30 + Math.ceil(refilled));
    expect(Number(refusal!.headers.get("retry-after"))).toBeGreaterThanOrEqual(1);
    expect(((await refusal!.json()) as { error: string }).error).toMatch(/^Too many label PDFs at once/);
    // Someone else is not affected.
    expect((await admin.fetch(url)).status).toBe(200);
  });
});

describe("the administrator's settings", () => {
  it("GET answers the settings with their defaults; PUT of the same values keeps them; a bad value is a 400 naming the field", async () => {
    const got = await send(admin, "GET", "/api/settings/sign-in");
    expect(got.status).toBe(200);
    expect(got.body.settings.throttle).toMatchObject({ pairFailures: 5, accountBlockFailures: 100 });
    expect((await send(admin, "PUT", "/api/settings/sign-in", got.body.settings)).body).toEqual(got.body);
    const bad = await send(admin, "PUT", "/api/settings/sign-in", { throttle: { accountBlockFailures: 500 } });
    expect(bad.status).toBe(400);
    expect(bad.body.error).toMatch(/^throttle\.accountBlockFailures: /);
  });
});
