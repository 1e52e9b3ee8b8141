/**
 * The path from upload to processed session, measured against a running server and separate
 * worker processes (scripts/bench-e2e.sh starts them and calls this file once per pass):
 *
 *   prepare   patients, devices and assignments of an invented caseload, and one 30-minute
 *             four-sensor recording (the `npm run bench` scenario) written to the state folder
 *   single    N sessions one after another: upload→done p50/p95 and where the time goes
 *   burst     N sessions uploaded at once by N patients: sessions per minute
 *
 * Every upload goes through POST /api/sessions as the patient, with that patient's device serials
 * and its own start time in the file headers, so each is a distinct recording. Times are wall
 * clock of this process; database states are sampled by polling walk_sessions. Figures are
 * printed, never asserted.
 */
import { readdirSync, readFileSync, writeFileSync } from "node:fs";
import { loadavg } from "node:os";
import path from "node:path";
import { createDb } from "@pendula/db";
import { synthesizeSession, type SynthOptions } from "../../signal/src/synth";
import { signAccessToken } from "../../ingest-server/src/auth/access-token";
import { hashPassword } from "../../ingest-server/src/auth/passwords";
import { scopesFor } from "../../ingest-server/src/auth/scopes";

const PLACEMENTS = ["left_shank", "right_shank", "left_wrist", "right_wrist"] as const;
type Placement = (typeof PLACEMENTS)[number];

interface State {
  patients: Array<{ userId: string; patientId: string; serials: Record<Placement, string> }>;
  files: Array<{ placement: Placement; fileName: string; header: string; bodyPath: string; startUtc: string; bytes: number }>;
}

function arg(name: string, fallback?: string): string {
  const i = process.argv.indexOf(`--${name}`);
  const v = i >= 0 ? process.argv[i + 1] : fallback;
  if (v === undefined) throw new Error(`--${name} is required`);
  return v;
}

const env = (name: string) => {
  const v = process.env[name];
  if (!v) throw new Error(`${name} is not set (scripts/bench-e2e.sh sets it)`);
  return v;
};

const stateDir = arg("state-dir");
const statePath = path.join(stateDir, "state.json");
const db = createDb(env("DATABASE_URL"));

/** The `npm run bench` session (signal/bench/bench.ts): 200 Hz, turns every 20 s, a rest every 5 minutes. */
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

async function prepare(): Promise<void> {
  const count = Number(arg("patients"));
  const minutes = Number(arg("minutes", "30"));
  const t0 = performance.now();
  const synth = synthesizeSession({
    ...scenario(minutes),
    placements: [...PLACEMENTS],
    deviceSerials: Object.fromEntries(PLACEMENTS.map((p) => [p, `SERIAL-${p}`])),
    startUtc: "2026-11-02T08:30:00.000Z",
  });
  const files: State["files"] = [];
  for (const f of synth.files) {
    // Header lines ("# key: value") and the column line stay per upload; the rows are shared.
    const columns = f.text.indexOf("t_s,");
    const bodyStart = f.text.indexOf("\n", columns) + 1;
    const bodyPath = path.join(stateDir, `${f.placement}.rows.csv`);
    writeFileSync(bodyPath, f.text.slice(bodyStart));
    const startUtc = /^# start_utc: (.+)$/m.exec(f.text.slice(0, bodyStart))![1]!;
    files.push({ placement: f.placement as Placement, fileName: f.fileName, header: f.text.slice(0, bodyStart), bodyPath, startUtc, bytes: Buffer.byteLength(f.text) });
  }
  // An invented caseload: "Bench Walker nnn", one set of four sensors each.
  const passwordHash = await hashPassword(`bench-${Date.now()}`, 4);
  const patients: State["patients"] = [];
  for (let i = 0; i < count; i++) {
    const n = String(i + 1).padStart(3, "0");
    const [p] = await db("patients")
      .insert({
        display_name: `Bench Walker ${n}`,
        research_id: `BENCH-${n}`,
        birth_year: 1950 + (i % 30),
        sex: "unknown",
        condition: (["stroke", "parkinsons", "incomplete_sci", "other"] as const)[i % 4],
        enrolled_on: "2026-10-05",
      })
      .returning("id");
    const [u] = await db("users")
      .insert({ email: `bench-walker-${n}@example.test`, display_name: `Bench Walker ${n}`, password_hash: passwordHash, role: "patient", status: "active", patient_id: p.id })
      .returning("id");
    const serials = {} as Record<Placement, string>;
    for (const placement of PLACEMENTS) {
      const serial = `BENCH-${n}-${placement.replace("_", "-").toUpperCase()}`;
      const [d] = await db("devices").insert({ serial, kind: "imu6", firmware: "2.4.1", status: "assigned" }).returning("id");
      await db("device_assignments").insert({ device_id: d.id, patient_id: p.id, placement, valid_from: "2026-10-01T00:00:00Z", valid_to: null });
      serials[placement] = serial;
    }
    patients.push({ userId: u.id, patientId: p.id, serials });
  }
  writeFileSync(statePath, JSON.stringify({ patients, files } satisfies State));
  const mb = files.reduce((s, f) => s + f.bytes, 0) / 1e6;
  console.log(`prepared ${count} patients with four sensors each and a ${minutes}-minute session (${files.length} files, ${mb.toFixed(1)} MB) in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
}

const state = (): State => JSON.parse(readFileSync(statePath, "utf8")) as State;

const WEEK_MS = 7 * 86_400_000;

/** The patient's files for week `week`: its serials and a start time shifted by whole weeks, shared rows. */
function uploadForm(s: State, bodies: Map<string, Blob>, patient: State["patients"][number], week: number): FormData {
  const form = new FormData();
  for (const f of s.files) {
    const start = new Date(Date.parse(f.startUtc) + week * WEEK_MS).toISOString();
    const header = f.header.replace(/^# device: .*$/m, `# device: ${patient.serials[f.placement]}`).replace(/^# start_utc: .*$/m, `# start_utc: ${start}`);
    form.append("files", new Blob([header, bodies.get(f.bodyPath)!], { type: "text/csv" }), f.fileName);
  }
  return form;
}

