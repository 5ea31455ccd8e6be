// The import rules of DEVELOPERS.md, read from the source: every import and re-export of every
// .ts, .tsx and .astro file under src/ (an .astro file's frontmatter), relative paths resolved.
// Type-only imports count as imports; only value imports (static or dynamic) carry a module into
// the code that runs, so only they count when a module is reached through others.
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join, relative, resolve } from "node:path";
import ts from "typescript";
import { afterAll, describe, expect, it } from "vitest";

interface Edge {
  /** The file it resolves to, relative to the source root, with "/" separators. */
  to: string;
  /** The line of the importing file it is on, and the path as written there. */
  line: number;
  specifier: string;
  typeOnly: boolean;
}
type Graph = Map<string, Edge[]>;

const SOURCE = /\.(ts|tsx|astro)$/;

function listFiles(root: string, dir = root): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) return listFiles(root, path);
    return SOURCE.test(name) ? [relative(root, path).split("\\").join("/")] : [];
  });
}

/** The code of a file, and the line it starts on: an .astro file's frontmatter (after its opening ---), every other file whole. */
function codeOf(path: string): { code: string; firstLine: number } {
  const text = readFileSync(path, "utf8");
  if (!path.endsWith(".astro")) return { code: text, firstLine: 1 };
  return { code: /^---\r?\n([\s\S]*?)\r?\n---/.exec(text)?.[1] ?? "", firstLine: 2 };
}

function importsOf(root: string, file: string, files: Set<string>): Edge[] {
  const path = join(root, file);
  const { code, firstLine } = codeOf(path);
  const source = ts.createSourceFile(
    path,
    code,
    ts.ScriptTarget.Latest,
    true,
    file.endsWith(".tsx") ? ts.ScriptKind.TSX : ts.ScriptKind.TS,
  );
  const found: { specifier: string; typeOnly: boolean; at: number }[] = [];
  const visit = (node: ts.Node) => {
    if (ts.isImportDeclaration(node) && ts.isStringLiteral(node.moduleSpecifier)) {
      const clause = node.importClause;
      const named = clause?.namedBindings && ts.isNamedImports(clause.namedBindings) ? clause.namedBindings.elements : undefined;
      // `import type { A }` and `import { type A, type B }` are erased; `import "./x"` and `import {}` are not.
      const typeOnly = Boolean(
        clause &&
          (clause.phaseModifier === ts.SyntaxKind.TypeKeyword ||
            (!clause.name && named && named.length > 0 && named.every((n) => n.isTypeOnly))),
      );
      found.push({ specifier: node.moduleSpecifier.text, typeOnly, at: node.getStart() });
    } else if (ts.isExportDeclaration(node) && node.moduleSpecifier && ts.isStringLiteral(node.moduleSpecifier)) {
      found.push({ specifier: node.moduleSpecifier.text, typeOnly: node.isTypeOnly, at: node.getStart() });
    } else if (ts.isCallExpression(node) && node.expression.kind === ts.SyntaxKind.ImportKeyword) {
      const [argument] = node.arguments;
      if (argument && ts.isStringLiteral(argument)) found.push({ specifier: argument.text, typeOnly: false, at: node.getStart() });
    } else if (ts.isImportTypeNode(node) && ts.isLiteralTypeNode(node.argument) && ts.isStringLiteral(node.argument.literal)) {
      found.push({ specifier: node.argument.literal.text, typeOnly: true, at: node.getStart() });
    }
    ts.forEachChild(node, visit);
  };
  visit(source);
  return found.flatMap(({ specifier, typeOnly, at }) => {
    if (!specifier.startsWith(".")) return []; // packages and astro: modules
    const base = relative(root, resolve(dirname(path), specifier.replace(/\?.*$/, "")))
      .split("\\")
      .join("/");
    const to = [base, `${base}.ts`, `${base}.tsx`, `${base}.astro`, `${base}/index.ts`].find((c) => files.has(c));
    if (!to) return []; // styles, fonts and other assets
    return [{ to, specifier, typeOnly, line: source.getLineAndCharacterOfPosition(at).line + firstLine }];
  });
}

/** The import graph of every source file under `root`. */
function importGraph(root: string): Graph {
  const files = listFiles(root);
  const known = new Set(files);
  return new Map(files.map((f) => [f, importsOf(root, f, known)]));
}

const show = (from: string, edge: Edge) => `${from}:${edge.line} imports "${edge.specifier}"${edge.typeOnly ? " (type only)" : ""}`;

