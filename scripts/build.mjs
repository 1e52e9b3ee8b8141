// Builds the Node entry points (API server, worker, local fakes, demo seed, migrations, analysis CLI
// and its benchmark) to JavaScript once, so nothing is transpiled when they start.
//
//   node scripts/build.mjs             build everything
//   node scripts/build.mjs --if-stale  build only when a source file is newer than the last build
//
// Each entry is bundled with esbuild into its workspace's git-ignored dist/ folder (same depth as
// src/, so paths relative to import.meta.url still resolve), with the workspace packages
// (@pendula/*) and the signal workspace's own dependencies (small pure-computation libraries)
// compiled in, and every other npm dependency left as an import resolved from node_modules.
// Source maps sit beside each output. The stamp lists, per output, every file its bundle read (from
// esbuild's metafile), so "stale" means exactly "one of those files changed since"; outputs are
// written through a rename, so a process starting during a build reads the old file or the new one.
import { existsSync, mkdirSync, readFileSync, renameSync, statSync, writeFileSync } from "node:fs";
import { dirname, join, relative, resolve } from "node:path";
import { fileURLToPath } from "node:url";

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), "..");
const STAMP = join(ROOT, "dist", "build-stamp.json");

/** Entry → output, both relative to the repository root. */
export const ENTRIES = [
  ["signal/src/cli.ts", "signal/dist/cli.js"],
  ["signal/bench/bench.ts", "signal/dist/bench.js"],
  ["ingest-server/src/server.ts", "ingest-server/dist/server.js"],
  ["ingest-server/src/worker.ts", "ingest-server/dist/worker.js"],
  // The upload parse threads' entry, found beside the bundled server (ingest-server/src/uploads/parse-pool.ts).
  ["ingest-server/src/uploads/parse-worker.ts", "ingest-server/dist/parse-worker.js"],
  ["ingest-server/src/dev/fakes.ts", "ingest-server/dist/fakes.js"],
  ["ingest-server/src/dev/seed-demo.ts", "ingest-server/dist/seed-demo.js"],
  ["db/src/migrate.ts", "db/dist/migrate.js"],
  ["ingest-server/src/prepare-database.ts", "ingest-server/dist/prepare-database.js"],
];

/** Files whose change alters every bundle although no bundle imports them. */
const ALWAYS_INPUTS = ["scripts/build.mjs", "package.json", "package-lock.json", "tsconfig.json"];

/**
 * True when the last build is missing or incomplete, or when any file that one of `outputs` was built
 * from (default: every entry) is newer than the build.
 */
export function isStale(outputs = ENTRIES.map(([, out]) => out)) {
  let stamp;
  try {
    stamp = JSON.parse(readFileSync(STAMP, "utf8"));
  } catch {
    return true;
  }
  const { builtMs, inputsByOutput } = stamp;
  if (typeof builtMs !== "number" || typeof inputsByOutput !== "object" || inputsByOutput === null) return true;
  const files = new Set(ALWAYS_INPUTS);
  for (const out of outputs) {
    if (!existsSync(join(ROOT, out)) || !Array.isArray(inputsByOutput[out])) return true;
    for (const rel of inputsByOutput[out]) files.add(rel);
  }
  for (const rel of files) {
    let mtimeMs;
    try {
      mtimeMs = statSync(join(ROOT, rel)).mtimeMs;
    } catch {
      return true; // an input was removed or renamed
    }
    if (mtimeMs > builtMs) return true;
  }
  return false;
}

/** Writes through a temporary file and a rename, so a process starting meanwhile never reads half a file. */
function writeAtomically(path, contents) {
  mkdirSync(dirname(path), { recursive: true });
  const tmp = `${path}.${process.pid}.tmp`;
  writeFileSync(tmp, contents);
  renameSync(tmp, path);
}

/**
 * The signal workspace's runtime dependencies (fili, fft.js, ml-matrix): CommonJS packages that
 * Node's ES module loader would pre-parse for their exports at every start (about 0.2 s of CPU for
 * the analysis CLI). Compiled into the bundles instead; the code run is the same files.
 */
function bundledDependencies() {
  return new Set(Object.keys(JSON.parse(readFileSync(join(ROOT, "signal/package.json"), "utf8")).dependencies ?? {}));
}

/** npm packages named by any workspace, except the bundled ones: imported at run time from node_modules. */
function npmDependencies() {
  const bundled = bundledDependencies();
  const names = new Set();
  for (const pkg of ["package.json", "signal/package.json", "db/package.json", "ingest-server/package.json"]) {
    const json = JSON.parse(readFileSync(join(ROOT, pkg), "utf8"));
    for (const field of ["dependencies", "devDependencies", "optionalDependencies", "peerDependencies"]) {
      for (const name of Object.keys(json[field] ?? {})) if (!name.startsWith("@pendula/") && !bundled.has(name)) names.add(name);
    }
  }
  return [...names].sort();
}

/** The esbuild options of one entry (also used by the test that compares built and source CLI). */
export function entryOptions(entry, outfile) {
  return {
    absWorkingDir: ROOT,
    entryPoints: [entry],
    outfile,
    bundle: true,
    platform: "node",
    format: "esm",
    target: "node20",
    sourcemap: "linked",
    sourcesContent: false,
    external: npmDependencies(),
    metafile: true,
    logLevel: "warning",
  };
}

export async function build() {
  const esbuild = await import("esbuild");
  // Taken before reading, so a file saved during the build counts as newer than the build.
  const startedMs = Date.now();
  const results = await Promise.all(ENTRIES.map(([entry, out]) => esbuild.build({ ...entryOptions(entry, out), write: false })));
  const inputsByOutput = {};
  const all = new Set();
  results.forEach((r, i) => {
    for (const file of r.outputFiles) writeAtomically(file.path, file.contents);
    const inputs = Object.keys(r.metafile.inputs).map((input) => relative(ROOT, resolve(ROOT, input))).sort();
    inputsByOutput[ENTRIES[i][1]] = inputs;
    for (const input of inputs) all.add(input);
  });
  writeAtomically(STAMP, JSON.stringify({ builtMs: startedMs, esbuild: esbuild.version, inputsByOutput }, null, 1) + "\n");
  return { entries: ENTRIES.length, inputs: all.size, seconds: (Date.now() - startedMs) / 1000 };
}

/** Builds everything when `outputs` (default: all) are stale; says so on stderr (stdout may be a JSON answer). */
export async function ensureBuilt(outputs) {
  if (!isStale(outputs)) return false;
  const r = await build();
  process.stderr.write(`[pendula] built ${r.entries} entry points from ${r.inputs} files in ${r.seconds.toFixed(1)} s\n`);
  return true;
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  if (process.argv.includes("--if-stale")) await ensureBuilt();
  else {
    const r = await build();
    process.stderr.write(`[pendula] built ${r.entries} entry points from ${r.inputs} files in ${r.seconds.toFixed(1)} s\n`);
  }
}