const tokens = new Map<string, string>();
async function tokenOf(p: State["patients"][number]): Promise<string> {
  let t = tokens.get(p.userId);
  if (!t) {
    // The server's own token format and secret (as the test harness signs them): sign-in is not what is measured.
    t = await signAccessToken({ userId: p.userId, role: "patient", scopes: scopesFor("patient"), patientId: p.patientId, sessionEpoch: 0 }, env("JWT_SECRET"), 3600);
    tokens.set(p.userId, t);
  }
  return t;
}

interface Timeline {
  sessionId: string;
  startMs: number;
  acceptedMs: number;
  /** First time each state was seen: "queued", "processing:5", "processing:30", "processing:70", "done". */
  seen: Map<string, number>;
  /** The server's own account of the upload (Server-Timing: parse, store, record, total; ms). */
  serverMs: Record<string, number>;
  failed?: string;
}

async function uploadOne(s: State, bodies: Map<string, Blob>, patient: State["patients"][number], week: number): Promise<Timeline> {
  const base = env("PUBLIC_URL");
  const token = await tokenOf(patient);
  for (let attempt = 0; ; attempt++) {
    const startMs = performance.now();
    const res = await fetch(`${base}/api/sessions`, { method: "POST", headers: { authorization: `Bearer ${token}` }, body: uploadForm(s, bodies, patient, week) });
    const acceptedMs = performance.now();
    const body = (await res.json()) as { id?: string; error?: { code: string; message: string } };
    if (res.status === 202 && body.id) return { sessionId: body.id, startMs, acceptedMs, seen: new Map(), serverMs: serverTiming(res.headers.get("server-timing")) };
    // A busy server may ask to come back; anything else is a failure of the bench's own input.
    if ((res.status === 429 || res.status === 503) && attempt < 20) {
      const wait = Number(res.headers.get("retry-after") ?? "2");
      await new Promise((r) => setTimeout(r, Math.max(0.5, wait) * 1000));
      continue;
    }
    throw new Error(`upload refused: ${res.status} ${JSON.stringify(body)}`);
  }
}

/** `name;dur=12.3, …` (W3C Server Timing) → { name: 12.3 }. */
function serverTiming(header: string | null): Record<string, number> {
  const out: Record<string, number> = {};
  for (const m of (header ?? "").matchAll(/([\w-]+);dur=([\d.]+)/g)) out[m[1]!] = Number(m[2]);
  return out;
}

/** Samples the sessions' status and progress until every one is done or failed. */
async function watch(timelines: Timeline[], periodMs: number, timeoutMs: number): Promise<void> {
  const end = performance.now() + timeoutMs;
  const open = new Map(timelines.map((t) => [t.sessionId, t]));
  while (open.size > 0) {
    if (performance.now() > end) throw new Error(`${open.size} session(s) not done after ${timeoutMs / 1000} s`);
    const rows: Array<{ id: string; status: string; progress_pct: number; error: string | null }> = await db("walk_sessions")
      .whereIn("id", [...open.keys()])
      .select("id", "status", "progress_pct", "error");
    const now = performance.now();
    for (const r of rows) {
      const t = open.get(r.id)!;
      const key = r.status === "processing" ? `processing:${r.progress_pct}` : r.status;
      if (!t.seen.has(key)) t.seen.set(key, now);
      if (r.status === "done") open.delete(r.id);
      if (r.status === "failed") {
        t.failed = r.error ?? "failed";
        open.delete(r.id);
      }
    }
    await new Promise((r) => setTimeout(r, periodMs));
  }
}

