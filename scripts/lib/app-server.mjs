// How the built app is launched, in one place for npm start, npm test, the bench and the tests
// that start instances of their own.
import { join, resolve } from "node:path";
import { ROOT } from "./util.mjs";

/**
 * V8 collects its old generation once it has grown by this factor over what survived the last full
 * collection (the default lets it grow several-fold under a burst of allocation). 1.2 keeps a
 * 50,000-row import near 400 MB instead of 650–750 MB, for about 5–10 % more time in the collector.
 */
const HEAP_GROWING_PERCENT = 20;

/**
 * The command and arguments that serve the app built into `outDir` (see scripts/serve.mjs).
 * @param {string} outDir
 * @returns {[string, string[]]}
 */
export function appServerCommand(outDir) {
  return [process.execPath, [`--heap-growing-percent=${HEAP_GROWING_PERCENT}`, join(ROOT, "scripts/serve.mjs"), resolve(ROOT, outDir)]];
}
