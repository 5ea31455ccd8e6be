/**
 * Page weight: the gzipped JavaScript each page ships, crawled from the built app signed in as a
 * role that may see it: every `<script>` in the HTML (inline ones gzipped on their own), each
 * island's component and renderer module, and every module those import statically, each
 * module counted once per page. Sizes are exact (gzip level 9 as served by a typical proxy), so
 * one pass is enough; the table reports each page's figure as its own min and max.
 */
import { gzipSync } from "node:zlib";
import mariadb from "mariadb";
import { benchEnv, emit, fmt, main, row, type BenchRow } from "./lib";

/** Pages that only show and link (forms post without script): they must ship no JavaScript. */
const STATIC_PAGES = new Set(["/sign-out", "/forbidden", "/404 (unknown address)"]);

main(async () => {
  const { baseURL, cookies } = benchEnv();
  const conn = await mariadb.createConnection({
    host: process.env.DATABASE_HOST,
    port: Number(process.env.DATABASE_PORT),
    user: process.env.DATABASE_USER,
    password: process.env.DATABASE_PASSWORD,
    database: process.env.DATABASE_NAME,
    timezone: "Z",
  });
  const first = async (table: string) => {
    const [r] = (await conn.query(`SELECT MIN(id) AS id FROM ${table}`)) as { id: number | null }[];
    return r?.id ?? null;
  };
  const ids = {
    batch: await first("batches"),
    instrument: await first("instruments"),
    method: await first("methods"),
    recipe: await first("recipes"),
    run: await first("runs"),
    statement: await first("statements"),
    container: await first("waste_containers"),
  };
  await conn.end();

  const pages: { path: string; as: keyof typeof cookies | null; label?: string }[] = [
    { path: "/sign-in", as: null },
    { path: "/forgot-password", as: null },
    { path: "/set-password?token=x", as: null, label: "/set-password" },
    { path: "/home", as: "technician", label: "/home (technician)" },
    { path: "/home", as: "manager", label: "/home (manager)" },
    { path: "/home", as: "safety", label: "/home (safety)" },
    { path: "/home", as: "client", label: "/home (client)" },
    { path: "/account", as: "technician" },
    { path: "/sign-out", as: "technician" },
    { path: "/users", as: "client", label: "/forbidden" },
    { path: "/no-such-page", as: "technician", label: "/404 (unknown address)" },
    { path: "/batches", as: "technician" },
    { path: "/batches/new", as: "technician" },
    { path: `/batches/${ids.batch}`, as: "technician", label: "/batches/[id]" },
    { path: "/recipes", as: "technician" },
    { path: "/recipes/new", as: "technician" },
    { path: `/recipes/${ids.recipe}`, as: "technician", label: "/recipes/[id]" },
    { path: "/methods", as: "manager" },
    { path: "/methods/new", as: "manager" },
    { path: `/methods/${ids.method}`, as: "manager", label: "/methods/[id]" },
    { path: "/instruments", as: "manager" },
    { path: `/instruments/${ids.instrument}`, as: "manager", label: "/instruments/[id]" },
    { path: "/runs", as: "technician" },
    { path: "/runs/new", as: "technician" },
    { path: "/runs/draw", as: "technician" },
    { path: `/runs/${ids.run}`, as: "technician", label: "/runs/[id]" },
    { path: "/imports", as: "technician" },
    { path: "/stock-lots", as: "technician" },
    { path: "/usage", as: "manager" },
    { path: "/rates", as: "manager" },
    { path: "/statements", as: "manager" },
    { path: `/statements/${ids.statement}`, as: "manager", label: "/statements/[id]" },
    { path: "/invoices", as: "manager" },
    { path: "/users", as: "admin" },
    { path: "/settings/preparation", as: "admin" },
    { path: "/dev/inbox", as: "admin" },
    { path: "/waste", as: "safety" },
    { path: "/waste/containers", as: "safety" },
    { path: `/waste/containers/${ids.container}`, as: "safety", label: "/waste/containers/[id]" },
    { path: "/waste/pickups", as: "safety" },
    { path: "/waste/streams", as: "safety" },
    { path: "/waste/settings", as: "admin" },
  ];

  const moduleCache = new Map<string, { gz: number; imports: string[] }>();
  async function moduleInfo(url: string) {
    let info = moduleCache.get(url);
    if (info) return info;
    const r = await fetch(url);
    if (r.status !== 200) throw new Error(`${url} answered ${r.status}`);
    const code = await r.text();
    const imports = new Set<string>();
    // Static imports and re-exports only; import("…") loads later, on demand.
    for (const m of code.matchAll(/(?:^|[;}\s])(?:import|export)\s*(?:[\w$*{}\s,]+?\s*from\s*)?["']([^"']+\.m?js)["']/g))
      imports.add(new URL(m[1]!, url).href);
    info = { gz: gzipSync(code, { level: 9 }).length, imports: [...imports] };
    moduleCache.set(url, info);
    return info;
  }

  const rows: BenchRow[] = [];
  let heaviest = { label: "", bytes: 0 };
  for (const p of pages) {
    const label = p.label ?? p.path;
    if (p.path.includes("/null")) {
      console.log(`  ${label}: no sample record, skipped`);
      continue;
    }
    let r: Response;
    let html: string;
    try {
      r = await fetch(baseURL + p.path, {
        headers: p.as ? { cookie: cookies[p.as]! } : {},
        redirect: "manual",
        signal: AbortSignal.timeout(30_000),
      });
      html = await r.text();
    } catch {
      console.log(`  ${label}: no answer within 30 s, not measured`);
      rows.push({
        group: "page weight",
        figure: `JS ${label}`,
        unit: "KB gz",
        median: Number.NaN,
        min: Number.NaN,
        max: Number.NaN,
        n: 0,
        met: false,
        note: "no answer within 30 s",
      });
      continue;
    }
    if (r.status >= 500 || (r.status >= 300 && r.status < 400)) {
      console.log(`  ${label}: answered ${r.status}, not measured`);
      rows.push({
        group: "page weight",
        figure: `JS ${label}`,
        unit: "KB gz",
        median: Number.NaN,
        min: Number.NaN,
        max: Number.NaN,
        n: 0,
        met: false,
        note: `answered ${r.status}`,
      });
      continue;
    }
    let inline = 0;
    const entry = new Set<string>();
    for (const m of html.matchAll(/<script\b([^>]*)>([\s\S]*?)<\/script>/g)) {
      const attrs = m[1]!;
      if (/type=["']?application\/(ld\+)?json/.test(attrs)) continue;
      const src = /\bsrc=["']([^"']+)["']/.exec(attrs)?.[1];
      if (src) entry.add(new URL(src, baseURL + p.path).href);
      else if (m[2]!.trim()) inline += gzipSync(m[2]!, { level: 9 }).length;
    }
    for (const m of html.matchAll(/<astro-island\b[^>]*>/g)) {
      for (const attr of ["component-url", "renderer-url"]) {
        const v = new RegExp(`${attr}="([^"]+)"`).exec(m[0])?.[1];
        if (v) entry.add(new URL(v.replace(/&amp;/g, "&"), baseURL).href);
      }
    }
    const seen = new Set<string>();
    const queue = [...entry];
    let bytes = inline;
    while (queue.length) {
      const url = queue.shift()!;
      if (seen.has(url)) continue;
      seen.add(url);
      const info = await moduleInfo(url);
      bytes += info.gz;
      queue.push(...info.imports);
    }
    if (bytes > heaviest.bytes) heaviest = { label, bytes };
    const kb = bytes / 1024;
    const s = { median: kb, min: kb, max: kb, p95: kb, n: 1 };
    const target = STATIC_PAGES.has(label) ? { op: "<=" as const, value: 0 } : { op: "<=" as const, value: 100 };
    console.log(`  ${label}: ${fmt(kb, 1)} KB gzipped JS (${seen.size} modules, inline ${fmt(inline / 1024, 1)} KB)`);
    rows.push(row({ group: "page weight", figure: `JS ${label}`, unit: "KB gz", stats: s, target }));
  }
  console.log(`heaviest page: ${heaviest.label}, ${fmt(heaviest.bytes / 1024, 1)} KB gzipped`);
  emit(rows);
});
