// fast-check arbitraries for malformed input, shaped by the route's own zod schema: a plausible
// value for every field, then one to three fields replaced by something wrong for that field
// (wrong type, out of range, non-finite, huge, an invalid date, SQL or HTML), plus bodies that are
// not objects, not JSON, or not sent as JSON at all.
import fc from "fast-check";
import type { ZodTypeAny } from "zod";

/** Placeholders that become JSON number tokens JSON.stringify cannot write (`1e999` parses to Infinity). */
export const INFINITY = "\u0000INF\u0000";
export const NEG_INFINITY = "\u0000NEGINF\u0000";

/** JSON text of a value, with the non-finite placeholders written as number tokens. */
export function toJsonText(value: unknown): string {
  return JSON.stringify(value).replaceAll(JSON.stringify(INFINITY), "1e999").replaceAll(JSON.stringify(NEG_INFINITY), "-1e999");
}

/** The same value as JSON.parse would read it back from toJsonText (for checking it against the schema). */
export function asParsed(value: unknown): unknown {
  return JSON.parse(toJsonText(value));
}

export const SQL = [
  "' OR '1'='1",
  "1; DROP TABLE ledger_entries; --",
  "' UNION SELECT password_hash FROM users --",
  "\\'; SELECT SLEEP(5); --",
  "1' AND 1=(SELECT COUNT(*) FROM audit_log) --",
  "%' OR 1=1 #",
];
export const HTML = [
  "<script>alert(1)</script>",
  "<img src=x onerror=alert(1)>",
  '"><svg onload=alert(1)>',
  "javascript:alert(1)",
  "{{7*7}}",
  "${7*7}",
];
export const BAD_DATES = [
  "2026-02-30",
  "2026-13-01",
  "0000-00-00",
  "2026-11-31",
  "9999-99-99",
  "2026-1-1",
  "yesterday",
  "2026-11-03T25:61",
  "2026-11-03T09:15:00+99:00",
  "-001000-01-01",
  "1e12",
  "2026/11/03",
];
const JUNK = [
  "",
  " ",
  "\u0000",
  "\uD800",
  "a\uDFFFb",
  "\uFEFF",
  "\u202E evil",
  "null",
  "undefined",
  "NaN",
  "Infinity",
  "-0",
  "0x1F",
  "1e309",
  "true",
  "[]",
  "{}",
  "__proto__",
  "../../etc/passwd",
  "%00",
  "😀".repeat(20),
];

export interface Shape {
  kind: "object" | "array" | "string" | "number" | "boolean" | "enum" | "literal" | "date" | "record" | "other";
  shape?: Record<string, Shape>;
  element?: Shape;
  options?: unknown[];
  min?: number;
  max?: number;
  int?: boolean;
  required?: boolean;
  email?: boolean;
  regex?: RegExp[];
  datetime?: boolean;
}