function percentile(sorted: number[], q: number): number {
  if (sorted.length === 0) return Number.NaN;
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1))]!;
}

const s1 = (ms: number) => (ms / 1000).toFixed(2);
const load = () => loadavg().map((l) => l.toFixed(2)).join(" / ");

/** Peak and current resident memory of a process, MB (VmHWM and VmRSS from /proc/<pid>/status). */
function memoryOf(pid: number): { peakMb: number; rssMb: number } | null {
  try {
    const status = readFileSync(`/proc/${pid}/status`, "utf8");
    const kb = (k: string) => Number(new RegExp(`^${k}:\\s+(\\d+) kB`, "m").exec(status)?.[1] ?? Number.NaN);
    return { peakMb: kb("VmHWM") / 1024, rssMb: kb("VmRSS") / 1024 };
  } catch {
    return null;
  }
}

/** CPU seconds (user + system) a process has used so far, from /proc/<pid>/stat; 0 when it is gone. */
function cpuSecondsOf(pid: number): number {
  try {
    const f = readFileSync(`/proc/${pid}/stat`, "utf8").split(") ")[1]!.split(" ");
    return (Number(f[11]) + Number(f[12])) / 100; // fields 14 and 15; USER_HZ is 100 on Linux
  } catch {
    return 0;
  }
}

/** The cluster's postmaster and every process it started (backends and background workers). */
function databasePids(): number[] {
  const postmaster = Number(process.env.BENCH_PG_PID ?? 0);
  if (!postmaster) return [];
  const out = [postmaster];
  for (const d of readdirSync("/proc")) {
    if (!/^\d+$/.test(d)) continue;
    try {
      const ppid = Number(readFileSync(`/proc/${d}/stat`, "utf8").split(") ")[1]!.split(" ")[1]);
      if (ppid === postmaster) out.push(Number(d));
    } catch {
      // ended meanwhile
    }
  }
  return out;
}

/** CPU seconds so far of the server, the workers, the object-storage fake and the database. */
function cpuSnapshot(): Record<string, number> {
  const pids = (v: string | undefined) => (v ?? "").split(",").filter(Boolean).map(Number);
  const sum = (list: number[]) => list.reduce((a, pid) => a + cpuSecondsOf(pid), 0);
  return {
    server: sum(pids(process.env.BENCH_SERVER_PID)),
    workers: sum(pids(process.env.BENCH_WORKER_PIDS)),
    "storage fake": sum(pids(process.env.BENCH_FAKES_PID)),
    PostgreSQL: sum(databasePids()),
  };
}

/** CPU used between two snapshots, per session. Backends that ended in between are not counted. */
function cpuLine(before: Record<string, number>, after: Record<string, number>, sessions: number): string {
  return Object.keys(after)
    .map((k) => `${k} ${((after[k]! - (before[k] ?? 0)) / sessions).toFixed(2)} s`)
    .join(", ");
}

function printMemory(): void {
  const workers = (process.env.BENCH_WORKER_PIDS ?? "").split(",").filter(Boolean).map(Number);
  const server = Number(process.env.BENCH_SERVER_PID ?? 0);
  const parts = workers.map((pid, i) => {
    const m = memoryOf(pid);
    return `worker ${i + 1} ${m ? `${m.peakMb.toFixed(0)} MB peak (${m.rssMb.toFixed(0)} MB now)` : "gone"}`;
  });
  const sm = server ? memoryOf(server) : null;
  if (sm) parts.push(`server ${sm.peakMb.toFixed(0)} MB peak since start`);
  console.log(`  resident memory: ${parts.join("; ")}`);
}

function loadBodies(s: State): Map<string, Blob> {
  return new Map(s.files.map((f) => [f.bodyPath, new Blob([readFileSync(f.bodyPath)])]));
}

