// `npm run db:migrate | db:seed | db:reset` against the private development database.
import { ensureNodeModules, fail } from "./lib/util.mjs";

const command = process.argv[2];
if (!["migrate", "seed", "reset"].includes(command)) fail("usage: node scripts/db.mjs migrate|seed|reset");
ensureNodeModules();
const { startDatabase } = await import("./lib/stack.mjs");
const { bin, run } = await import("./lib/util.mjs");
const { server, env } = await startDatabase("dev");
const code = await run(bin("tsx"), ["src/db/cli.ts", command, "--demo-year"], { env: { ...process.env, ...env } });
await server.stop();
process.exit(code);
