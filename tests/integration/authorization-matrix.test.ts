// Every page and API route, against every role and an anonymous visitor, on the running test app.
import { readdirSync, readFileSync, statSync } from "node:fs";
import { join, relative } from "node:path";
import { QueryTypes } from "sequelize";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { can, canAtLeastOwn, ROLES, type Role } from "../../src/lib/permissions";
import { createSequelize } from "../../src/lib/server/db";
import { testEnv } from "../support/database";
import { client, type Client } from "../support/http";
import { waitForMail } from "../support/mailbox";
import {
  CROSS_ORGANISATION,
  ROUTE_RULES,
  SAMPLE_TABLES,
  type Access,
  type Method,
  type RouteRule,
  type SampleKind,
  type Samples,
} from "./route-rules";

const PAGES_DIR = "src/pages";
const DEMO: Record<Role, string> = {
  technician: "tech@demo.test",
  manager: "manager@demo.test",
  safety: "safety@demo.test",
  client: "client@demo.test",
  admin: "admin@demo.test",
};
const SAMPLE_USER = "ines.halvorsen@demo.test";

function walk(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    return statSync(path).isDirectory() ? walk(path) : [path];
  });
}

/** Route files as Astro sees them: files and folders starting with "_" are not routes. */
const ROUTE_FILES = walk(PAGES_DIR)
  .map((p) => relative(PAGES_DIR, p).split("\\").join("/"))
  .filter((p) => !p.split("/").some((segment) => segment.startsWith("_")))
  .sort();

const isPage = (file: string) => /\.(astro|md|mdx|html)$/.test(file);

/** Methods an endpoint file exports (`export const GET = …`, `export async function POST`). */
function exportedMethods(file: string): Method[] {
  const source = readFileSync(join(PAGES_DIR, file), "utf8");
  const found = [...source.matchAll(/export\s+(?:const|let|async\s+function|function)\s+(GET|POST|PUT|PATCH|DELETE|ALL)\b/g)].map(
    (m) => m[1] as Method,
  );
  return [...new Set(found)];
}

function urlFor(file: string, rule: RouteRule, samples: Samples, method: Method): string {
  let path = "/" + file.replace(/\.(astro|ts|js|md|mdx|html)$/, "");
  path = path.replace(/\/index$/, "") || "/";
  const params = rule.params?.(samples) ?? {};
  path = path.replace(/\[(?:\.\.\.)?([^\]]+)\]/g, (_all, name: string) => {
    const value = params[name];
    if (value === undefined) throw new Error(`${file}: give a sample value for [${name}] in route-rules.ts`);
    return encodeURIComponent(String(value));
  });
  const query = typeof rule.query === "function" ? rule.query(samples) : (rule.query ?? "");
  return path + (method === "GET" ? query : "");
}

const allowed = (access: Extract<Access, { permission: string }>, role: Role) =>
  access.own ? canAtLeastOwn(role, access.permission) : can(role, access.permission);

let samples: Samples;
const sessions = new Map<Role, Client>();
let sequelize: ReturnType<typeof createSequelize>;
const createdStatements: number[] = [];

