// The expected access rule of every page and API route under src/pages, kept as data.
// authorization-matrix.test.ts fails when a route file has no entry here (or an entry has no
// file), when an API route exports a method without a rule, and when the running app answers
// any role differently from what the rule and src/lib/permissions.ts say.
import type { Permission } from "../../src/lib/permissions";

export type Method = "GET" | "POST" | "PUT" | "PATCH" | "DELETE";

/** Ids from the seeded demo data (and the mail fake) for dynamic routes. */
export interface Samples {
  /** A demo user that tests may send links to (never one of the five sign-in accounts). */
  userId: number;
  /** A message the SMTP fake kept. */
  messageId: string;
  /** A batch in the demo data. */
  batchId: number;
  batchCode: string;
  /** A project of the demo client contact's own organisation, and one of another organisation. */
  ownProjectId: number;
  foreignProjectId: number;
  /** Project codes of another organisation: must never appear for the client contact. */
  foreignProjectCodes: string[];
  ownProjectCodes: string[];
  /** The lowest id of each kind of record (999999, which exists nowhere, when there is none). */
  ids: Record<SampleKind, number | string>;
  /**
   * An issued statement and its invoice of another organisation, and an issued statement of the
   * client contact's own organisation (created by authorization-matrix.test.ts; 999999 elsewhere).
   */
  foreignStatementId?: number;
  foreignInvoiceId?: number;
  ownStatementId?: number;
  /** The other organisation's name: must never appear for the client contact. */
  foreignClientName?: string;
}

/** Tables that dynamic routes take ids from. */
export const SAMPLE_TABLES = {
  batch: "batches",
  recipe: "recipes",
  run: "runs",
  method: "methods",
  instrument: "instruments",
  stockLot: "stock_lots",
  statement: "statements",
  invoice: "invoices",
  wasteContainer: "waste_containers",
  pickup: "pickups",
  wasteStream: "waste_streams",
} as const;
export type SampleKind = keyof typeof SAMPLE_TABLES;

export type Access =
  /** Behind a permission: 401 / sign-in redirect for anonymous, 403 for a role without it. */
  | { permission: Permission; own?: boolean }
  /** Open to everyone; the statuses expected for an anonymous and a signed-in request. */
  | { public: true; anonymous: number; signedIn: number };

export interface RouteRule {
  methods: Partial<Record<Method, Access>>;
  /** Values for the route's [params]. */
  params?: (samples: Samples) => Record<string, string | number>;
  /** Query string sent with GET requests, e.g. "?from=2026-01-01". */
  query?: string | ((samples: Samples) => string);
  /**
   * JSON body of state-changing requests. `{}` by default: an allowed role should then get a
   * validation error (400), so the check changes nothing in the test data.
   */
  body?: unknown;
  /** Status an allowed GET answers; 200 by default. */
  allowedStatus?: number;
}

/** A statement / invoice id no test creates. */
const NO_STATEMENT = 999_999;
const foreignSecrets = (s: Samples) => [...s.foreignProjectCodes, ...(s.foreignClientName ? [s.foreignClientName] : [])];
const need = (permission: Permission, own = false): Access => ({ permission, own });
const open = (anonymous: number, signedIn = anonymous): Access => ({ public: true, anonymous, signedIn });

