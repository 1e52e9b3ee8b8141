import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, describe, expect, it } from "vitest";
import { parseCliArgs, UsageError } from "../cli-args";
import { synthesizeSession } from "../synth";

const repoRoot = fileURLToPath(new URL("../../../", import.meta.url));
const tsx = join(repoRoot, "node_modules", ".bin", "tsx");
const cli = join(repoRoot, "signal", "src", "cli.ts");
const run = (args: string[]) => spawnSync(tsx, [cli, ...args], { encoding: "utf8", timeout: 60_000 });

describe("parseCliArgs(argv)", () => {
  it("reads files, --json and --height-cm in either spelling", () => {
    expect(parseCliArgs(["a.csv", "--json", "--height-cm", "172.5", "b.csv"])).toEqual({ files: ["a.csv", "b.csv"], json: true, heightCm: 172.5 });
    expect(parseCliArgs(["--height-cm=100", "a.csv"])).toEqual({ files: ["a.csv"], json: false, heightCm: 100 });
    expect(parseCliArgs(["a.csv"])).toEqual({ files: ["a.csv"], json: false });
  });
  it.each([
    [["a.csv", "--height-cm", "abc"], /not a number/],
    [["a.csv", "--height-cm", "1e2"], /not a number/],
    [["a.csv", "--height-cm", "-170"], /not a number/],
    [["a.csv", "--height-cm"], /needs a value/],
    [["a.csv", "--height-cm", "99.9"], /outside 100–230 cm/],
    [["a.csv", "--height-cm=231"], /outside 100–230 cm/],
    [["a.csv", "--height-cm", "170", "--height-cm", "171"], /twice/],
    [["a.csv", "--speed"], /unknown option --speed/],
    [["--height-cm", "170"], /usage/],
  ])("refuses %j with a one-line reason", (argv, message) => {
    expect(() => parseCliArgs(argv)).toThrow(UsageError);
    expect(() => parseCliArgs(argv)).toThrow(message);
  });
});

describe("analyze CLI and --height-cm", () => {
  const dir = mkdtempSync(join(tmpdir(), "pendula-cli-"));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  const session = synthesizeSession({ seed: 5, durationS: 60, placements: ["left_shank", "right_shank"] });
  const paths = session.files.map((f) => {
    const p = join(dir, f.fileName);
    writeFileSync(p, f.text);
    return p;
  });

  it("exits 2 with one line on stderr for a height outside 100–230 cm, before reading any file", { timeout: 60_000 }, () => {
    const r = run([join(dir, "missing.csv"), "--height-cm", "250"]);
    expect(r.status).toBe(2);
    expect(r.stderr.trim().split("\n")).toHaveLength(1);
    expect(r.stderr).toMatch(/--height-cm: 250 is outside 100–230 cm/);
    expect(r.stdout).toBe("");
  });

  it("passes the height to the analysis: shank-only speed needs it", { timeout: 60_000 }, () => {
    const without = run([...paths, "--json"]);
    expect(without.status).toBe(0);
    const a = JSON.parse(without.stdout);
    expect(a.metrics.walkingSpeedMPerS).toBeNull();
    expect(a.metrics.walkingSpeedReason).toMatch(/height not recorded/);
    const withHeight = run([...paths, "--json", "--height-cm", "172"]);
    expect(withHeight.status).toBe(0);
    const b = JSON.parse(withHeight.stdout);
    expect(b.metrics.walkingSpeedReason === null || typeof b.metrics.walkingSpeedReason === "string").toBe(true);
    expect(b.metrics.walkingSpeedReason ?? "").not.toMatch(/height not recorded/);
  });

  it("ends quietly with exit 0 when the reader closes the pipe before the answer is written", { timeout: 60_000 }, () => {
    // `true` exits without reading, so the CLI's write meets a closed pipe (EPIPE); pipefail makes
    // the pipeline's status the CLI's own.
    const quoted = [tsx, cli, ...paths, "--json"].map((a) => `'${a}'`).join(" ");
    const r = spawnSync("bash", ["-c", `set -o pipefail; ${quoted} | true`], { encoding: "utf8", timeout: 60_000 });
    expect(r.stderr).toBe("");
    expect(r.status).toBe(0);
  });
});
