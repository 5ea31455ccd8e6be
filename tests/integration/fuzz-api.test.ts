// Bad input on every API route: for each route file under src/pages/api and each method it exports,
// 200 malformed requests made by fast-check from the route's own zod schema (found in the route's
// source), sent as a role the route allows, against a private instance of the built app. No answer
// may be a 5xx; a refused request answers 4xx with a JSON `error` naming the field; and nothing is
// written (every table's row count and checksum, and the upload folder, are the same afterwards).
import { readdirSync, readFileSync, statSync } from "node:fs";
import { dirname, join, relative, resolve } from "node:path";
import fc from "fast-check";
import { QueryTypes } from "sequelize";
import type { ZodTypeAny } from "zod";
import { beforeAll, describe, expect, it } from "vitest";
import { can, canAtLeastOwn, type Role } from "../../src/lib/permissions";
import { databaseFingerprint, useAppInstance } from "../support/app-instance";
import {
  asParsed,
  BAD_IDS,
  describeSchema,
  extremeObject,
  malformedBody,
  malformedQuery,
  toJsonText,
  type BodyPayload,
  type Shape,
} from "../support/fuzz";
import type { Client } from "../support/http";
import { ROUTE_RULES, SAMPLE_TABLES, type Access, type Method, type SampleKind, type Samples } from "./route-rules";

const RUNS = Number(process.env.FUZZ_RUNS ?? 200);
const SEED = Number(process.env.FUZZ_SEED ?? 20261201);
const API_DIR = "src/pages/api";
const DEMO: Record<Role, string> = {
  admin: "admin@demo.test",
  manager: "manager@demo.test",
  technician: "tech@demo.test",
  safety: "safety@demo.test",
  client: "client@demo.test",
};
/** Tried in this order: the first role the rule allows sends the requests. */
const ROLE_ORDER: Role[] = ["admin", "manager", "technician", "safety", "client"];

/**
 * Routes that take no input at all: nothing to fuzz, and each call does real work. Sign-out ends
 * the caller's session; the alert check records and mails alerts (it is idempotent, tested in
 * waste.test.ts).
 */
const NO_INPUT: Partial<Record<string, Method[]>> = { "api/auth/sign-out.ts": ["POST"], "api/waste/alerts.ts": ["POST"] };

function walk(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    return statSync(path).isDirectory() ? walk(path) : [path];
  });
}

interface RouteInput {
  body: string | null;
  query: string | null;
  params: string | null;
  form: string | null;
}

/** The handler's source, from `export const METHOD` to the next export. */
function handlerSource(source: string, method: Method): string {
  const start = source.search(new RegExp(`export\\s+(?:const|async\\s+function|function)\\s+${method}\\b`));
  if (start < 0) return "";
  const rest = source.slice(start + 10);
  const next = rest.search(/\nexport\s/);
  return source.slice(start, next < 0 ? undefined : start + 10 + next);
}

/** Which schema the handler passes to readJson / validate, as `module#name`. */
function inputsOf(file: string, method: Method): RouteInput {
  const source = readFileSync(join(API_DIR, file), "utf8");
  const handler = handlerSource(source, method);
  const imports = new Map<string, string>();
  for (const m of source.matchAll(/import\s*\{([^}]+)\}\s*from\s*"([^"]+)"/g)) {
    for (const name of m[1]!
      .split(",")
      .map((n) => n.trim())
      .filter(Boolean)) {
      const [imported, local] = name.split(/\s+as\s+/);
      imports.set((local ?? imported)!.trim(), `${resolve(dirname(join(API_DIR, file)), m[2]!)}#${imported!.trim()}`);
    }
  }
  const find = (re: RegExp) => {
    const name = re.exec(handler)?.[1];
    return name ? (imports.get(name) ?? null) : null;
  };
  return {
    body: find(/readJson\(request,\s*(\w+)\)/),
    query: find(/validate\(queryOf\(url\),\s*(\w+)\)/),
    params: find(/validate\(params(?:\.\w+)?,\s*(\w+)\s*[,)]/),
    form: find(/validate\(fields,\s*(\w+)\)/),
  };
}

async function loadSchema(ref: string | null): Promise<ZodTypeAny | null> {
  if (!ref) return null;
  const [path, name] = ref.split("#") as [string, string];
  const module = (await import(/* @vite-ignore */ `${path}.ts`)) as Record<string, ZodTypeAny>;
  return module[name] ?? null;
}