beforeAll(async () => {
  sequelize = createSequelize(testEnv());
  const one = async <T extends object>(sql: string, replacements: Record<string, unknown> = {}) =>
    (await sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements }))[0]!;
  const user = await one<{ id: number }>("SELECT id FROM users WHERE email = :email", { email: SAMPLE_USER });
  const batch = await one<{ id: number; code: string }>("SELECT id, code FROM batches ORDER BY id LIMIT 1");
  const contact = await one<{ client_id: number }>("SELECT client_id FROM users WHERE email = :email", { email: DEMO.client });
  const projects = await sequelize.query<{ id: number; code: string; client_id: number }>(
    "SELECT id, code, client_id FROM projects ORDER BY id",
    { type: QueryTypes.SELECT },
  );
  const own = projects.filter((p) => p.client_id === contact.client_id);
  const foreign = projects.filter((p) => p.client_id !== contact.client_id);
  // A message in the mail fake, for the outbox's message page.
  const since = new Date();
  await fetch(`${process.env.E2E_BASE_URL}/api/auth/forgot-password`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify({ email: SAMPLE_USER }),
  });
  const message = await waitForMail(SAMPLE_USER, { since });
  const ids = {} as Record<SampleKind, number | string>;
  for (const [kind, table] of Object.entries(SAMPLE_TABLES) as [SampleKind, string][]) {
    const [row] = await sequelize
      .query<{ id: number | string }>(`SELECT id FROM \`${table}\` ORDER BY id LIMIT 1`, { type: QueryTypes.SELECT })
      .catch(() => []);
    ids[kind] = row?.id ?? 999999;
  }
  // An issued statement (with its invoice) of another organisation and one of the contact's own, in
  // a period no other test bills, so the cross-organisation rows ask for records that really exist.
  const foreignClient = await one<{ id: number; name: string; currency: string }>(
    "SELECT id, name, currency FROM clients WHERE id <> :own ORDER BY kind = 'external' DESC, id LIMIT 1",
    { own: contact.client_id },
  );
  const ownClient = await one<{ id: number; currency: string }>("SELECT id, currency FROM clients WHERE id = :own", {
    own: contact.client_id,
  });
  const statementOf = async (clientId: number, currency: string, month: string) => {
    await sequelize.query(
      "INSERT INTO statements (client_id, period_start, period_end, status, `lines`, total_minor, currency, issued_at, created_at, updated_at) VALUES (:clientId, :start, :end, 'issued', '[]', 0, :currency, NOW(3), NOW(3), NOW(3))",
      { replacements: { clientId, currency, start: `${month}-01`, end: `${month}-28` } },
    );
    const row = await one<{ id: number }>("SELECT id FROM statements WHERE client_id = :clientId AND period_start = :start", {
      clientId,
      start: `${month}-01`,
    });
    createdStatements.push(row.id);
    return row.id;
  };
  const foreignStatementId = await statementOf(foreignClient.id, foreignClient.currency, "2019-02");
  const ownStatementId = await statementOf(ownClient.id, ownClient.currency, "2019-03");
  await sequelize.query(
    "INSERT INTO invoices (statement_id, client_id, status, amount_minor, currency, created_at, updated_at) VALUES (:statement, :client, 'open', 0, :currency, NOW(3), NOW(3))",
    {
      replacements: { statement: foreignStatementId, client: foreignClient.id, currency: foreignClient.currency },
    },
  );
  const foreignInvoice = await one<{ id: number }>("SELECT id FROM invoices WHERE statement_id = :statement", {
    statement: foreignStatementId,
  });
  samples = {
    foreignStatementId,
    foreignInvoiceId: foreignInvoice.id,
    ownStatementId,
    foreignClientName: foreignClient.name,
    ids,
    userId: user.id,
    messageId: message.id,
    batchId: batch.id,
    batchCode: batch.code,
    ownProjectId: own[0]!.id,
    foreignProjectId: foreign[0]!.id,
    ownProjectCodes: own.map((p) => p.code),
    foreignProjectCodes: foreign.map((p) => p.code),
  };
  for (const role of ROLES) sessions.set(role, await client(DEMO[role]));
});

afterAll(async () => {
  if (createdStatements.length) {
    await sequelize.query("DELETE FROM invoices WHERE statement_id IN (:ids)", { replacements: { ids: createdStatements } });
    await sequelize.query("DELETE FROM statements WHERE id IN (:ids)", { replacements: { ids: createdStatements } });
  }
  await sequelize?.close();
});