export const ROUTE_RULES: Record<string, RouteRule> = {
  // Pages (GET). Public ones with the status each kind of visitor gets.
  "index.astro": { methods: { GET: open(302) } },
  "404.astro": { methods: { GET: open(404) } },
  "forbidden.astro": { methods: { GET: open(403) } },
  "sign-in.astro": { methods: { GET: open(200, 302) } },
  "sign-out.astro": { methods: { GET: open(200) } },
  "forgot-password.astro": { methods: { GET: open(200) } },
  // Without a usable token the page explains that the link no longer works.
  "set-password.astro": { methods: { GET: open(410) } },
  "home.astro": { methods: { GET: need("read:dashboard") } },
  "account.astro": { methods: { GET: need("read:own-account") } },
  "users/index.astro": { methods: { GET: need("manage:user") } },
  "batches/index.astro": { methods: { GET: need("read:batch") } },
  "dev/inbox/index.astro": { methods: { GET: need("read:dev-inbox") } },
  "dev/inbox/[id].astro": { methods: { GET: need("read:dev-inbox") }, params: (s) => ({ id: s.messageId }) },

  // API routes.
  "api/health.ts": { methods: { GET: open(200) } },
  "api/me.ts": { methods: { GET: need("read:own-account") } },
  "api/auth/sign-in.ts": { methods: { POST: open(400) } },
  "api/auth/sign-out.ts": { methods: { POST: open(204) } },
  "api/auth/forgot-password.ts": { methods: { POST: open(400) } },
  "api/auth/set-password.ts": { methods: { POST: open(400) } },
  "api/account/password.ts": { methods: { POST: need("update:own-account") } },
  // Sign-in security (issue 16). The two steps of a sign-in are public; without a half-finished
  // sign-in behind them they answer 400 for the empty body, or (the set-up, whose body may be
  // empty) 401 anonymous and 400 signed in (the password is asked again).
  "sign-in/code.astro": { methods: { GET: open(302) } },
  "sign-in/two-factor-setup.astro": { methods: { GET: open(302) } },
  "settings/sign-in.astro": { methods: { GET: need("manage:settings") } },
  "api/auth/two-factor/index.ts": { methods: { POST: open(400) } },
  "api/auth/two-factor/setup.ts": { methods: { POST: open(401, 400) } },
  "api/auth/two-factor/confirm.ts": { methods: { POST: open(400) } },
  "api/account/two-factor.ts": { methods: { DELETE: need("update:own-account") } },
  "api/account/recovery-codes.ts": { methods: { POST: need("update:own-account") } },
  "api/account/sessions/index.ts": { methods: { GET: need("read:own-account"), DELETE: need("read:own-account") } },
  // A handle no session has: allowed roles get 404, which ends nothing.
  "api/account/sessions/[handle].ts": { methods: { DELETE: need("read:own-account") }, params: () => ({ handle: "0000000000000000" }) },
  // An invalid limit, so an allowed role's 400 changes no setting of the shared test app.
  "api/settings/sign-in.ts": {
    methods: { GET: need("manage:settings"), PUT: need("manage:settings") },
    body: { throttle: { pairFailures: 0 } },
  },
  "api/users/[id]/two-factor.ts": { methods: { DELETE: need("manage:user") }, params: () => ({ id: 999_999 }) },
  "api/users/index.ts": { methods: { GET: need("manage:user"), POST: need("manage:user") } },
  "api/users/[id].ts": { methods: { PATCH: need("manage:user") }, params: (s) => ({ id: s.userId }) },
  // Allowed roles really send a link (to the sample user, who is no sign-in account).
  "api/users/[id]/link.ts": { methods: { POST: need("manage:user") }, params: (s) => ({ id: s.userId }) },
  "api/batches/index.ts": { methods: { GET: need("read:batch"), POST: need("create:batch") } },

  // Preparation, runs, ledger, instruments and usage (issues 4 and 5): each row written from the
  // route's own requirePermission / guardPage call. Whoever changes a route's rule changes its row.
  "api/batches/[id]/bottles/[number].ts": { methods: { POST: need("update:batch") }, params: (s) => ({ id: s.ids.batch, number: "1" }) },
  "api/batches/[id]/index.ts": { methods: { GET: need("read:batch") }, params: (s) => ({ id: s.ids.batch }) },
  "api/batches/[id]/label.pdf.ts": { methods: { GET: need("read:batch") }, params: (s) => ({ id: s.ids.batch }) },
  "api/batches/lookup.ts": { methods: { GET: need("read:batch") }, query: (s) => `?code=${encodeURIComponent(s.batchCode)}` },
  "api/draws/index.ts": { methods: { POST: need("create:draw") } },
  "api/imports/index.ts": { methods: { GET: need("create:import"), POST: need("create:import") } },
  "api/imports/template.csv.ts": { methods: { GET: need("create:import") } },
  "api/instruments/[id].ts": { methods: { PUT: need("manage:instrument") }, params: (s) => ({ id: s.ids.instrument }) },
  "api/instruments/index.ts": { methods: { GET: need("read:instrument"), POST: need("manage:instrument") } },
  "api/ledger/corrections.ts": { methods: { POST: need("create:correction") } },
  "api/ledger/index.ts": { methods: { GET: need("read:run") } },
  "api/methods/[id].ts": { methods: { GET: need("read:instrument"), PUT: need("manage:method") }, params: (s) => ({ id: s.ids.method }) },
  "api/methods/index.ts": { methods: { GET: need("read:instrument"), POST: need("manage:method") } },
  "api/recipes/[id]/approve.ts": { methods: { POST: need("approve:recipe") }, params: (s) => ({ id: s.ids.recipe }) },
  "api/recipes/[id]/index.ts": { methods: { GET: need("read:recipe"), PUT: need("create:recipe") }, params: (s) => ({ id: s.ids.recipe }) },
  "api/recipes/index.ts": { methods: { GET: need("read:recipe"), POST: need("create:recipe") } },
  "api/runs/[id].ts": { methods: { GET: need("read:run") }, params: (s) => ({ id: s.ids.run }) },
  "api/runs/index.ts": { methods: { GET: need("read:run"), POST: need("create:run") } },
  "api/settings/facility.ts": { methods: { GET: need("read:own-account"), PUT: need("manage:settings") } },
  "api/settings/preparation.ts": { methods: { GET: need("read:batch"), PUT: need("manage:preparation-settings") } },
  // The demo lots have no certificate file: allowed roles get the 404 that says so.
  "api/stock-lots/[id]/certificate.ts": {
    methods: { GET: need("read:stock-lot") },
    params: (s) => ({ id: s.ids.stockLot }),
    allowedStatus: 404,
  },
  "api/stock-lots/index.ts": { methods: { GET: need("read:stock-lot"), POST: need("create:stock-lot") } },
  "api/usage/index.ts": { methods: { GET: need("read:usage", true) }, query: "?from=2026-01-01&to=2026-01-31&groupBy=project" },
  "batches/[id].astro": { methods: { GET: need("read:batch") }, params: (s) => ({ id: s.ids.batch }) },
  "batches/new.astro": { methods: { GET: need("create:batch") } },
  "imports/index.astro": { methods: { GET: need("create:import") } },
  "instruments/[id].astro": { methods: { GET: need("manage:instrument") }, params: (s) => ({ id: s.ids.instrument }) },
  "instruments/index.astro": { methods: { GET: need("read:instrument") } },
  "methods/[id].astro": { methods: { GET: need("read:instrument") }, params: (s) => ({ id: s.ids.method }) },
  "methods/index.astro": { methods: { GET: need("read:instrument") } },
  "methods/new.astro": { methods: { GET: need("manage:method") } },
  "planning/index.astro": { methods: { GET: need("read:planning") } },
  "planning/supply.astro": { methods: { GET: need("read:supply") } },
  "planning/methods/[id].astro": { methods: { GET: need("read:planning") }, params: (s) => ({ id: s.ids.method }) },
  "api/planning/preview.ts": { methods: { POST: need("read:planning") } },
  "api/planning/methods.ts": { methods: { GET: need("read:planning") } },
  "api/planning/supply.ts": { methods: { GET: need("read:supply"), PUT: need("manage:supply") } },
  "api/planning/variants/index.ts": {
    methods: { GET: need("read:planning"), POST: need("manage:planning") },
    query: (s) => `?methodId=${s.ids.method}`,
  },
  "api/planning/variants/[id]/submit.ts": { methods: { POST: need("manage:planning") }, params: () => ({ id: 999_999 }) },
  "api/planning/versions/[id].ts": { methods: { POST: need("approve:method") }, params: () => ({ id: 999_999 }) },
  "recipes/[id].astro": { methods: { GET: need("read:recipe") }, params: (s) => ({ id: s.ids.recipe }) },
  "recipes/index.astro": { methods: { GET: need("read:recipe") } },
  "recipes/new.astro": { methods: { GET: need("create:recipe") } },
  "runs/[id].astro": { methods: { GET: need("read:run") }, params: (s) => ({ id: s.ids.run }) },
  "runs/draw.astro": { methods: { GET: need("create:draw") } },
  "runs/index.astro": { methods: { GET: need("read:run") } },
  "runs/new.astro": { methods: { GET: need("create:run") } },
  "settings/facility.astro": { methods: { GET: need("manage:settings") } },
  "settings/preparation.astro": { methods: { GET: need("manage:preparation-settings") } },
  "stock-lots/index.astro": { methods: { GET: need("read:stock-lot") } },
  "usage/index.astro": { methods: { GET: need("read:usage", true) } },

  // Billing (issue 7). Statement ids that do not exist: allowed roles get 404, which changes nothing.
  "rates/index.astro": { methods: { GET: need("manage:rate") } },
  "statements/index.astro": { methods: { GET: need("read:statement", true) } },
  "statements/[id].astro": { methods: { GET: need("read:statement", true) }, params: () => ({ id: NO_STATEMENT }), allowedStatus: 404 },
  "invoices/index.astro": { methods: { GET: need("read:invoice", true) } },
  "api/rates/index.ts": { methods: { GET: need("manage:rate"), POST: need("manage:rate") } },
  "api/invoices/index.ts": { methods: { GET: need("read:invoice", true) } },
  "api/statements/index.ts": { methods: { GET: need("read:statement", true), POST: need("manage:statement") } },
  "api/statements/journal.csv.ts": { methods: { GET: need("manage:statement") }, query: "?from=2026-01-01&to=2026-01-31" },
  "api/statements/[id]/index.ts": {
    methods: { GET: need("read:statement", true) },
    params: () => ({ id: NO_STATEMENT }),
    allowedStatus: 404,
  },
  "api/statements/[id]/statement.pdf.ts": {
    methods: { GET: need("read:statement", true) },
    params: () => ({ id: NO_STATEMENT }),
    allowedStatus: 404,
  },
  "api/statements/[id]/statement.csv.ts": {
    methods: { GET: need("read:statement", true) },
    params: () => ({ id: NO_STATEMENT }),
    allowedStatus: 404,
  },
  "api/statements/[id]/issue.ts": { methods: { POST: need("manage:statement") }, params: () => ({ id: NO_STATEMENT }) },
  "api/statements/[id]/invoice.ts": { methods: { POST: need("manage:invoice") }, params: () => ({ id: NO_STATEMENT }) },
  "api/invoices/[id]/void.ts": { methods: { POST: need("manage:invoice") }, params: () => ({ id: NO_STATEMENT }) },
  "api/invoices/[id]/uncollectible.ts": { methods: { POST: need("manage:invoice") }, params: () => ({ id: NO_STATEMENT }) },
  // Public: trust comes from the signature; an unsigned request is refused with 400.
  "api/webhooks/payments.ts": { methods: { POST: open(400) } },

  // Waste (issue 8). Container 1 is a demo container; an empty body answers 400, changing nothing.
  "waste/index.astro": { methods: { GET: need("read:waste") } },
  "waste/containers/index.astro": { methods: { GET: need("read:waste") } },
  "waste/containers/[id].astro": { methods: { GET: need("read:waste") }, params: () => ({ id: 1 }) },
  "waste/pickups.astro": { methods: { GET: need("read:waste") } },
  "waste/streams.astro": { methods: { GET: need("read:waste") } },
  "waste/settings.astro": { methods: { GET: need("manage:waste") } },
  "api/waste/summary.ts": { methods: { GET: need("read:waste") }, query: "?from=2026-01-01&to=2026-01-31" },
  "api/waste/report.ts": { methods: { GET: need("read:waste") }, query: "?from=2026-01-01&to=2026-01-31" },
  "api/waste/streams/index.ts": { methods: { GET: need("read:waste"), POST: need("manage:waste") } },
  "api/waste/streams/[id].ts": { methods: { PUT: need("manage:waste") }, params: () => ({ id: "aqueous" }) },
  "api/waste/containers/index.ts": { methods: { GET: need("read:waste"), POST: need("manage:waste") } },
  "api/waste/containers/[id].ts": { methods: { GET: need("read:waste"), PUT: need("manage:waste") }, params: () => ({ id: 1 }) },
  "api/waste/containers/[id]/readings.ts": { methods: { POST: need("manage:waste") }, params: () => ({ id: 1 }) },
  "api/waste/containers/[id]/status.ts": { methods: { POST: need("manage:waste") }, params: () => ({ id: 1 }) },
  "api/waste/containers/[id]/label.pdf.ts": { methods: { GET: need("read:waste") }, params: () => ({ id: 1 }) },
  "api/waste/pickups/index.ts": { methods: { GET: need("read:waste"), POST: need("manage:waste") } },
  "api/waste/pickups/[id]/collection.ts": { methods: { POST: need("manage:waste") }, params: () => ({ id: 999_999 }) },
  "api/waste/settings.ts": { methods: { GET: need("manage:waste"), PUT: need("manage:waste") } },
  // POST runs the alert check (mails only alerts not mailed before).
  "api/waste/alerts.ts": { methods: { GET: need("read:waste"), POST: need("manage:waste") } },
  "api/waste/route.ts": { methods: { POST: need("read:waste") } },
};