const ROUTE_FILES = walk(API_DIR)
  .map((p) => relative(API_DIR, p).split("\\").join("/"))
  .filter((p) => !p.split("/").some((s) => s.startsWith("_")))
  .sort();

interface Case {
  file: string;
  method: Method;
  access: Access;
}

const CASES: Case[] = ROUTE_FILES.flatMap((file) => {
  const rule = ROUTE_RULES[`api/${file}`];
  if (!rule) return []; // authorization-matrix.test.ts fails for a route without a rule
  return (Object.entries(rule.methods) as [Method, Access][])
    .filter(([method]) => !NO_INPUT[`api/${file}`]?.includes(method))
    .map(([method, access]) => ({ file, method, access }));
});

function roleFor(access: Access): Role | null {
  if ("public" in access) return null;
  return ROLE_ORDER.find((r) => (access.own ? canAtLeastOwn(r, access.permission) : can(r, access.permission))) ?? null;
}

const app = useAppInstance();
const clients = new Map<Role | "anonymous", Client>();
let samples: Samples;
let before: Record<string, string>;
let uploadsBefore: number;
const totals = { payloads: 0, answered5xx: 0, answered2xx: 0, answered4xx: 0, byStatus: {} as Record<number, number> };

const countFiles = (dir: string): number =>
  readdirSync(dir).reduce((n, name) => n + (statSync(join(dir, name)).isDirectory() ? countFiles(join(dir, name)) : 1), 0);

beforeAll(async () => {
  const sequelize = app.sequelize;
  const one = async <T extends object>(sql: string) => (await sequelize.query<T>(sql, { type: QueryTypes.SELECT }))[0]!;
  const ids = {} as Record<SampleKind, number | string>;
  for (const [kind, table] of Object.entries(SAMPLE_TABLES) as [SampleKind, string][]) {
    const [row] = await sequelize.query<{ id: number | string }>(`SELECT id FROM \`${table}\` ORDER BY id LIMIT 1`, {
      type: QueryTypes.SELECT,
    });
    ids[kind] = row?.id ?? 999_999;
  }
  const batch = await one<{ id: number; code: string }>("SELECT id, code FROM batches ORDER BY id LIMIT 1");
  const user = await one<{ id: number }>("SELECT id FROM users WHERE email = 'ines.halvorsen@demo.test'");
  samples = {
    ids,
    userId: user.id,
    messageId: "none",
    batchId: batch.id,
    batchCode: batch.code,
    ownProjectId: 0,
    foreignProjectId: 0,
    ownProjectCodes: [],
    foreignProjectCodes: [],
  };
  // The per-user rate limits (label PDFs, imports, exports) would answer most of 200 requests a
  // route with 429 before the input is read: this instance allows far more, so the input is fuzzed.
  const generous = { burst: 10_000, perMinute: 10_000 }; // the largest the settings take
  await sequelize.query("INSERT INTO settings (`key`, value, updated_at) VALUES ('sign-in', :value, NOW(3))", {
    replacements: {
      value: JSON.stringify({ rateLimits: { "label-pdf": generous, "statement-pdf": generous, import: generous, export: generous } }),
    },
  });
  clients.set("anonymous", await app.client());
  for (const role of ROLE_ORDER) clients.set(role, await app.client(DEMO[role]));
  before = await databaseFingerprint(sequelize);
  uploadsBefore = countFiles(app.uploadDir);
});

function urlFor(file: string, params: Record<string, string | number>): string {
  let path = "/api/" + file.replace(/\.ts$/, "").replace(/\/index$/, "");
  path = path.replace(/\[(?:\.\.\.)?([^\]]+)\]/g, (_a, name: string) => encodeURIComponent(String(params[name] ?? "1")));
  return path;
}

/** A refusal names what was wrong: "field: message" (the zod helper's format) or, for a missing record, says so. */
function checkRefusal(status: number, text: string, label: string) {
  // A URL that is not valid percent-encoding is refused by Astro itself before any route or
  // middleware runs, with a plain "Bad request.": still a 400 and no stack, but not ours to shape.
  if (status === 400 && text === "Bad request." && /%(?![0-9A-Fa-f]{2})|%E0%A4%A(?![0-9A-Fa-f])/.test(label)) return;
  let body: { error?: unknown };
  try {
    body = JSON.parse(text) as { error?: unknown };
  } catch {
    throw new Error(`${label}: a ${status} that is not JSON: ${text.slice(0, 200)}`);
  }
  if (typeof body.error !== "string" || body.error.length === 0)
    throw new Error(`${label}: a ${status} without an error message: ${text.slice(0, 200)}`);
  if ([400, 413, 415, 422].includes(status) && !/^[A-Za-z_][^:\n]{0,200}: \S/.test(body.error))
    throw new Error(`${label}: the ${status} message names no field: ${body.error.slice(0, 200)}`);
  if (/\n\s+at\s|node_modules|\.ts:\d+|Sequelize\w*Error|ER_[A-Z_]+/.test(text))
    throw new Error(`${label}: the answer leaks internals: ${text.slice(0, 300)}`);
}