/** The value imports from `start` to the first module that `target` accepts, as "a:1 imports 'b' → b:3 imports 'c'", or null. */
function valuePath(graph: Graph, start: string, target: (file: string) => boolean): string | null {
  const cameBy = new Map<string, { from: string; edge: Edge } | null>([[start, null]]);
  const queue = [start];
  while (queue.length) {
    const file = queue.shift()!;
    for (const edge of graph.get(file) ?? []) {
      if (edge.typeOnly || cameBy.has(edge.to)) continue;
      cameBy.set(edge.to, { from: file, edge });
      if (target(edge.to)) {
        const steps: string[] = [];
        for (let at = cameBy.get(edge.to); at; at = cameBy.get(at.from)) steps.unshift(show(at.from, at.edge));
        return steps.join(" → ");
      }
      queue.push(edge.to);
    }
  }
  return null;
}

interface Rule {
  name: string;
  /** The files the rule is about. */
  from: (file: string) => boolean;
  /** What they must not import, directly (any import) or through other modules (value imports). */
  forbidden: (file: string) => boolean;
}

const under = (folder: string) => (file: string) => file.startsWith(folder);
const RULES: Rule[] = [
  { name: "components never import lib/server", from: under("components/"), forbidden: under("lib/server/") },
  {
    name: "islands never import the chem index (it carries the reagent catalogue): import lib/chem/<module>",
    from: (f) => f.startsWith("components/") && f.endsWith(".tsx"),
    forbidden: (f) => f === "lib/chem/index.ts",
  },
  { name: "lib/chem never imports lib/server", from: under("lib/chem/"), forbidden: under("lib/server/") },
  { name: "lib/schemas never imports lib/server", from: under("lib/schemas/"), forbidden: under("lib/server/") },
];

/** Every breach of the rules, one line each naming the file and the import. */
function ruleBreaches(graph: Graph): string[] {
  const out: string[] = [];
  for (const rule of RULES)
    for (const [file, edges] of graph) {
      if (!rule.from(file)) continue;
      const direct = edges.filter((e) => rule.forbidden(e.to));
      for (const edge of direct) out.push(`${rule.name}: ${show(file, edge)}`);
      if (direct.length) continue;
      const path = valuePath(graph, file, rule.forbidden);
      if (path) out.push(`${rule.name}: ${path}`);
    }
  return out;
}

/** Every import cycle (a strongly connected group of files), each as one loop "a → b → a" with its lines. */
function importCycles(graph: Graph): { files: string[]; loop: string }[] {
  let counter = 0;
  const index = new Map<string, number>();
  const low = new Map<string, number>();
  const stack: string[] = [];
  const onStack = new Set<string>();
  const groups: string[][] = [];
  // Tarjan's algorithm, iterative so a long chain cannot overflow the stack.
  for (const root of graph.keys()) {
    if (index.has(root)) continue;
    const work: { file: string; next: number }[] = [{ file: root, next: 0 }];
    index.set(root, counter);
    low.set(root, counter++);
    stack.push(root);
    onStack.add(root);
    while (work.length) {
      const top = work[work.length - 1]!;
      const edges = graph.get(top.file) ?? [];
      if (top.next < edges.length) {
        const to = edges[top.next++]!.to;
        if (!index.has(to)) {
          index.set(to, counter);
          low.set(to, counter++);
          stack.push(to);
          onStack.add(to);
          work.push({ file: to, next: 0 });
        } else if (onStack.has(to)) low.set(top.file, Math.min(low.get(top.file)!, index.get(to)!));
        continue;
      }
      work.pop();
      if (work.length) {
        const parent = work[work.length - 1]!.file;
        low.set(parent, Math.min(low.get(parent)!, low.get(top.file)!));
      }
      if (low.get(top.file) === index.get(top.file)) {
        const group: string[] = [];
        let member: string;
        do {
          member = stack.pop()!;
          onStack.delete(member);
          group.push(member);
        } while (member !== top.file);
        if (group.length > 1) groups.push(group.sort());
      }
    }
  }
  return groups.map((files) => {
    // One loop through the group: the shortest way from its first file back to itself.
    const inGroup = new Set(files);
    const start = files[0]!;
    const cameBy = new Map<string, { from: string; edge: Edge }>();
    const queue = [start];
    search: while (queue.length) {
      const file = queue.shift()!;
      for (const edge of graph.get(file) ?? []) {
        if (!inGroup.has(edge.to) || cameBy.has(edge.to)) continue;
        cameBy.set(edge.to, { from: file, edge });
        if (edge.to === start) break search;
        queue.push(edge.to);
      }
    }
    const steps: string[] = [];
    let at = cameBy.get(start);
    do {
      steps.unshift(show(at!.from, at!.edge));
      at = at!.from === start ? undefined : cameBy.get(at!.from);
    } while (at);
    return { files, loop: steps.join(" → ") };
  });
}

