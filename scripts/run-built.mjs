// `node scripts/run-built.mjs <built file> [args…]`: rebuilds when a source file is newer than the
// build (scripts/build.mjs), then runs the built file in this same process, with process.argv as if
// it had been started directly (`node <built file> [args…]`). Used by the npm scripts so that
// `npm run analyze`, `npm run worker` and `npm run bench` never run a stale build nor transpile.
import { resolve } from "node:path";
import { pathToFileURL } from "node:url";
import { ensureBuilt } from "./build.mjs";

const [target, ...rest] = process.argv.slice(2);
if (!target) {
  process.stderr.write("usage: node scripts/run-built.mjs <built file> [args…]\n");
  process.exit(2);
}
await ensureBuilt();
const file = resolve(target);
process.argv = [process.argv[0], file, ...rest];
// Stack traces of the server and worker point into the TypeScript sources.
process.setSourceMapsEnabled(true);
await import(pathToFileURL(file).href);
