// Prints the gzip size of the JavaScript a browser loads before the portal first renders (the
// entry chunk and the chunks index.html preloads), and of every other chunk, lazy ones and the
// pre-check's Web Worker included. Measured on a fresh `vite build` into a temporary folder, or on
// an existing build folder given as the first argument.
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, readdirSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join, relative } from "node:path";
import { fileURLToPath } from "node:url";
import { gzipSync } from "node:zlib";

const portal = fileURLToPath(new URL("..", import.meta.url));
let dist = process.argv[2];
let temporary = null;
if (!dist) {
  temporary = mkdtempSync(join(tmpdir(), "pendula-portal-size-"));
  dist = temporary;
  const build = spawnSync("npx", ["vite", "build", "--outDir", dist, "--emptyOutDir", "--logLevel", "warn"], { cwd: portal, stdio: "inherit" });
  if (build.status !== 0) process.exit(build.status ?? 1);
}

const kB = (n) => (n / 1000).toFixed(1);
const gz = (file) => gzipSync(readFileSync(file), { level: 9 }).length;
const html = readFileSync(join(dist, "index.html"), "utf8");
const listed = [...html.matchAll(/<(?:script[^>]*type="module"[^>]*src|link[^>]*rel="modulepreload"[^>]*href)="\/?([^"]+\.js)"/g)].map((m) => m[1]);

// index.html's preload list is Vite's own account; the figure should not rest on it alone. Follow
// the static imports (`import … from "./x.js"`, `import "./x.js"`, `export … from`) of every listed
// chunk: the browser must fetch those before the entry runs. `import("./x.js")` is on demand.
const staticImport = /(?:\bimport|\bexport)\s*(?:[\w$*{}\s,]*?\s*from\s*)?["'](\.{1,2}\/[^"']+\.js)["']/g;
const initial = [...listed];
for (let i = 0; i < initial.length; i++) {
  const text = readFileSync(join(dist, initial[i]), "utf8");
  for (const m of text.matchAll(staticImport)) {
    const target = join(dirname(initial[i]), m[1]);
    if (!initial.includes(target)) initial.push(target);
  }
}
const unlisted = initial.filter((f) => !listed.includes(f));

const all = [];
const walk = (dir) => {
  for (const name of readdirSync(dir)) {
    const p = join(dir, name);
    if (statSync(p).isDirectory()) walk(p);
    else if (name.endsWith(".js")) all.push(relative(dist, p));
  }
};
walk(dist);

let initialGz = 0;
console.log("initial JavaScript (loaded before the first render):");
for (const f of initial) {
  const size = gz(join(dist, f));
  initialGz += size;
  console.log(`  ${f}: ${kB(size)} kB gzip (${kB(statSync(join(dist, f)).size)} kB raw)`);
}
console.log(`  total: ${kB(initialGz)} kB gzip (target < 150 kB)`);
if (unlisted.length) console.log(`  (statically imported but not preloaded by index.html, counted anyway: ${unlisted.join(", ")})`);
console.log("other chunks (loaded on demand):");
for (const f of all.filter((f) => !initial.includes(f)).sort()) {
  const text = readFileSync(join(dist, f), "utf8");
  // The pre-check worker is the chunk that holds the analysis' pipeline words.
  const note = /worker/i.test(f) ? " (Web Worker)" : text.includes("no recordings to analyse") ? " (holds analyze())" : "";
  console.log(`  ${f}: ${kB(gz(join(dist, f)))} kB gzip${note}`);
}
const leaked = initial.filter((f) => readFileSync(join(dist, f), "utf8").includes("no recordings to analyse"));
console.log(leaked.length ? `analyze() is in the initial JavaScript: ${leaked.join(", ")}` : "analyze() is not in the initial JavaScript.");
if (temporary) rmSync(temporary, { recursive: true, force: true });
