// `node scripts/run-built.mjs <built file> [args…]`: rebuilds when a file that bundle was built from
// is newer than the build (scripts/build.mjs), then runs the built file in this same process, with
// process.argv as if it had been started directly (`node <built file> [args…]`). Used by the npm
// scripts so that `npm run analyze`, `npm run worker` and `npm run bench` never run a stale build
// nor transpile.
import { dirname, relative, resolve } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { ENTRIES, ensureBuilt } from "./build.mjs";

const [target, ...rest] = process.argv.slice(2);
if (!target) {
  process.stderr.write("usage: node scripts/run-built.mjs <built file> [args…]\n");
  process.exit(2);
}
const file = resolve(target);
const output = relative(resolve(dirname(fileURLToPath(import.meta.url)), ".."), file);
// Only this bundle's sources decide (an edit elsewhere does not hold up `npm run analyze`); a
// rebuild still builds every entry.
await ensureBuilt(ENTRIES.some(([, out]) => out === output) ? [output] : undefined);
process.argv = [process.argv[0], file, ...rest];
// Stack traces of the server and worker point into the TypeScript sources.
process.setSourceMapsEnabled(true);
await import(pathToFileURL(file).href);