async function single(): Promise<void> {
  const s = state();
  const bodies = loadBodies(s);
  const count = Number(arg("count"));
  const week = Number(arg("week"));
  if (s.patients.length < count) throw new Error(`${count} sessions need ${count} patients; prepared ${s.patients.length}`);
  console.log(`one session at a time: ${count} sessions, ${arg("workers-label")}; load average before ${load()} (1, 5, 15 min)`);
  const totals: number[] = [];
  const parts: Record<string, number[]> = { upload: [], pickup: [], read: [], analysis: [], write: [], parse: [], store: [], parsed: [], record: [], receive: [] };
  const cpu0 = cpuSnapshot();
  for (let i = 0; i < count; i++) {
    const t = await uploadOne(s, bodies, s.patients[i]!, week);
    await watch([t], 20, 300_000);
    if (t.failed) throw new Error(`session ${t.sessionId} failed: ${t.failed}`);
    const at = (k: string) => t.seen.get(k);
    const done = at("done")!;
    const p5 = at("processing:5") ?? at("processing:30") ?? at("processing:70") ?? done;
    const p30 = at("processing:30") ?? at("processing:70") ?? done;
    const p70 = at("processing:70") ?? done;
    const row = { upload: t.acceptedMs - t.startMs, pickup: p5 - t.acceptedMs, read: p30 - p5, analysis: p70 - p30, write: done - p70 };
    for (const [k, v] of Object.entries(row)) parts[k]!.push(v);
    for (const k of ["parse", "store", "parsed", "record"]) if (t.serverMs[k] !== undefined) parts[k]!.push(t.serverMs[k]);
    // The handler starts once the body is on disk: the rest of the client's wait is receiving it.
    if (t.serverMs.total !== undefined) parts.receive!.push(row.upload - t.serverMs.total);
    totals.push(done - t.startMs);
    console.log(
      `  #${i + 1}: upload→done ${s1(done - t.startMs)} s = upload ${s1(row.upload)} + queue pick-up ${s1(row.pickup)} + ` +
        `fetch and read files ${s1(row.read)} + analysis ${s1(row.analysis)} + traces and write ${s1(row.write)} s ` +
        `(in the upload: receiving the body ${s1(row.upload - (t.serverMs.total ?? Number.NaN))}, then parse ${s1(t.serverMs.parse ?? Number.NaN)} with store ${s1(t.serverMs.store ?? Number.NaN)} beside it, ` +
        `storing the parsed recordings ${s1(t.serverMs.parsed ?? Number.NaN)}, record beside them ${s1(t.serverMs.record ?? Number.NaN)} s)`,
    );
  }
  const sorted = [...totals].sort((a, b) => a - b);
  const med = (k: string) => s1(percentile([...parts[k]!].sort((a, b) => a - b), 0.5));
  console.log(`  upload→done p50 ${s1(percentile(sorted, 0.5))} s, p95 ${s1(percentile(sorted, 0.95))} s (n = ${count}; target p50 < 4 s)`);
  console.log(`  median parts: upload ${med("upload")}, pick-up ${med("pickup")}, fetch and read ${med("read")}, analysis ${med("analysis")}, traces and write ${med("write")} s (sampled every 20 ms)`);
  console.log(`  median upload parts: receiving the body ${med("receive")}, then parse ${med("parse")} with store ${med("store")} beside it, storing the parsed recordings ${med("parsed")}, record beside them ${med("record")} s (Server-Timing)`);
  console.log(`  CPU per session: ${cpuLine(cpu0, cpuSnapshot(), count)} (wall times above include waiting for a core)`);
  printMemory();
  console.log(`  load average after ${load()}`);
}

async function burst(): Promise<void> {
  const s = state();
  const bodies = loadBodies(s);
  const count = Number(arg("count"));
  const week = Number(arg("week"));
  const workers = Number(arg("workers"));
  if (s.patients.length < count) throw new Error(`${count} sessions at once need ${count} patients (one upload each); prepared ${s.patients.length}`);
  console.log(`${count} sessions uploaded at once by ${count} patients, ${workers} worker process(es); load average before ${load()}`);
  const cpu0 = cpuSnapshot();
  const t0 = performance.now();
  const timelines = await Promise.all(s.patients.slice(0, count).map((p) => uploadOne(s, bodies, p, week)));
  const lastAccepted = Math.max(...timelines.map((t) => t.acceptedMs));
  await watch(timelines, 250, 30 * 60_000);
  const failed = timelines.filter((t) => t.failed);
  if (failed.length > 0) throw new Error(`${failed.length} session(s) failed: ${failed[0]!.failed}`);
  const doneAt = timelines.map((t) => t.seen.get("done")!);
  const spanMs = Math.max(...doneAt) - t0;
  const latencies = timelines.map((t) => t.seen.get("done")! - t.startMs).sort((a, b) => a - b);
  console.log(
    `  all uploads accepted after ${s1(lastAccepted - t0)} s; all done after ${s1(spanMs)} s → ${((count / spanMs) * 60_000).toFixed(1)} sessions/minute ` +
      `(upload→done p50 ${s1(percentile(latencies, 0.5))} s, p95 ${s1(percentile(latencies, 0.95))} s; sampled every 250 ms)`,
  );
  console.log(`  CPU per session: ${cpuLine(cpu0, cpuSnapshot(), count)}`);
  printMemory();
  console.log(`  load average after ${load()}`);
}

try {
  const phase = process.argv[2];
  if (phase === "prepare") await prepare();
  else if (phase === "single") await single();
  else if (phase === "burst") await burst();
  else throw new Error(`unknown phase ${phase ?? "(none)"}: prepare | single | burst`);
} finally {
  await db.destroy();
}
