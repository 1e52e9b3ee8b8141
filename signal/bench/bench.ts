// Parse and analysis time and peak memory for a 6-minute and a 30-minute four-sensor 200 Hz
// session from the project's synthetic generator. Run from the repository root: `npm run bench`
// (it runs the built bundle, signal/dist/bench.js). Each size is generated in one child process and
// measured in a fresh one (so the generator's memory is not counted), pinned to one CPU with
// `taskset` when it exists. Then, on the same files, the built CLI runs as a whole process,
// alternated with a NumPy/SciPy script doing the same steps (numpy_pipeline.py beside this file),
// and the median ratio of their times is printed. Figures are printed, never asserted; the
// machine may be shared, so the load average is printed too.
import { spawnSync } from "node:child_process";
import { closeSync, existsSync, mkdtempSync, openSync, readdirSync, readFileSync, readSync, rmSync, statSync, writeFileSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";
import { analyze } from "../src/analyze";
import { readSensorCsv } from "../src/io/read-sensor-csv";
import { readSensorCsvBytes } from "../src/io/read-sensor-csv-bytes";
import { readSensorCsvChunks } from "../src/io/read-sensor-csv-chunks";
import { synthesizeSession, type SynthOptions } from "../src/synth";
import type { SensorRecording } from "../src/types";
import { describeTsvThroughput, measureTsvThroughput, type TsvThroughput } from "./tsv-throughput";

const SIZES_MIN = [6, 30];
const TARGETS_30_MIN = { analysisS: 1, endToEndS: 2, peakMb: 300, wholeProcessRatio: 0.33 };
const SELF = fileURLToPath(import.meta.url);
/** The same paths whether this runs as signal/dist/bench.js or from source (signal/bench/bench.ts). */
const BUILT_CLI = resolve(dirname(SELF), "..", "dist", "cli.js");
const NUMPY_SCRIPT = resolve(dirname(SELF), "..", "bench", "numpy_pipeline.py");
const REPO_ROOT = resolve(dirname(SELF), "..", "..");
/** Runs of each program in the whole-process comparison (alternated). */
const WHOLE_PROCESS_RUNS = 5;

/** A home walking test: 180° turns every 20 s, a 20 s rest every 5 minutes, 1:1 arm swing. */
function scenario(minutes: number): SynthOptions {
  const durationS = minutes * 60;
  const turns: NonNullable<SynthOptions["turns"]> = [];
  const standing: NonNullable<SynthOptions["standing"]> = [];
  for (let t = 20; t < durationS - 10; t += 20) {
    if (t % 300 === 0) standing.push({ startS: t, durationS: 20 });
    else turns.push({ startS: t, durationS: 2, angleDeg: 180 });
  }
  return { seed: 2026, durationS, sampleRateHz: 200, misalignmentDeg: 12, timestampJitterS: 0.0005, turns, standing };
}

function mb(bytes: number): string {
  return (bytes / 1048576).toFixed(0);
}

function generate(minutes: number, dir: string): void {
  const t0 = performance.now();
  const session = synthesizeSession(scenario(minutes));
  for (const f of session.files) writeFileSync(join(dir, f.fileName), f.text);
  const rows = session.files.reduce((s, f) => s + f.rowCount, 0);
  process.stdout.write(JSON.stringify({ generateS: (performance.now() - t0) / 1000, rows }));
}

/** CPU seconds (user + system) of this process: steadier than wall time on a shared machine. */
function cpuS(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
}

function measure(dir: string): void {
  const baselineRss = process.memoryUsage().rss;
  const names = readdirSync(dir).filter((n) => n.endsWith(".csv")).sort();
  const c0 = cpuS();
  const t0 = performance.now();
  const texts = names.map((n) => readFileSync(join(dir, n), "utf8"));
  const t1 = performance.now();
  const c1 = cpuS();
  let recordings: SensorRecording[] | null = texts.map((text, i) => readSensorCsv(text, names[i]!));
  texts.length = 0;
  const t2 = performance.now();
  const c2 = cpuS();
  const analysis = analyze(recordings);
  const t3 = performance.now();
  const c3 = cpuS();
  const afterAnalysis = process.memoryUsage();
  const peakRssBytes = process.resourceUsage().maxRSS * 1024;
  // A second run on warm code, for information only.
  const t4 = performance.now();
  analyze(recordings);
  const warmS = (performance.now() - t4) / 1000;
  recordings = null;
  // Parse throughput of the same files read as bytes (after the figures above, so it changes none
  // of them): first run on cold code, then the best of three warm runs.
  const buffers = names.map((n) => readFileSync(join(dir, n)));
  const csvBytes = buffers.reduce((s, b) => s + b.length, 0);
  const parseBytes = (): number => {
    const c = cpuS();
    for (let i = 0; i < buffers.length; i++) readSensorCsvBytes(buffers[i]!, names[i]!);
    return cpuS() - c;
  };
  const bytesParseCpuS = parseBytes();
  const bytesParseWarmCpuS = Math.min(parseBytes(), parseBytes(), parseBytes());
  // Reading and parsing as the CLI does, in 1 MiB chunks through one reused window (the files are
  // in the page cache by now, as they are for the CLI after the generator wrote them).
  const readChunked = (): number => {
    const c = cpuS();
    for (const n of names) {
      const path = join(dir, n);
      const fd = openSync(path, "r");
      try {
        readSensorCsvChunks({ size: statSync(path).size, readAt: (into, offset, length, position) => readSync(fd, into, offset, length, position) }, n);
      } finally {
        closeSync(fd);
      }
    }
    return cpuS() - c;
  };
  const chunkedReadParseCpuS = readChunked();
  const chunkedReadParseWarmCpuS = Math.min(readChunked(), readChunked(), readChunked());
  // The same recordings as one BIDS Motion set (last: it changes none of the figures above).
  const tsv = measureTsvThroughput(buffers.map((b, i) => readSensorCsvBytes(b, names[i]!)));
  process.stdout.write(
    JSON.stringify({
      files: names.length,
      readS: (t1 - t0) / 1000,
      parseS: (t2 - t1) / 1000,
      analysisS: (t3 - t2) / 1000,
      endToEndS: (t3 - t0) / 1000,
      readCpuS: c1 - c0,
      parseCpuS: c2 - c1,
      analysisCpuS: c3 - c2,
      endToEndCpuS: c3 - c0,
      warmAnalysisS: warmS,
      peakRssBytes,
      baselineRssBytes: baselineRss,
      heapUsedAfterBytes: afterAnalysis.heapUsed,
      strides: analysis.strides.length,
      csvBytes,
      bytesParseCpuS,
      bytesParseWarmCpuS,
      chunkedReadParseCpuS,
      chunkedReadParseWarmCpuS,
      ...tsv,
      cadence: analysis.metrics.cadenceStepsPerMin,
    }),
  );
}

function runChild(args: string[]): Record<string, number> {
  const node = [...process.execArgv, SELF, ...args];
  const pinned = spawnSync("taskset", ["-c", "0", process.execPath, ...node], { encoding: "utf8", maxBuffer: 1 << 20 });
  const result = pinned.error ? spawnSync(process.execPath, node, { encoding: "utf8", maxBuffer: 1 << 20 }) : pinned;
  if (result.status !== 0) throw new Error(`bench child ${args.join(" ")} failed:\n${result.stderr}`);
  return JSON.parse(result.stdout) as Record<string, number>;
}

interface ProcessRun {
  wallS: number;
  cpuS: number;
  peakRssMb: number | null;
}

const loadLine = () => loadavg().map((x) => x.toFixed(2)).join(" ");

/**
 * One whole process, pinned to CPU 0 like the measurements above so both programs get one core.
 * Wall time from here; CPU seconds and peak RSS from GNU time (`/usr/bin/time`) when installed.
 */
function timeProcess(command: string[], label: string): ProcessRun {
  const gnuTime = existsSync("/usr/bin/time");
  const dir = mkdtempSync(join(tmpdir(), "pendula-time-"));
  const out = join(dir, "time.txt");
  const pinned = spawnSync("taskset", ["--version"], { encoding: "utf8" }).error ? [] : ["taskset", "-c", "0"];
  const argv = [...pinned, ...(gnuTime ? ["/usr/bin/time", "-f", "%U %S %M", "-o", out] : []), ...command];
  try {
    const t0 = performance.now();
    const r = spawnSync(argv[0]!, argv.slice(1), { cwd: REPO_ROOT, encoding: "utf8", maxBuffer: 64 << 20 });
    const wallS = (performance.now() - t0) / 1000;
    if (r.error || r.status !== 0) throw new Error(`${label} failed (${r.error?.message ?? `exit ${r.status}`}):\n${r.stderr}`);
    if (!gnuTime) return { wallS, cpuS: Number.NaN, peakRssMb: null };
    const [user, sys, maxKb] = readFileSync(out, "utf8").trim().split("\n").pop()!.split(/\s+/).map(Number);
    return { wallS, cpuS: user! + sys!, peakRssMb: maxKb! / 1024 };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

/** Python 3 with NumPy and SciPy, or the reason the comparison cannot run. */
function pythonWithScipy(): { ok: true; versions: string } | { ok: false; reason: string } {
  const r = spawnSync("python3", ["-c", "import numpy, scipy, sys; print(sys.version.split()[0], numpy.__version__, scipy.__version__)"], { encoding: "utf8" });
  if (r.error) return { ok: false, reason: "python3 not found" };
  if (r.status !== 0) return { ok: false, reason: `python3 cannot import NumPy/SciPy: ${r.stderr.trim().split("\n").pop()}` };
  const [py, np, sp] = r.stdout.trim().split(" ");
  return { ok: true, versions: `Python ${py}, NumPy ${np}, SciPy ${sp}` };
}

/**
 * The V8 flags `npm run analyze` starts Node with, read from the root package.json's script so the
 * direct row runs under the same engine settings: a one-core batch run gains nothing from
 * background compiler and GC threads (`--single-threaded`), and allocating feedback vectors on a
 * function's first call instead of its eighth (`--no-lazy-feedback-allocation`) lets the sample
 * loops, most of which run a few times per process, be optimised from better type feedback.
 */
function analyzeNodeFlags(): string[] {
  const script = (JSON.parse(readFileSync(join(REPO_ROOT, "package.json"), "utf8")) as { scripts: Record<string, string> }).scripts.analyze ?? "";
  const words = script.split(/\s+/);
  const end = words.findIndex((w) => w.endsWith("run-built.mjs"));
  return words.slice(1, end < 0 ? 1 : end).filter((w) => w.startsWith("--"));
}

/**
 * The built CLI (`node signal/dist/cli.js … --json`, and the same through `npm run --silent
 * analyze`) against numpy_pipeline.py on the same files, alternated WHOLE_PROCESS_RUNS times.
 */
function wholeProcessComparison(dir: string, minutes: number): string[] {
  const files = readdirSync(dir).filter((n) => n.endsWith(".csv")).sort().map((n) => join(dir, n));
  const python = pythonWithScipy();
  if (!python.ok) return [`${minutes} min: whole-process comparison skipped (${python.reason}).`];
  if (!existsSync(BUILT_CLI)) return [`${minutes} min: whole-process comparison skipped (no ${BUILT_CLI}; run npm run build:node).`];
  const flags = analyzeNodeFlags();
  const programs = [
    // The same V8 flags as `npm run analyze`, read from its script (outputs do not depend on them).
    { label: `node ${flags.join(" ")} signal/dist/cli.js`, command: [process.execPath, ...flags, BUILT_CLI, ...files, "--json"] },
    { label: "npm run --silent analyze -- … --json", command: ["npm", "run", "--silent", "analyze", "--", ...files, "--json"] },
    { label: "python3 numpy_pipeline.py", command: ["python3", NUMPY_SCRIPT, ...files] },
  ];
  const runs: ProcessRun[][] = programs.map(() => []);
  const loadBefore = loadLine();
  for (let i = 0; i < WHOLE_PROCESS_RUNS; i++) {
    programs.forEach((p, j) => runs[j]!.push(timeProcess(p.command, p.label)));
  }
  const loadAfter = loadLine();
  const py = runs[programs.length - 1]!;
  const lines = [`${minutes} min, ${WHOLE_PROCESS_RUNS} alternated runs each (${python.versions}); load average ${loadBefore} before, ${loadAfter} after:`];
  const fmt = (xs: number[]) => xs.map((x) => x.toFixed(2)).join(" ");
  programs.forEach((p, j) => {
    const r = runs[j]!;
    const rss = r.map((x) => x.peakRssMb).filter((x): x is number => x !== null);
    const ratio = j < programs.length - 1
      ? `; ratio to NumPy/SciPy (median of per-pair ratios): wall ${median(r.map((x, k) => x.wallS / py[k]!.wallS)).toFixed(2)}, CPU ${median(r.map((x, k) => x.cpuS / py[k]!.cpuS)).toFixed(2)}`
      : "";
    lines.push(
      `  ${p.label.padEnd(38)} wall s median ${median(r.map((x) => x.wallS)).toFixed(2)} [${fmt(r.map((x) => x.wallS))}], ` +
        `CPU s median ${median(r.map((x) => x.cpuS)).toFixed(2)}, peak RSS ${rss.length ? `${Math.max(...rss).toFixed(0)} MB` : "n/a (no /usr/bin/time)"}${ratio}`,
    );
  });
  return lines;
}

function main(): void {
  const [mode, a, b] = process.argv.slice(2);
  if (mode === "--generate") return generate(Number(a), b!);
  if (mode === "--measure") return measure(a!);
  // `npm run bench -- --minutes 30` measures one size only (a shared machine may be slow).
  const only = mode === "--minutes" ? Number(a) : null;
  if (mode !== undefined && !(only !== null && Number.isInteger(only) && only >= 1 && only <= 120)) {
    console.error("usage: npm run bench [-- --minutes N]   (N whole minutes, 1–120; default: 6 and 30)");
    process.exitCode = 2;
    return;
  }

  console.log(`Pendula signal benchmark — node ${process.version}, load average ${loadLine()}`);
  console.log("Session: four sensors (shanks, wrists), 200 Hz, synthetic home walk (turns every 20 s, rests every 5 min).");
  const rows: string[][] = [];
  const parseLines: string[] = [];
  const processLines: string[] = [];
  const mbPerS = (bytes: number, s: number) => (bytes / 1048576 / s).toFixed(0);
  for (const minutes of only === null ? SIZES_MIN : [only]) {
    const dir = mkdtempSync(join(tmpdir(), "pendula-bench-"));
    try {
      const gen = runChild(["--generate", String(minutes), dir]);
      const m = runChild(["--measure", dir]);
      rows.push([
        `${minutes} min`,
        String(gen.rows),
        gen.generateS!.toFixed(2),
        `${m.readS!.toFixed(2)} (${m.readCpuS!.toFixed(2)})`,
        `${m.parseS!.toFixed(2)} (${m.parseCpuS!.toFixed(2)})`,
        `${m.analysisS!.toFixed(2)} (${m.analysisCpuS!.toFixed(2)})`,
        m.warmAnalysisS!.toFixed(2),
        `${m.endToEndS!.toFixed(2)} (${m.endToEndCpuS!.toFixed(2)})`,
        mb(m.peakRssBytes!),
        mb(m.baselineRssBytes!),
        mb(m.heapUsedAfterBytes!),
        String(m.strides),
      ]);
      parseLines.push(
        `${minutes} min, ${mb(m.csvBytes!)} MB of CSV: text reader ${mbPerS(m.csvBytes!, m.parseCpuS!)} MB/s (after decoding the files to strings); ` +
          `byte reader ${mbPerS(m.csvBytes!, m.bytesParseCpuS!)} MB/s first run, ${mbPerS(m.csvBytes!, m.bytesParseWarmCpuS!)} MB/s warm (best of 3); ` +
          `chunked reader as in the CLI, reading included: ${mbPerS(m.csvBytes!, m.chunkedReadParseCpuS!)} MB/s first run, ${mbPerS(m.csvBytes!, m.chunkedReadParseWarmCpuS!)} MB/s warm.`,
      );
      parseLines.push(`${minutes} min, ${describeTsvThroughput(m as unknown as TsvThroughput)}`);
      processLines.push(...wholeProcessComparison(dir, minutes));
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }
  const header = ["size", "rows", "gen s", "read s", "parse s", "analysis s", "warm s", "end-to-end s", "peak RSS MB", "start RSS MB", "heap after MB", "strides"];
  const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i]!.length)));
  const line = (cells: string[]) => cells.map((c, i) => c.padStart(widths[i]!)).join("  ");
  console.log(line(header));
  for (const r of rows) console.log(line(r));
  console.log("Parse throughput, CPU seconds of one core (MB = 2^20 bytes, as above):");
  for (const p of parseLines) console.log(`  ${p}`);
  console.log("Whole process, the built CLI against a NumPy/SciPy script doing the same steps on the same files (one core each):");
  for (const p of processLines) console.log(`  ${p}`);
  console.log(
    `Targets (30 min): analysis after parsing < ${TARGETS_30_MIN.analysisS} s, end to end (read + parse + analysis) < ${TARGETS_30_MIN.endToEndS} s, peak RSS < ${TARGETS_30_MIN.peakMb} MB, ` +
      `whole-process time ≤ ${TARGETS_30_MIN.wholeProcessRatio} × NumPy/SciPy's.`,
  );
  console.log(`Load average at the end: ${loadLine()}.`);
  console.log("Times are wall seconds (CPU seconds of the process in brackets; CPU includes GC and JIT helper threads).");
  console.log("Generation is not part of the targets; 'warm' is a second analysis in the same process, for information.");
  console.log("Start RSS is the Node runtime with the bundle loaded, before any file is read.");
}

main();