describe("the rule table covers the file system", () => {
  it("has a rule for every route file under src/pages", () => {
    const missing = ROUTE_FILES.filter((f) => !(f in ROUTE_RULES));
    expect(missing, `add these routes to tests/integration/route-rules.ts: ${missing.join(", ")}`).toEqual([]);
  });

  it("has no rule for a route that does not exist", () => {
    const stale = Object.keys(ROUTE_RULES).filter((f) => !ROUTE_FILES.includes(f));
    expect(stale).toEqual([]);
  });

  it.each(ROUTE_FILES.filter((f) => !isPage(f)))("%s: every exported method has a rule and every rule a method", (file) => {
    const rule = ROUTE_RULES[file];
    expect(rule, `no rule for ${file}`).toBeDefined();
    expect(exportedMethods(file).sort()).toEqual(Object.keys(rule!.methods).sort());
  });

  it.each(ROUTE_FILES.filter(isPage))("%s: a page has a GET rule", (file) => {
    expect(ROUTE_RULES[file]?.methods.GET).toBeDefined();
  });

  it("lists a cross-organisation check for every route reading one project, batch, statement or invoice by id", () => {
    const scoped = ROUTE_FILES.filter((f) => /\[/.test(f) && /(project|batch|statement|invoice)/.test(f) && ROUTE_RULES[f]?.methods.GET);
    expect(scoped.filter((f) => !(f in CROSS_ORGANISATION))).toEqual([]);
  });
});

type Who = Role | "anonymous";
const WHO: Who[] = ["anonymous", ...ROLES];

const cases = Object.entries(ROUTE_RULES)
  .filter(([file]) => ROUTE_FILES.includes(file))
  .flatMap(([file, rule]) =>
    (Object.entries(rule.methods) as [Method, Access][]).map(([method, access]) => ({ file, rule, method, access })),
  );

describe.each(cases)("$method $file", ({ file, rule, method, access }) => {
  it.each(WHO)("as %s", async (who) => {
    // A state-changing request may end or change the session (sign-out), so it gets a fresh one.
    const caller = who === "anonymous" ? await client() : method === "GET" ? sessions.get(who)! : await client(DEMO[who]);
    const url = urlFor(file, rule, samples, method);
    const init: RequestInit = { method };
    if (method !== "GET") {
      init.headers = { "content-type": "application/json" };
      init.body = JSON.stringify(rule.body ?? {});
    }
    const response = await caller.fetch(url, init);
    const body = await response.text();
    const label = `${method} ${url} as ${who} → ${response.status} ${body.slice(0, 200)}`;

    if ("public" in access) {
      expect(response.status, label).toBe(who === "anonymous" ? access.anonymous : access.signedIn);
      return;
    }
    const page = isPage(file);
    if (who === "anonymous") {
      if (page) {
        expect(response.status, label).toBe(302);
        expect(response.headers.get("location"), label).toMatch(/^\/sign-in\?next=/);
      } else {
        expect(response.status, label).toBe(401);
        expect(JSON.parse(body).error, label).toBeTruthy();
      }
      return;
    }
    if (!allowed(access, who)) {
      expect(response.status, label).toBe(403);
      if (page) expect(body, label).toContain("This page is not open to your role");
      else expect(JSON.parse(body).missingPermission, label).toBe(access.permission);
      return;
    }
    if (method === "GET") expect(response.status, label).toBe(rule.allowedStatus ?? 200);
    else {
      expect([401, 403], label).not.toContain(response.status);
      expect(response.status, label).toBeLessThan(500);
    }
  });
});

describe("a client contact sees their own organisation only", () => {
  it("the overview lists the contact's own projects and no other organisation's", async () => {
    const response = await sessions.get("client")!.fetch("/home");
    expect(response.status).toBe(200);
    const html = await response.text();
    for (const code of samples.ownProjectCodes) expect(html).toContain(code);
    for (const code of samples.foreignProjectCodes) expect(html).not.toContain(code);
  });

  it("usage per project lists the contact's own projects only", async () => {
    const day = (offset: number) => new Date(Date.now() + offset * 86_400_000).toISOString().slice(0, 10);
    const response = await sessions.get("client")!.fetch(`/api/usage?from=${day(-120)}&to=${day(0)}&groupBy=project`);
    expect(response.status).toBe(200);
    const { rows } = (await response.json()) as { rows: { projectCode: string }[] };
    expect(rows.length).toBeGreaterThan(0);
    for (const row of rows) expect(samples.ownProjectCodes).toContain(row.projectCode);
    // The same period for a manager does include other organisations' projects.
    const all = (await (await sessions.get("manager")!.fetch(`/api/usage?from=${day(-120)}&to=${day(0)}&groupBy=project`)).json()) as {
      rows: { projectCode: string }[];
    };
    expect(all.rows.some((r) => samples.foreignProjectCodes.includes(r.projectCode))).toBe(true);
  });

  it("the facility's batch list is closed to a client contact", async () => {
    const response = await sessions.get("client")!.fetch("/api/batches");
    expect(response.status).toBe(403);
    expect(await response.text()).not.toContain('"code"');
  });

  // The first project, batch, statement or invoice route by id adds a row to CROSS_ORGANISATION.
  const crossCases = Object.entries(CROSS_ORGANISATION).filter(([file]) => ROUTE_FILES.includes(file));
  if (crossCases.length > 0) {
    it.each(crossCases)("%s: another organisation's record answers 403 or 404, with none of its data", async (file, check) => {
      const rule = ROUTE_RULES[file]!;
      for (const method of Object.keys(rule.methods) as Method[]) {
        const url = urlFor(file, { ...rule, params: check.params }, samples, method);
        const init: RequestInit = method === "GET" ? {} : { method, headers: { "content-type": "application/json" }, body: "{}" };
        const response = await sessions.get("client")!.fetch(url, init);
        const body = await response.text();
        expect([403, 404], `${method} ${url} → ${response.status} ${body.slice(0, 200)}`).toContain(response.status);
        for (const secret of check.mustNotShow(samples)) expect(body, `${method} ${url} shows ${secret}`).not.toContain(secret);
      }
    });

    it("the same routes do show the contact's own organisation's statement (the refusal above is scoping, not a blanket 404)", async () => {
      const client = sessions.get("client")!;
      const own = await client.fetch(`/api/statements/${samples.ownStatementId}`);
      expect(own.status).toBe(200);
      expect(((await own.json()) as { id: number }).id).toBe(samples.ownStatementId);
      const page = await client.fetch(`/statements/${samples.ownStatementId}`);
      expect(page.status).toBe(200);
      const foreign = await client.fetch(`/api/statements/${samples.foreignStatementId}`);
      expect(foreign.status).toBe(404);
      // Staff see the other organisation's statement by the same id.
      expect((await sessions.get("manager")!.fetch(`/api/statements/${samples.foreignStatementId}`)).status).toBe(200);
    });
  }
});

describe("session fixation: the session id before sign-in is never the one after", () => {
  it("a cookie value an attacker planted is replaced by a new session, and the planted value opens nothing", async () => {
    const planted = "decant_session=attackerchosenvalue0123456789abcdef";
    const response = await fetch(`${process.env.E2E_BASE_URL}/api/auth/sign-in`, {
      method: "POST",
      headers: { "content-type": "application/json", cookie: planted },
      body: JSON.stringify({ email: DEMO.technician, password: "decant-demo" }),
    });
    expect(response.status).toBe(200);
    const issued = response.headers.get("set-cookie")?.split(";")[0] ?? "";
    expect(issued).toMatch(/^decant_session=\w+/);
    expect(issued).not.toBe(planted);
    expect((await fetch(`${process.env.E2E_BASE_URL}/api/me`, { headers: { cookie: planted } })).status).toBe(401);
    expect((await fetch(`${process.env.E2E_BASE_URL}/api/me`, { headers: { cookie: issued } })).status).toBe(200);
  });

  it("signing in over a live session ends that session and starts a new one", async () => {
    const first = await client(DEMO.technician);
    const before = first.cookie!;
    const again = await first.fetch("/api/auth/sign-in", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ email: DEMO.manager, password: "decant-demo" }),
    });
    expect(again.status).toBe(200);
    expect(first.cookie).not.toBe(before);
    expect((await fetch(`${process.env.E2E_BASE_URL}/api/me`, { headers: { cookie: before } })).status).toBe(401);
    const me = (await (await first.fetch("/api/me")).json()) as { email: string };
    expect(me.email).toBe(DEMO.manager);
  });
});