/** A zod schema as the generators need it: fields, types, ranges, required or not. */
export function describeSchema(schema: ZodTypeAny, required = true): Shape {
  const def = (schema as { _def: Record<string, unknown> & { typeName: string } })._def;
  switch (def.typeName) {
    case "ZodEffects":
      return describeSchema(def.schema as ZodTypeAny, required);
    case "ZodOptional":
      return describeSchema(def.innerType as ZodTypeAny, false);
    case "ZodDefault":
      return describeSchema(def.innerType as ZodTypeAny, false);
    case "ZodNullable":
      return describeSchema(def.innerType as ZodTypeAny, required);
    case "ZodCatch":
    case "ZodReadonly":
    case "ZodBranded":
      return describeSchema((def.innerType ?? def.type) as ZodTypeAny, required);
    case "ZodPipeline":
      return describeSchema(def.in as ZodTypeAny, required);
    case "ZodUnion":
      return describeSchema((def.options as ZodTypeAny[])[0]!, required);
    case "ZodObject": {
      const shape = (def.shape as () => Record<string, ZodTypeAny>)();
      return { kind: "object", required, shape: Object.fromEntries(Object.entries(shape).map(([k, v]) => [k, describeSchema(v)])) };
    }
    case "ZodArray": {
      const min = (def.minLength as { value: number } | null)?.value;
      const max = (def.maxLength as { value: number } | null)?.value;
      return { kind: "array", required, element: describeSchema(def.type as ZodTypeAny), min, max };
    }
    case "ZodRecord":
      return { kind: "record", required, element: describeSchema(def.valueType as ZodTypeAny) };
    case "ZodString": {
      const checks = def.checks as { kind: string; value?: number; regex?: RegExp }[];
      return {
        kind: "string",
        required,
        min: checks.find((c) => c.kind === "min" || c.kind === "length")?.value,
        max: checks.find((c) => c.kind === "max" || c.kind === "length")?.value,
        email: checks.some((c) => c.kind === "email"),
        datetime: checks.some((c) => c.kind === "datetime"),
        regex: checks.filter((c) => c.kind === "regex").map((c) => c.regex!),
      };
    }
    case "ZodNumber": {
      const checks = def.checks as { kind: string; value?: number; inclusive?: boolean }[];
      return {
        kind: "number",
        required,
        min: checks.find((c) => c.kind === "min")?.value,
        max: checks.find((c) => c.kind === "max")?.value,
        int: checks.some((c) => c.kind === "int"),
      };
    }
    case "ZodBoolean":
      return { kind: "boolean", required };
    case "ZodEnum":
      return { kind: "enum", required, options: def.values as unknown[] };
    case "ZodNativeEnum":
      return { kind: "enum", required, options: Object.values(def.values as object) };
    case "ZodLiteral":
      return { kind: "literal", required, options: [def.value] };
    case "ZodDate":
      return { kind: "date", required };
    default:
      return { kind: "other", required };
  }
}

const STRING_CANDIDATES = [
  "2026-11-03",
  "2026-11",
  "A",
  "B",
  "WC-0110",
  "aqueous",
  "EUR",
  "B26-1203",
  "SEQ-2611-014",
  "2026-11-03T09:15:00Z",
  "LC-MS",
  "HPLC",
  "tech@demo.test",
  "fuzz-key-0001",
  "roll-100x50",
  "water",
  "acetonitrile",
  "Lot 42",
  "Wren",
];

/** A value that fits the field as far as the generator can tell (it need not pass every refinement). */
export function plausible(shape: Shape): fc.Arbitrary<unknown> {
  switch (shape.kind) {
    case "object":
      return fc.record(Object.fromEntries(Object.entries(shape.shape!).map(([k, s]) => [k, plausible(s)])));
    case "array":
      return fc.array(plausible(shape.element!), {
        minLength: Math.max(1, shape.min ?? 1),
        maxLength: Math.max(1, Math.min(3, shape.max ?? 3)),
      });
    case "record":
      return fc.dictionary(fc.constantFrom("Lab 2.14", "water", "room-a"), plausible(shape.element!), { maxKeys: 2 });
    case "string": {
      if (shape.email) return fc.constant("fuzz.person@demo.test");
      if (shape.datetime) return fc.constant("2026-11-03T09:15:00Z");
      const fits = STRING_CANDIDATES.filter(
        (c) => (shape.regex ?? []).every((r) => r.test(c)) && c.length >= (shape.min ?? 0) && c.length <= (shape.max ?? Infinity),
      );
      if (fits.length) return fc.constantFrom(...fits);
      return fc.string({ minLength: shape.min ?? 1, maxLength: Math.max(shape.min ?? 1, Math.min(shape.max ?? 20, 20)) });
    }
    case "number": {
      const min = shape.min ?? 0;
      const max = Math.min(shape.max ?? 1000, min + 1000);
      return shape.int ? fc.integer({ min: Math.ceil(min), max: Math.floor(max) }) : fc.double({ min, max, noNaN: true });
    }
    case "boolean":
      return fc.boolean();
    case "enum":
    case "literal":
      return fc.constantFrom(...shape.options!);
    case "date":
      return fc.constant("2026-11-03T09:15");
    default:
      return fc.constant(1);
  }
}

const hugeString = fc.constantFrom(100_000, 250_000).map((n) => "x".repeat(n));
const longString = fc.integer({ min: 300, max: 3_000 }).map((n) => "ab<'\"".repeat(Math.ceil(n / 5)).slice(0, n));

