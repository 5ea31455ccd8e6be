// `npm start` (and `npm run dev` with --dev): sets everything up on a fresh clone and runs Decant.
import { resolve } from "node:path";
import { appServerCommand } from "./lib/app-server.mjs";
import { buildIsCurrent, sourceStamp, stampBuild } from "./lib/build-stamp.mjs";
import { ensureNodeModules, fail, log, portIsFree, ProcessGroup, run, bin, ROOT } from "./lib/util.mjs";

const dev = process.argv.includes("--dev");
// `npm run bench` times `npm start` on its own profile (data, ports) so that it never meets the demo data.
const profileName = process.env.DECANT_PROFILE || "dev";
if (!["dev", "bench"].includes(profileName)) fail(`DECANT_PROFILE must be dev or bench, got "${profileName}".`);
const outDir = process.env.DECANT_OUT_DIR || "dist";
const host = process.env.HOST || "127.0.0.1";
const port = Number(process.env.PORT || 4321);
if (!Number.isInteger(port) || port < 1 || port > 65535) fail(`PORT must be a port number (1–65535), got "${process.env.PORT}".`);

ensureNodeModules();
const { startDatabase, migrate, startFakes } = await import("./lib/stack.mjs");

if (!(await portIsFree(port, host))) fail(`Port ${port} on ${host} is taken; set PORT to a free port (e.g. PORT=4400 npm start).`);

const { server, env } = await startDatabase(profileName);
const group = new ProcessGroup();
let shuttingDown = false;
async function shutdown(code = 0) {
  if (shuttingDown) return;
  shuttingDown = true;
  log("Stopping…");
  await group.stopAll();
  await server.stop();
  log(`Stopped. Your data is kept in .data/${profileName}.`);
  process.exit(code);
}
process.on("SIGINT", () => shutdown(0));
process.on("SIGTERM", () => shutdown(0));
group.onCrash = () => shutdown(1);

try {
  await migrate(env, { seed: true, year: profileName === "dev" });
  await startFakes(group, env);
  const appEnv = { ...process.env, ...env, HOST: host, PORT: String(port), APP_ORIGIN: process.env.APP_ORIGIN ?? `http://${host}:${port}` };
  if (dev) {
    group.spawn("astro dev", bin("astro"), ["dev", "--host", host, "--port", String(port)], { env: appEnv });
  } else {
    // The stamp is taken before building, so a file changed during the build means a new build next time.
    const stamp = sourceStamp(ROOT);
    const builtDir = resolve(ROOT, outDir);
    if (buildIsCurrent(builtDir, stamp)) {
      log(`The app in ${outDir}/ was built from these very sources; serving it without building again.`);
    } else {
      log("Building the app…");
      if ((await run(bin("astro"), ["build"], { env: appEnv })) !== 0) throw new Error("astro build failed");
      stampBuild(builtDir, stamp);
    }
    // React's server renderer in its production build: the development build is several times slower.
    group.spawn("app server", ...appServerCommand(outDir), { env: { ...appEnv, NODE_ENV: "production" }, cwd: ROOT });
  }
  const url = `http://${host}:${port}`;
  log(`Decant is starting at ${url}`);
  log("Demo sign-ins (password decant-demo): tech@demo.test, manager@demo.test, safety@demo.test, client@demo.test, admin@demo.test");
  log("Press Ctrl-C to stop.");
} catch (error) {
  process.stderr.write(`decant: ${error instanceof Error ? error.message : error}\n`);
  await shutdown(1);
}