/**
 * Cycles known and scheduled to go, each with why it is still here. The test fails when one of
 * them is gone, so that the entry is deleted with the cycle.
 */
const KNOWN_CYCLES: { files: string[]; why: string }[] = [];

const SRC = resolve("src");

describe("import rules of src/", () => {
  const graph = importGraph(SRC);

  it("reads the graph: every layer is there", () => {
    const files = [...graph.keys()];
    for (const folder of ["components/", "lib/chem/", "lib/schemas/", "lib/server/", "pages/"])
      expect(files.filter((f) => f.startsWith(folder)).length, folder).toBeGreaterThan(3);
    expect(
      graph.get("pages/home.astro")?.map((e) => e.to),
      "an .astro file's frontmatter imports",
    ).toContain("layouts/AppLayout.astro");
  });

  it("components, islands, lib/chem and lib/schemas import only what they may", () => {
    expect(ruleBreaches(graph)).toEqual([]);
  });

  it("no two modules import each other, and there is no longer cycle either", () => {
    const known = new Set(KNOWN_CYCLES.map((c) => c.files.join(" ")));
    const cycles = importCycles(graph);
    expect(cycles.filter((c) => !known.has(c.files.join(" "))).map((c) => c.loop)).toEqual([]);
    const found = new Set(cycles.map((c) => c.files.join(" ")));
    expect(
      KNOWN_CYCLES.filter((c) => !found.has(c.files.join(" "))).map((c) => `no longer a cycle, delete its entry: ${c.files.join(", ")}`),
    ).toEqual([]);
  });
});

describe("the checks themselves, on a planted tree", () => {
  const root = mkdtempSync(join(tmpdir(), "decant-import-rules-"));
  afterAll(() => rmSync(root, { recursive: true, force: true }));
  const write = (file: string, text: string) => {
    mkdirSync(dirname(join(root, file)), { recursive: true });
    writeFileSync(join(root, file), text);
  };
  write("lib/server/db.ts", "export const db = 1;\n");
  write("lib/server/services/users.ts", 'import { db } from "../db";\nexport interface UserRow { id: number }\nexport const n = db;\n');
  write("lib/chem/index.ts", 'export * from "./reagents";\n');
  write("lib/chem/reagents.ts", "export const reagents = [];\n");
  write("lib/chem/units.ts", 'import type { n } from "../server/services/users";\nexport type N = typeof n;\n');
  write("lib/schemas/a.ts", 'import { b } from "./b";\nexport const a = b;\n');
  write("lib/schemas/b.ts", 'import { a } from "./a";\nexport const b = 1; void a;\n');
  write("lib/labels/catalogue.ts", 'import { reagents } from "../chem";\nexport const all = reagents;\n');
  write(
    "components/users/List.tsx",
    'import type { UserRow } from "../../lib/server/services/users";\nexport const rows: UserRow[] = [];\n',
  );
  write("components/labels/Picker.tsx", 'const load = () => import("../../lib/labels/catalogue");\nexport default load;\n');
  write("components/labels/Only.tsx", 'import type { Reagent } from "../../lib/labels/catalogue";\nexport type R = Reagent;\n');
  write("components/shell/Page.astro", '---\nimport { db } from "../../lib/server/db";\n---\n<p>{db}</p>\n');
  write("lib/x/p.ts", 'import "./q";\n');
  write("lib/x/q.ts", 'import "./r";\n');
  write("lib/x/r.ts", 'import "./p";\n');
  const graph = importGraph(root);

  it("names each planted breach with its file, line and import, and passes the harmless ones", () => {
    expect(ruleBreaches(graph).sort()).toEqual(
      [
        'components never import lib/server: components/users/List.tsx:1 imports "../../lib/server/services/users" (type only)',
        'components never import lib/server: components/shell/Page.astro:2 imports "../../lib/server/db"',
        'islands never import the chem index (it carries the reagent catalogue): import lib/chem/<module>: components/labels/Picker.tsx:1 imports "../../lib/labels/catalogue" → lib/labels/catalogue.ts:1 imports "../chem"',
        'lib/chem never imports lib/server: lib/chem/units.ts:1 imports "../server/services/users" (type only)',
      ].sort(),
    );
  });

  it("finds two modules importing each other and a longer loop", () => {
    expect(
      importCycles(graph)
        .map((c) => c.loop)
        .sort(),
    ).toEqual(
      [
        'lib/schemas/a.ts:1 imports "./b" → lib/schemas/b.ts:1 imports "./a"',
        'lib/x/p.ts:1 imports "./q" → lib/x/q.ts:1 imports "./r" → lib/x/r.ts:1 imports "./p"',
      ].sort(),
    );
  });
});