interface Sent {
  url: string;
  init: RequestInit;
  /** The input fails the route's schema, so an answer other than 4xx is a bug. */
  mustRefuse: boolean;
  /** For GETs and the import check: a 2xx is fine when the input happens to be valid. */
  mayAccept: boolean;
  describe: string;
}

function record(status: number) {
  totals.payloads++;
  totals.byStatus[status] = (totals.byStatus[status] ?? 0) + 1;
  if (status >= 500) totals.answered5xx++;
  else if (status >= 400) totals.answered4xx++;
  else totals.answered2xx++;
}

async function send(caller: Client, sent: Sent) {
  const response = await caller.fetch(sent.url, sent.init);
  const text = await response.text();
  record(response.status);
  const label = `${sent.init.method} ${sent.url.slice(0, 200)} ${sent.describe.slice(0, 300)} → ${response.status}`;
  if (response.status >= 500) throw new Error(`${label}: ${text.slice(0, 300)}\nThe server printed:\n${app.recentOutput().slice(-1500)}`);
  if (response.status >= 400) checkRefusal(response.status, text, label);
  else if (sent.mustRefuse || !sent.mayAccept) throw new Error(`${label}: accepted malformed input: ${text.slice(0, 300)}`);
  return { status: response.status, text };
}

function bodyInit(method: Method, payload: BodyPayload): { init: RequestInit; describe: string; value: unknown } {
  if (payload.kind === "json") {
    const text = toJsonText(payload.value);
    return {
      init: { method, headers: { "content-type": "application/json" }, body: text },
      describe: `json ${text.slice(0, 300)}`,
      value: asParsed(payload.value),
    };
  }
  const headers: Record<string, string> = {};
  if (payload.contentType) headers["content-type"] = payload.contentType;
  // What readJson would make of it: only JSON sent as JSON reaches the schema.
  let value: unknown;
  if (payload.contentType?.toLowerCase().startsWith("application/json")) {
    try {
      value = JSON.parse(payload.text);
    } catch {
      value = undefined;
    }
  }
  return {
    init: { method, headers, body: payload.text },
    describe: `${payload.contentType ?? "no type"} ${payload.text.slice(0, 200)}`,
    value,
  };
}