// Every state-changing method of every route, from the rule table (so new routes are covered),
// posted from another site with an allowed role's cookie: refused before the route runs.
const stateChanging = cases.filter((c) => c.method !== "GET" && !c.file.startsWith("api/webhooks/"));

describe("CSRF: a cross-site request to a state-changing route is refused", () => {
  it.each(stateChanging.map((c) => [`${c.method} ${c.file}`, c] as const))("%s", async (_name, { file, rule, method, access }) => {
    const who: Role = "public" in access ? "admin" : (ROLES.find((r) => allowed(access, r)) ?? "admin");
    const caller = sessions.get(who)!;
    const url = urlFor(file, rule, samples, method);
    for (const origin of ["http://evil.example", "null", "http://127.0.0.1.evil.example"]) {
      for (const [type, body] of [
        ["application/json", JSON.stringify(rule.body ?? {})],
        ["application/x-www-form-urlencoded", "a=1"],
        ["text/plain", "{}"],
      ] as const) {
        const response = await caller.fetch(url, { method, headers: { origin, "content-type": type }, body });
        const text = await response.text();
        expect(response.status, `${method} ${url} from ${origin} as ${type} → ${response.status} ${text.slice(0, 120)}`).toBe(403);
        expect(text).toMatch(/Cross-site/);
      }
    }
    // The caller's session is untouched: a refused request did not sign it out or change it.
    expect((await caller.fetch("/api/me")).status).toBe(200);
  });

  it("the payments webhook is exempt from the origin check and refuses an unsigned event by its signature instead", async () => {
    const response = await fetch(`${process.env.E2E_BASE_URL}/api/webhooks/payments`, {
      method: "POST",
      headers: { origin: "http://evil.example", "content-type": "application/json" },
      body: "{}",
    });
    expect(response.status).toBe(400);
  });
});