/** Something a field of this kind must refuse (under coercion too, where the generator can tell). */
export function wrongFor(shape: Shape): fc.Arbitrary<unknown> {
  const common = fc.oneof(
    fc.constant(null),
    fc.constant({}),
    fc.constant([]),
    fc.constant({ $gt: "" }),
    fc.array(fc.constant([[[[]]]]), { maxLength: 2 }),
  );
  switch (shape.kind) {
    case "string": {
      const tooLong = shape.max !== undefined ? fc.constant("y".repeat(shape.max + 1)) : longString;
      return fc.oneof(
        { weight: 3, arbitrary: fc.oneof(fc.integer(), fc.double(), fc.boolean(), fc.constant(INFINITY)) },
        { weight: 3, arbitrary: fc.constantFrom(...SQL, ...HTML, ...BAD_DATES, ...JUNK) },
        { weight: 2, arbitrary: tooLong },
        { weight: 1, arbitrary: hugeString },
        { weight: 2, arbitrary: common },
      );
    }
    case "number": {
      const below = shape.min !== undefined ? fc.constantFrom(shape.min - 1, shape.min - 0.5, -1e9) : fc.constantFrom(-1, -1e9);
      const above = shape.max !== undefined ? fc.constantFrom(shape.max + 1, shape.max * 10 + 1, 1e308) : fc.constant(1e308);
      return fc.oneof(
        { weight: 2, arbitrary: below },
        { weight: 2, arbitrary: above },
        { weight: 2, arbitrary: fc.constantFrom(INFINITY, NEG_INFINITY) },
        { weight: 2, arbitrary: fc.constantFrom("abc", "1,5e", "NaN", "Infinity", "12 mL", ...SQL.slice(0, 2), ...HTML.slice(0, 2)) },
        { weight: 1, arbitrary: shape.int ? fc.constantFrom(1.5, 0.001, 2.75) : fc.constant("twelve") },
        { weight: 1, arbitrary: hugeString },
        { weight: 2, arbitrary: common },
      );
    }
    case "boolean":
      return fc.oneof(fc.constantFrom("yes", "TRUE", 2, -1, "on"), common);
    case "enum":
    case "literal":
      return fc.oneof(fc.constantFrom(...SQL, ...HTML, "ADMIN", "Approved ", "root", "*", 1, true), longString, common);
    case "date":
      return fc.oneof(fc.constantFrom(...BAD_DATES), fc.integer(), common);
    case "array": {
      const tooMany =
        shape.max !== undefined
          ? fc.constant(Array.from({ length: shape.max + 1 }, () => 1))
          : fc.constant(Array.from({ length: 20_000 }, () => "z"));
      return fc.oneof(
        fc.constantFrom("A,B", 12, "[]", SQL[0]!),
        tooMany,
        fc.array(wrongFor(shape.element!), { minLength: 1, maxLength: 3 }),
        fc.constant({ 0: "A" }),
      );
    }
    case "object":
    case "record":
      return fc.oneof(fc.constantFrom("{}", 0, true, SQL[1]!), fc.array(fc.integer(), { maxLength: 3 }), fc.constant({ "": 1, " ": null }));
    default:
      return common;
  }
}

type Path = (string | number)[];

function fieldPaths(shape: Shape, prefix: Path = []): { path: Path; shape: Shape }[] {
  const out: { path: Path; shape: Shape }[] = [];
  if (shape.kind === "object") {
    for (const [k, s] of Object.entries(shape.shape!)) {
      out.push({ path: [...prefix, k], shape: s });
      if (s.kind === "object") out.push(...fieldPaths(s, [...prefix, k]));
      if (s.kind === "array" && s.element?.kind === "object") out.push(...fieldPaths(s.element, [...prefix, k, 0]));
    }
  }
  return out;
}

function setAt(target: unknown, path: Path, value: unknown, remove = false): unknown {
  if (path.length === 0) return value;
  const [head, ...rest] = path;
  const base = (
    Array.isArray(target) ? [...(target as unknown[])] : target && typeof target === "object" ? { ...(target as object) } : {}
  ) as Record<string | number, unknown>;
  if (rest.length === 0) {
    if (remove) delete base[head!];
    else base[head!] = value;
  } else base[head!] = setAt(base[head!], rest, value, remove);
  return base;
}

