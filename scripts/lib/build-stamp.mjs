// Whether the built app in an output folder was built from the sources as they are now, so that
// `npm start` on an unchanged checkout serves at once instead of spending half a minute building.
import { createHash } from "node:crypto";
import { existsSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { join, relative } from "node:path";

/** What a build reads: the sources, static files, the configuration and the exact dependencies. */
const INPUTS = ["src", "public", "astro.config.mjs", "tsconfig.json", "package-lock.json"];
const STAMP_FILE = ".decant-build-stamp";

function* files(path) {
  if (!existsSync(path)) return;
  let entries;
  try {
    entries = readdirSync(path, { withFileTypes: true });
  } catch {
    yield path; // a file
    return;
  }
  for (const entry of entries.sort((a, b) => a.name.localeCompare(b.name))) {
    const child = join(path, entry.name);
    if (entry.isDirectory()) yield* files(child);
    else yield child;
  }
}

/** A digest of every input file's path and content, and of the Node version that builds. */
export function sourceStamp(root) {
  const hash = createHash("sha256").update(process.version);
  for (const input of INPUTS) {
    for (const file of files(join(root, input))) hash.update(relative(root, file)).update("\0").update(readFileSync(file)).update("\0");
  }
  return hash.digest("hex");
}

/** True when `outDir` holds a complete build stamped with `stamp`. */
export function buildIsCurrent(outDir, stamp) {
  const stampFile = join(outDir, STAMP_FILE);
  return existsSync(join(outDir, "server", "entry.mjs")) && existsSync(stampFile) && readFileSync(stampFile, "utf8") === stamp;
}

/** Records that `outDir` was built from the sources with this stamp (taken before the build began). */
export function stampBuild(outDir, stamp) {
  writeFileSync(join(outDir, STAMP_FILE), stamp);
}
