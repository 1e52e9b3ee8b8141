import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { build } from "esbuild";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

// The CLI that `npm run analyze` runs is bundled by scripts/build.mjs. Bundling must not change a
// single output: the bundle (built here with the same options, into a folder of its own) and the
// TypeScript source run under tsx must print byte-identical JSON on the shared real recordings
// (stroke treadmill walks: Ensink et al., Sensors 2024, 24:710, MIT licence; healthy adults' foot
// walks: Voisard et al., IPOL 2023), read in place and never copied into the repository.

const repoRoot = fileURLToPath(new URL("../../../", import.meta.url));
const sharedData = join(repoRoot, "..", "shared", "data");
const available = existsSync(join(sharedData, "stroke-treadmill")) || existsSync(join(sharedData, "open-walks"));
const tsx = join(repoRoot, "node_modules", ".bin", "tsx");
const sourceCli = join(repoRoot, "signal", "src", "cli.ts");
// Inside the repository so the bundle's npm imports resolve from node_modules as in production.
const outDir = join(repoRoot, "signal", "dist", `.built-cli-test-${process.pid}`);
const builtCli = join(outDir, "cli.js");

interface Trial {
  name: string;
  files: string[];
  heightCm: number | null;
}

function trials(): Trial[] {
  const out: Trial[] = [];
  for (const set of ["stroke-treadmill", "open-walks"]) {
    const dir = join(sharedData, set);
    if (!existsSync(dir)) continue;
    for (const trial of readdirSync(dir).sort()) {
      const folder = join(dir, trial);
      if (!existsSync(join(folder, "reference.json"))) continue;
      const files = readdirSync(folder).filter((f) => f.endsWith(".csv")).sort().map((f) => join(folder, f));
      const subject = (JSON.parse(readFileSync(join(folder, "reference.json"), "utf8")) as { subject?: { height_cm?: number } }).subject;
      out.push({ name: `${set}/${trial}`, files, heightCm: subject?.height_cm ?? null });
    }
  }
  return out;
}

const run = (command: string, args: string[]) => spawnSync(command, args, { encoding: "utf8", timeout: 120_000, maxBuffer: 256 << 20 });

describe.skipIf(!available)("built CLI against the source CLI on the shared recordings", () => {
  beforeAll(async () => {
    mkdirSync(outDir, { recursive: true });
    // @ts-expect-error -- a plain ES module without types; entryOptions() is what `npm run build:node` uses.
    const { entryOptions } = (await import("../../../scripts/build.mjs")) as { entryOptions: (entry: string, outfile: string) => Parameters<typeof build>[0] };
    await build(entryOptions("signal/src/cli.ts", builtCli));
  }, 120_000);
  afterAll(() => rmSync(outDir, { recursive: true, force: true }));

  const all = available ? trials() : [];
  it("finds trials to compare", () => {
    expect(all.length).toBeGreaterThan(0);
  });

  it.each(all.map((t) => [t.name, t] as const))("%s: byte-identical JSON", (_name, trial) => {
    const args = [...trial.files, "--json", ...(trial.heightCm === null ? [] : ["--height-cm", String(trial.heightCm)])];
    const built = run(process.execPath, [builtCli, ...args]);
    const source = run(tsx, [sourceCli, ...args]);
    expect(built.stderr).toBe(source.stderr);
    expect(source.status).toBe(0);
    expect(built.status).toBe(0);
    expect(JSON.parse(built.stdout).events).toBeDefined();
    expect(built.stdout).toBe(source.stdout);
  }, 240_000);

  it("refuses a bad file with the same exit code and message", () => {
    const bad = [join(sharedData, "open-walks", "README.md")];
    const built = run(process.execPath, [builtCli, ...bad, "--json"]);
    const source = run(tsx, [sourceCli, ...bad, "--json"]);
    expect(built.status).toBe(2);
    expect(source.status).toBe(2);
    expect(built.stderr).toBe(source.stderr);
    expect(built.stdout).toBe("");
  }, 240_000);
});