const UNKNOWN_FIELDS = fc.dictionary(
  fc.constantFrom("__proto__", "constructor", "id", "createdAt", "actorId", "role", "isAdmin", "$where", "x".repeat(300)),
  fc.oneof(fc.constant("admin"), fc.integer(), fc.constant(true)),
  { minKeys: 1, maxKeys: 2 },
);

/** An object in the schema's shape with one to three fields made wrong (or left out), sometimes with unknown fields too. */
export function mutatedObject(shape: Shape): fc.Arbitrary<unknown> {
  const paths = fieldPaths(shape);
  if (paths.length === 0) return UNKNOWN_FIELDS;
  const mutation = fc
    .constantFrom(...paths)
    .chain(({ path, shape: s }) =>
      fc.oneof(
        { weight: 5, arbitrary: wrongFor(s).map((value) => ({ path, value, remove: false })) },
        { weight: s.required ? 2 : 0, arbitrary: fc.constant({ path, value: undefined, remove: true }) },
      ),
    );
  const textFields = paths.filter((p) => p.shape.kind === "string");
  const fragmentArb = textFields.length
    ? fc.option(
        fc.constantFrom(...textFields).chain((p) => fc.constantFrom(...SQL, ...HTML).map((v) => ({ path: p.path, value: v }))),
        { freq: 3 },
      )
    : fc.constant(null);
  return fc
    .tuple(plausible(shape), fc.array(mutation, { minLength: 1, maxLength: 3 }), fc.option(UNKNOWN_FIELDS, { freq: 4 }), fragmentArb)
    .map(([base, mutations, unknown, fragment]) => {
      let value = base;
      // A SQL or HTML fragment in a free-text field is valid text; it rides along with the wrong field.
      if (fragment) value = setAt(value, fragment.path, fragment.value);
      for (const m of mutations) value = setAt(value, m.path, m.value, m.remove);
      if (unknown && value && typeof value === "object") value = { ...(value as object), ...unknown };
      return value;
    });
}

export type BodyPayload =
  /** A JSON value sent as application/json. */
  | { kind: "json"; value: unknown }
  /** Raw bytes with a content type (or none). */
  | { kind: "raw"; text: string; contentType: string | null };

/** A malformed JSON request body for a route that reads `schema`. */
export function malformedBody(shape: Shape | null): fc.Arbitrary<BodyPayload> {
  const notAnObject = fc.oneof(
    fc.integer(),
    fc.double(),
    fc.string({ maxLength: 40 }),
    fc.constant(null),
    fc.boolean(),
    fc.array(fc.integer(), { maxLength: 4 }),
    fc.constantFrom(INFINITY, ...SQL, ...HTML),
  );
  const rawText = fc.oneof(
    fc.constantFrom(
      "",
      "{",
      "{'a': 1}",
      '{"a":1}garbage',
      "[1,2",
      "undefined",
      "NaN",
      '{"a": NaN}',
      '{"a": 01}',
      "\u0000\u0001",
      '{"__proto__": {"isAdmin": true}}',
      "[".repeat(5_000) + "]".repeat(5_000),
      "<?xml version='1.0'?><a/>",
      SQL[1]!,
      "a=1&b=2",
    ),
    fc.string({ maxLength: 60 }),
  );
  const wrongType = fc.constantFrom(
    "text/plain",
    "application/x-www-form-urlencoded",
    "multipart/form-data; boundary=x",
    "application/xml",
    "text/html",
    null,
    "json",
    "text/json",
  );
  return fc.oneof(
    {
      weight: shape ? 14 : 0,
      arbitrary: shape
        ? mutatedObject(shape).map((value) => ({ kind: "json" as const, value }))
        : fc.constant({ kind: "json" as const, value: {} }),
    },
    { weight: 2, arbitrary: notAnObject.map((value) => ({ kind: "json" as const, value })) },
    { weight: 2, arbitrary: rawText.map((text) => ({ kind: "raw" as const, text, contentType: "application/json" })) },
    {
      weight: 2,
      arbitrary: fc
        .tuple(shape ? plausible(shape) : fc.constant({}), wrongType)
        .map(([value, contentType]) => ({ kind: "raw" as const, text: JSON.stringify(value), contentType })),
    },
  );
}