/**
 * Routes that show one record of a client organisation by id. For each, the demo client contact
 * asks for another organisation's record and must get 403 or 404, never the data. Every dynamic
 * route about projects, batches, statements or invoices must be listed here.
 */
export const CROSS_ORGANISATION: Record<
  string,
  { params: (s: Samples) => Record<string, string | number>; mustNotShow: (s: Samples) => string[] }
> = {
  // Batches belong to the facility, not to a client: a client contact may read none of them.
  "api/batches/[id]/index.ts": { params: (s) => ({ id: s.batchId }), mustNotShow: (s) => [s.batchCode] },
  "api/batches/[id]/label.pdf.ts": { params: (s) => ({ id: s.batchId }), mustNotShow: (s) => [s.batchCode, "%PDF"] },
  "batches/[id].astro": { params: (s) => ({ id: s.batchId }), mustNotShow: (s) => [s.batchCode] },
  // Real records of another organisation, created for the matrix: its statement and invoice.
  "statements/[id].astro": { params: (s) => ({ id: s.foreignStatementId ?? NO_STATEMENT }), mustNotShow: (s) => foreignSecrets(s) },
  "api/statements/[id]/index.ts": { params: (s) => ({ id: s.foreignStatementId ?? NO_STATEMENT }), mustNotShow: (s) => foreignSecrets(s) },
  "api/statements/[id]/statement.pdf.ts": {
    params: (s) => ({ id: s.foreignStatementId ?? NO_STATEMENT }),
    mustNotShow: (s) => [...foreignSecrets(s), "%PDF"],
  },
  "api/statements/[id]/statement.csv.ts": {
    params: (s) => ({ id: s.foreignStatementId ?? NO_STATEMENT }),
    mustNotShow: (s) => foreignSecrets(s),
  },
  "api/statements/[id]/issue.ts": { params: (s) => ({ id: s.foreignStatementId ?? NO_STATEMENT }), mustNotShow: (s) => foreignSecrets(s) },
  "api/statements/[id]/invoice.ts": {
    params: (s) => ({ id: s.foreignStatementId ?? NO_STATEMENT }),
    mustNotShow: (s) => foreignSecrets(s),
  },
  "api/invoices/[id]/void.ts": { params: (s) => ({ id: s.foreignInvoiceId ?? NO_STATEMENT }), mustNotShow: (s) => foreignSecrets(s) },
  "api/invoices/[id]/uncollectible.ts": {
    params: (s) => ({ id: s.foreignInvoiceId ?? NO_STATEMENT }),
    mustNotShow: (s) => foreignSecrets(s),
  },
  // Projects, runs, methods and instruments by id are facility records; a client contact may read none.
  "api/runs/[id].ts": { params: (s) => ({ id: s.ids.run }), mustNotShow: (s) => [...s.foreignProjectCodes, '"run"'] },
  "runs/[id].astro": { params: (s) => ({ id: s.ids.run }), mustNotShow: (s) => s.foreignProjectCodes },
  "api/stock-lots/[id]/certificate.ts": { params: (s) => ({ id: s.ids.stockLot }), mustNotShow: () => ["%PDF"] },
};