describe.concurrent(`every API route and method: ${RUNS} malformed requests each`, () => {
  it.each(CASES)(`$method api/$file`, { timeout: 240_000 }, async ({ file, method, access }) => {
    const role = roleFor(access);
    const caller = clients.get(role ?? "anonymous")!;
    const inputs = inputsOf(file, method);
    const [bodySchema, querySchema, paramSchema, formSchema] = await Promise.all([
      loadSchema(inputs.body),
      loadSchema(inputs.query),
      loadSchema(inputs.params),
      loadSchema(inputs.form),
    ]);
    const ruleParams = ROUTE_RULES[`api/${file}`]!.params?.(samples) ?? {};
    const paramNames = [...file.matchAll(/\[([^\]]+)\]/g)].map((m) => m[1]!);
    const describeOf = (s: ZodTypeAny | null): Shape | null => (s ? describeSchema(s) : null);
    const paramValid = (params: Record<string, string | number>) => {
      if (!paramSchema) return true;
      const single = paramNames.length === 1 ? paramSchema.safeParse(params[paramNames[0]!]) : { success: false };
      return paramSchema.safeParse(params).success || single.success;
    };
    const badParams = paramNames.length
      ? fc.option(fc.record(Object.fromEntries(paramNames.map((n) => [n, fc.constantFrom(...BAD_IDS)]))), { freq: 4 })
      : fc.constant(null);
    if (paramNames.length && !paramSchema)
      throw new Error(`api/${file}: no validate(params…) call found; the fuzz needs the route's parameter schema`);
    const isWebhook = file === "webhooks/payments.ts";
    const isImport = file === "imports/index.ts" && method === "POST";
    const isForm = Boolean(formSchema);

    let arbitrary: fc.Arbitrary<Sent>;
    if (method === "GET") {
      arbitrary = fc.tuple(malformedQuery(describeOf(querySchema)), badParams).map(([query, bad]) => ({
        url: urlFor(file, bad ?? ruleParams) + query,
        init: { method },
        mustRefuse: bad !== null && !paramValid(bad),
        mayAccept: true,
        describe: bad ? `params ${JSON.stringify(bad)}` : "",
      }));
    } else if (isImport) {
      // The CSV import: the query, the content type and the file are all fair game; a commit of garbage must be refused.
      const csv = fc.oneof(
        fc.string({ maxLength: 200 }),
        fc.constantFrom(
          "",
          "run_reference;instrument\r\nA;B",
          "\u0000\u0001\u0002",
          "a,b,c\n1,2,3",
          `run_reference,instrument,method,project,started_at,injections\n${"'; DROP TABLE runs; --"},Wren,x,y,2026-02-30,-1`,
        ),
      );
      const type = fc.constantFrom("text/csv", "text/csv", "text/plain", "application/json", "image/png", null);
      arbitrary = fc.tuple(malformedQuery(describeOf(querySchema)), csv, type).map(([query, text, contentType]) => {
        const mode = new URLSearchParams(query.slice(1)).get("mode");
        const headers: Record<string, string> = contentType ? { "content-type": contentType } : {};
        return {
          url: urlFor(file, ruleParams) + query,
          init: { method, headers, body: text },
          mustRefuse: mode !== "check",
          mayAccept: mode === "check",
          describe: `${contentType} ${JSON.stringify(text.slice(0, 120))}`,
        };
      });
    } else if (isForm) {
      // A multipart form (stock lots): the fields as text, maybe a small file, or not a form at all.
      const shape = describeOf(formSchema)!;
      arbitrary = fc
        .tuple(malformedBody(shape), fc.option(fc.uint8Array({ maxLength: 64 }), { freq: 3 }))
        .filter(([payload]) => payload.kind === "raw" || !formSchema!.safeParse(stringFields(payload.value)).success)
        .map(([payload, file_]): Sent => {
          if (payload.kind === "raw")
            return {
              url: urlFor(file, ruleParams),
              init: { method, headers: payload.contentType ? { "content-type": payload.contentType } : {}, body: payload.text },
              mustRefuse: true,
              mayAccept: false,
              describe: `${payload.contentType} ${payload.text.slice(0, 100)}`,
            };
          const form = new FormData();
          for (const [k, v] of Object.entries(stringFields(payload.value))) form.append(k, v);
          if (file_) form.append("certificate", new Blob([new Uint8Array(file_)]), "certificate.pdf");
          return {
            url: urlFor(file, ruleParams),
            init: { method, body: form },
            mustRefuse: true,
            mayAccept: false,
            describe: `form ${JSON.stringify(stringFields(payload.value)).slice(0, 300)}`,
          };
        });
    } else {
      const shape = describeOf(bodySchema);
      arbitrary = fc
        .tuple(
          malformedBody(shape),
          badParams,
          isWebhook
            ? fc.constantFrom(null, "t=1,v1=0000", "garbage", `t=${Math.floor(Date.now() / 1000)},v1=${"a".repeat(64)}`)
            : fc.constant(null),
        )
        .map(([payload, bad, signature]) => {
          const { init, describe: text, value } = bodyInit(method, payload);
          if (signature) (init.headers as Record<string, string>)["stripe-signature"] = signature;
          const paramsOk = bad === null || paramValid(bad);
          const bodyValid = bodySchema ? value !== undefined && bodySchema.safeParse(value).success : true;
          return {
            sent: {
              url: urlFor(file, bad ?? ruleParams),
              init,
              mustRefuse: true,
              mayAccept: false,
              describe: `${bad ? `params ${JSON.stringify(bad)} ` : ""}${text}`,
            },
            bodyValid,
            paramsOk,
          };
        })
        // Only requests the route must refuse are sent (wrong params, or a body its schema refuses), so
        // no valid request slips through and writes; a route without a body is fuzzed through its params.
        .filter(({ bodyValid, paramsOk }) => isWebhook || !paramsOk || (bodySchema !== null && !bodyValid))
        .map(({ sent }) => sent);
    }

    let tried = 0;
    await fc.assert(
      fc.asyncProperty(arbitrary, async (sent) => {
        tried++;
        await send(caller, sent);
      }),
      { numRuns: RUNS, seed: SEED, endOnFailure: true },
    );
    expect(tried).toBeGreaterThanOrEqual(RUNS);
  });
});