/** A malformed query string for a route that reads `shape` from its query (or none). */
export function malformedQuery(shape: Shape | null): fc.Arbitrary<string> {
  const asText = (v: unknown) =>
    typeof v === "string"
      ? v
      : v === INFINITY
        ? "1e999"
        : v === NEG_INFINITY
          ? "-1e999"
          : typeof v === "object"
            ? JSON.stringify(v)
            : String(v);
  const capped = (v: unknown) => asText(v).slice(0, 4_000);
  const fromShape = shape
    ? mutatedObject(shape).map((value) => {
        const params = new URLSearchParams();
        for (const [k, v] of Object.entries((value as Record<string, unknown>) ?? {}))
          if (v !== undefined) params.append(k.slice(0, 100), capped(v));
        return `?${params.toString()}`;
      })
    : fc.constant("?");
  const rawQuery = fc.constantFrom(
    "?%",
    "?%E0%A4%A",
    "?a=1&a=2&a=3",
    "?=",
    "?&&&",
    "?from[]=2026-01-01",
    "?from[$gt]=1",
    "?limit=1e999",
    "?limit=-1",
    `?q=${"%41".repeat(1_500)}`,
    "?\u0000=1",
    "?from=2026-02-30&to=2026-13-01",
    "?to=2026-01-01&from=2026-12-31",
    `?from=${encodeURIComponent(SQL[0]!)}`,
    `?code=${encodeURIComponent(HTML[0]!)}`,
  );
  const randomParams = fc
    .dictionary(
      fc.string({ minLength: 1, maxLength: 12 }),
      fc.oneof(fc.string({ maxLength: 30 }), fc.constantFrom(...SQL, ...HTML, ...BAD_DATES)),
      { maxKeys: 4 },
    )
    .map((d) => `?${new URLSearchParams(d).toString()}`);
  return fc.oneof(
    { weight: shape ? 6 : 0, arbitrary: fromShape },
    { weight: 2, arbitrary: rawQuery },
    { weight: 2, arbitrary: randomParams },
  );
}

/** Path parameter values no route should take for an id. */
export const BAD_IDS = [
  "0",
  "-1",
  "1.5",
  "abc",
  "1e999",
  "NaN",
  "Infinity",
  "-Infinity",
  "' OR 1=1 --",
  "<script>alert(1)</script>",
  "1; DROP TABLE batches",
  "0x10",
  "[]",
  "{}",
  "null",
  "%00",
  "..",
  "\u202E1",
  "1 OR 1=1",
  " ",
  "99999999999999999999999999999",
];

/** A value of the right type at the edge of, or far beyond, what the field means: what reaches a service when a schema is too lax. */
export function extremeFor(shape: Shape): fc.Arbitrary<unknown> {
  switch (shape.kind) {
    case "number":
      return fc.constantFrom(
        ...[shape.max, shape.min, 1e308, -1e308, 1e-300, 2 ** 53 + 1, 1e15, INFINITY, NEG_INFINITY].filter((v) => v !== undefined),
      );
    case "string":
      return fc.oneof(
        fc.constant("y".repeat(shape.max ?? 10_000)),
        fc.constantFrom(...SQL, ...HTML, "\u0000", "\uD800", "😀".repeat(Math.max(1, Math.floor((shape.max ?? 400) / 2)))),
      );
    case "array":
      return fc.array(plausible(shape.element!), {
        minLength: Math.min(shape.max ?? 200, 200),
        maxLength: Math.min(shape.max ?? 200, 200),
      });
    default:
      return plausible(shape);
  }
}

/** An object in the schema's shape with one or two fields at their extremes (often valid: these probe the services). */
export function extremeObject(shape: Shape): fc.Arbitrary<unknown> {
  const paths = fieldPaths(shape);
  if (paths.length === 0) return plausible(shape);
  const change = fc.constantFrom(...paths).chain(({ path, shape: s }) => extremeFor(s).map((value) => ({ path, value })));
  return fc
    .tuple(plausible(shape), fc.array(change, { minLength: 1, maxLength: 2 }))
    .map(([base, changes]) => changes.reduce((v, c) => setAt(v, c.path, c.value), base));
}
