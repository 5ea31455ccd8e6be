// Serves the built app: `node scripts/serve.mjs [outDir]` (dist by default), on HOST:PORT.
//
// This is @astrojs/node's standalone handler (static files, then the app) in a listener of our own,
// so that the client address is decided before Astro reads it: Astro would believe any
// X-Forwarded-For header, which would let anyone dodge the per-address sign-in limit. The listener
// rewrites that header to the one address that can be trusted (scripts/lib/client-address.mjs).
// Node built-ins only, like every script here.
import { createServer } from "node:http";
import { resolve } from "node:path";
import { pathToFileURL } from "node:url";
import { clientAddress, trustedProxyHops } from "./lib/client-address.mjs";

const outDir = resolve(process.argv[2] ?? "dist");
const host = process.env.HOST ?? "127.0.0.1";
const port = Number(process.env.PORT ?? 4321);
let hops;
try {
  hops = trustedProxyHops(process.env.TRUSTED_PROXY_HOPS);
} catch (error) {
  process.stderr.write(`decant: ${error.message}\n`);
  process.exit(1);
}

// The adapter would otherwise start a server of its own when the entry is imported.
process.env.ASTRO_NODE_AUTOSTART = "disabled";
const { handler } = await import(pathToFileURL(resolve(outDir, "server/entry.mjs")).href);

const server = createServer((req, res) => {
  req.headers["x-forwarded-for"] = clientAddress(req.headers["x-forwarded-for"], req.socket.remoteAddress, hops);
  handler(req, res);
});
server.on("error", (error) => {
  process.stderr.write(`decant: the app server cannot listen on ${host}:${port}: ${error.message}\n`);
  process.exit(1);
});
server.listen(port, host, () =>
  process.stdout.write(
    `decant: app server listening on http://${host}:${port}${hops ? ` (trusting ${hops} proxy hop${hops === 1 ? "" : "s"})` : ""}\n`,
  ),
);
for (const signal of ["SIGINT", "SIGTERM"]) process.once(signal, () => server.close(() => process.exit(0)).closeAllConnections());