/** Form fields are text: how a browser would send each generated value. */
function stringFields(value: unknown): Record<string, string> {
  if (!value || typeof value !== "object" || Array.isArray(value)) return { value: String(value) };
  return Object.fromEntries(
    Object.entries(value as Record<string, unknown>)
      .filter(([, v]) => v !== undefined)
      .map(([k, v]) => [k, typeof v === "string" ? v : (JSON.stringify(v) ?? "")]),
  );
}

describe("after the fuzz", () => {
  it("wrote nothing: every table's row count and checksum and the upload folder are unchanged; no 5xx", async () => {
    const after = await databaseFingerprint(app.sequelize);
    const changed = Object.keys(before)
      .filter((t) => before[t] !== after[t])
      .map((t) => `${t}: ${before[t]} → ${after[t]}`);
    console.log(
      `fuzz: ${totals.payloads} malformed requests over ${CASES.length} route methods (seed ${SEED}); 5xx: ${totals.answered5xx}; 4xx: ${totals.answered4xx}; 2xx (valid GET queries and import checks): ${totals.answered2xx}; tables changed: ${changed.length}; statuses ${JSON.stringify(totals.byStatus)}`,
    );
    expect(totals.answered5xx).toBe(0);
    expect(totals.payloads).toBeGreaterThanOrEqual(CASES.length * RUNS);
    expect(changed).toEqual([]);
    expect(countFiles(app.uploadDir)).toBe(uploadsBefore);
  });
});

/**
 * Routes whose accepted requests would reach outside the database (mail, the payments provider) or
 * change the caller's own access (the sign-in settings: required two-factor, session lifetimes, rate
 * limits for every concurrent case); the extremes below are sent only to the others.
 */
const OUTSIDE_EFFECTS = /^(auth\/|account\/|users\/|webhooks\/|statements\/\[id\]\/invoice|waste\/alerts|settings\/sign-in)/;
const EXTREME_RUNS = Number(process.env.FUZZ_EXTREME_RUNS ?? 60);
const EXTREME_CASES = CASES.filter((c) => c.method !== "GET" && !OUTSIDE_EFFECTS.test(c.file) && inputsOf(c.file, c.method).body);
const extremes = { payloads: 0, schemaValid: 0, answered5xx: 0 };

// After the nothing-written check: requests of the right shape with values at their extremes (the
// largest number JSON can hold, 10,000-character text, 200-element lists), many of which the schema
// accepts. These may be recorded; none may crash a service. This pass found the 500s fixed in the schemas.
describe.concurrent(`schema-valid extremes on every state-changing route: ${EXTREME_RUNS} each, no 5xx`, () => {
  it.each(EXTREME_CASES)(`$method api/$file`, { timeout: 240_000 }, async ({ file, method, access }) => {
    const caller = clients.get(roleFor(access) ?? "anonymous")!;
    const schema = (await loadSchema(inputsOf(file, method).body))!;
    const url = urlFor(file, ROUTE_RULES[`api/${file}`]!.params?.(samples) ?? {});
    await fc.assert(
      fc.asyncProperty(extremeObject(describeSchema(schema)), async (value) => {
        const text = toJsonText(value);
        extremes.payloads++;
        if (schema.safeParse(asParsed(value)).success) extremes.schemaValid++;
        const response = await caller.fetch(url, { method, headers: { "content-type": "application/json" }, body: text });
        const answer = await response.text();
        if (response.status >= 500) {
          extremes.answered5xx++;
          throw new Error(
            `${method} ${url} ${text.slice(0, 400)} → ${response.status} ${answer.slice(0, 200)}\nThe server printed:\n${app.recentOutput().slice(-1500)}`,
          );
        }
        if (response.status >= 400) checkRefusal(response.status, answer, `${method} ${url} ${text.slice(0, 200)}`);
      }),
      { numRuns: EXTREME_RUNS, seed: SEED, endOnFailure: true },
    );
  });
});

describe("after the extremes", () => {
  it("no request of the right shape crashed a service", () => {
    console.log(
      `fuzz extremes: ${extremes.payloads} requests over ${EXTREME_CASES.length} state-changing routes, ${extremes.schemaValid} accepted by the schema and handed to the service; 5xx: ${extremes.answered5xx}`,
    );
    expect(extremes.answered5xx).toBe(0);
    expect(extremes.payloads).toBeGreaterThanOrEqual(EXTREME_CASES.length * EXTREME_RUNS);
  });
});
