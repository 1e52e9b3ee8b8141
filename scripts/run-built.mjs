// `node scripts/run-built.mjs [--source-maps] <built file> [args…]`: rebuilds when a file that bundle was built from
// is newer than the build (scripts/build.mjs), then runs the built file in this same process, with
// process.argv as if it had been started directly (`node <built file> [args…]`). Used by the npm
// scripts so that `npm run analyze`, `npm run worker` and `npm run bench` never run a stale build
// nor transpile.
import { dirname, relative, resolve } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { ENTRIES, ensureBuilt } from "./build.mjs";

const args = process.argv.slice(2);
// Source maps are for long-running programs (the worker), whose stack traces should point into the
// TypeScript sources. A batch run such as `npm run analyze` reports errors as messages, and
// loading the bundle with source maps enabled cost it about 5 % of its whole time (30-minute session).
const sourceMaps = args[0] === "--source-maps";
if (sourceMaps) args.shift();
const [target, ...rest] = args;
if (!target) {
  process.stderr.write("usage: node scripts/run-built.mjs [--source-maps] <built file> [args…]\n");
  process.exit(2);
}
const file = resolve(target);
const output = relative(resolve(dirname(fileURLToPath(import.meta.url)), ".."), file);
// Only this bundle's sources decide (an edit elsewhere does not hold up `npm run analyze`); a
// rebuild still builds every entry.
await ensureBuilt(ENTRIES.some(([, out]) => out === output) ? [output] : undefined);
process.argv = [process.argv[0], file, ...rest];
if (sourceMaps) process.setSourceMapsEnabled(true);
await import(pathToFileURL(file).href);
