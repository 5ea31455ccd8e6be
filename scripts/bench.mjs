// `npm run bench`: runs every benchmark under tests/bench (never part of `npm test`).
import { readdirSync } from "node:fs";
import { join } from "node:path";
import { bin, ensureNodeModules, log, ROOT, run } from "./lib/util.mjs";

ensureNodeModules();
const only = process.argv.slice(2);
const files = readdirSync(join(ROOT, "tests/bench"))
  .filter((f) => /\.bench\.(ts|mjs)$/.test(f))
  .filter((f) => only.length === 0 || only.some((o) => f.includes(o)))
  .sort();
let failed = 0;
for (const file of files) {
  log(`bench: ${file}`);
  if ((await run(bin("tsx"), [join("tests/bench", file)])) !== 0) failed++;
}
process.exit(failed ? 1 : 0);
