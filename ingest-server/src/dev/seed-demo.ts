import { parseArgs } from "node:util";
import type { Request } from "express";
import type { Knex } from "knex";
import { synthesizeSession, type SynthOptions } from "@pendula/signal";
import {
  DEMO_CLINIC,
  DEMO_DEVICE_FIRMWARE,
  DEMO_PASSWORD,
  DEMO_PATIENTS,
  DEMO_SPARE_DEVICES,
  DEMO_STAFF,
  demoSerial,
  type DemoPatient,
  type DemoTrajectory,
} from "../../../db/seeds/demo-scenario";
import { hashPassword } from "../auth/passwords";
import { scopesFor } from "../auth/scopes";
import { loadConfigOrExit } from "../config/env";
import type { AppDeps } from "../deps";
import type { AuthContext } from "../middleware/authenticate";
import { processSession } from "../processing/process-session";
import type { JobQueue } from "../queue/queue";
import { uploadSession } from "../routes/sessions/upload.service";
import { createRuntime } from "../runtime";

/**
 * `tsx ingest-server/src/dev/seed-demo.ts [--if-empty] [--max-weeks N]`
 *
 * Builds the invented demo scenario (db/seeds/demo-scenario.ts): staff, patients, caseloads,
 * devices and their assignments, then for every patient and week synthesises that week's four
 * sensor files with the project's gait generator, sends them through the same upload service a
 * patient's browser uses (sniffing, device → placement mapping, object storage) and processes them
 * with the worker's own processSession(). No metric number is typed in by hand: every value the
 * demo shows comes out of analyze().
 */

const PLACEMENTS = ["left_shank", "right_shank", "left_wrist", "right_wrist"] as const;

/** Invented standing heights (cm) of the demo patients, by scenario key; the clinician enters these in the portal. */
export const DEMO_HEIGHTS_CM: Record<string, number> = {
  p01: 164, p02: 179, p03: 158, p04: 176, p05: 161, p06: 183, p07: 167, p08: 174, p09: 155,
  p10: 181, p11: 172, p12: 163, p13: 185, p14: 160, p15: 177, p16: 169, p17: 171, p18: 152,
};

/**
 * The walking aid the clinician records for a demo week (invented): early stroke and SCI weeks with
 * a cane or crutches that are later put aside, the oldest patient with a rollator throughout, and
 * one patient whose sessions carry no record, as happens when nobody entered it.
 */
export function demoWalkingAid(patient: DemoPatient, week: number): string | null {
  if (patient.key === "p18") return "rollator";
  if (patient.key === "p16") return null;
  if (patient.condition === "incomplete_sci") return week < 6 ? "crutches" : week < 10 ? "cane" : "none";
  if (patient.condition === "stroke") return week < 4 ? "cane" : "none";
  return "none";
}
const DAY_MS = 86_400_000;

function mondayUtc(d: Date): Date {
  const day = (d.getUTCDay() + 6) % 7;
  return new Date(Date.UTC(d.getUTCFullYear(), d.getUTCMonth(), d.getUTCDate() - day));
}

/** Recovery follows 1 − e^(−week/τ); a setback walks part of it back, week by week. */
export function recoveryFraction(t: DemoTrajectory, week: number): number {
  const p = (w: number) => 1 - Math.exp(-w / t.tauWeeks);
  if (t.setbackFromWeek === null || week < t.setbackFromWeek) return p(week);
  return Math.max(0, p(t.setbackFromWeek) - 0.12 * (week - t.setbackFromWeek + 1));
}

const lerp = (a: number, b: number, f: number) => a + (b - a) * f;

/** Deterministic small week-to-week wobble so trends look measured, not drawn. */
function wobble(seed: number): number {
  const x = Math.sin(seed * 12.9898) * 43758.5453;
  return (x - Math.floor(x)) * 2 - 1;
}

export function weekSynthOptions(patient: DemoPatient, index: number, week: number, serials: Record<string, string>, startUtc: string): SynthOptions {
  const t = patient.trajectory;
  const f = recoveryFraction(t, week);
  const seed = index * 1000 + week + 1;
  const cadence = lerp(t.cadenceStart, t.cadenceEnd, f) + 2 * wobble(seed);
  const cv = Math.max(1.2, lerp(t.strideCvStartPct, t.strideCvEndPct, f) + 0.35 * wobble(seed + 7));
  const asym = Math.max(0, lerp(t.asymmetryStart, t.asymmetryEnd, f));
  const coupling = lerp(t.couplingStart, t.couplingEnd, f);
  // Slower walking spends longer in stance (common practice: stance ≈ 60 % at comfortable speed).
  const stanceBase = Math.min(0.7, 0.6 + Math.max(0, 105 - cadence) * 0.002);
  const swingSound = 1 - stanceBase;
  const swingAffected = Math.min(0.55, swingSound * (1 + asym));
  const affectedLeft = t.affectedSide === "left";
  const stanceFraction = {
    left: affectedLeft ? 1 - swingAffected : 1 - swingSound,
    right: affectedLeft ? 1 - swingSound : 1 - swingAffected,
  };
  const strideTimeS = 120 / cadence;
  const peakSound = Math.min(420, Math.max(140, (350 * 1.1) / strideTimeS));
  const midSwingPeakDegS = {
    left: affectedLeft ? peakSound * (1 - 0.8 * asym) : peakSound,
    right: affectedLeft ? peakSound : peakSound * (1 - 0.8 * asym),
  };
  // Below ~0.32 the arms are treated as swinging on their own; above it they lock with a phase
  // wander whose size gives the planned coupling strength (R ≈ exp(−σ²/2)).
  const phaseJitterDeg = (Math.sqrt(-2 * Math.log(Math.min(0.97, coupling))) * 180) / Math.PI;
  const armMode = coupling < 0.32 ? "uncoupled" : t.armOneToOneAboveCadence !== null && cadence < t.armOneToOneAboveCadence ? "2:1" : "1:1";
  return {
    seed,
    durationS: 100,
    sampleRateHz: index % 3 === 0 ? 128 : 100,
    gyroUnits: index % 4 === 1 ? "rad/s" : "deg/s",
    startUtc,
    deviceSerials: serials,
    writePlacement: false,
    startOffsetsS: { left_shank: 0, right_shank: 0.012, left_wrist: 0.031, right_wrist: 0.047 },
    timestampJitterS: 0.0008,
    misalignmentDeg: 8 + 4 * Math.abs(wobble(seed + 3)),
    // A hallway walk: out and back with a 180° turn every ~30 s.
    turns: [
      { startS: 33, durationS: 2.6, angleDeg: 180 },
      { startS: 66, durationS: 2.6, angleDeg: 180 },
    ],
    strideTimeS,
    strideTimeCvPct: cv,
    stanceFraction,
    stepFraction: 0.5 + (affectedLeft ? 1 : -1) * asym * 0.08,
    midSwingPeakDegS,
    arm: { coupling: armMode, phaseDeg: 15 + 10 * wobble(seed + 11), amplitudeDegS: 40 + 90 * f, uncoupledRatio: 1.45, phaseJitterDeg },
    // Home recordings are not perfect: one week with an upside-down shank, one with a dropout.
    invertedPlacement: week === 4 && index % 5 === 2 ? "right_shank" : null,
    gaps: week === 6 && index % 4 === 0 ? [{ placement: "left_wrist", startS: 50, durationS: 0.09 }] : [],
  };
}

function noQueue(): JobQueue {
  // The seed processes in-process; nothing is left for a worker to pick up twice.
  return {
    send: async () => null,
    work: async () => undefined,
    start: async () => undefined,
    stop: async () => undefined,
  } as unknown as JobQueue;
}

async function isEmpty(db: Knex): Promise<boolean> {
  const row = await db("users").count({ n: "*" }).first();
  return Number(row?.n ?? 0) === 0;
}

async function seed(deps: AppDeps, maxWeeks: number, log: (s: string) => void): Promise<void> {
  const { db } = deps;
  const hash = await hashPassword(DEMO_PASSWORD, deps.config.bcryptCost);
  const staff = new Map<string, string>();
  for (const s of DEMO_STAFF) {
    const [row] = await db("users")
      .insert({ email: s.email, display_name: s.displayName, password_hash: hash, role: s.role, status: "active" })
      .returning("id");
    staff.set(s.key, row.id as string);
  }
  // The scenario ends last week, whenever the seed runs, so the demo always looks current and
  // "this week's test" is still open for the demo patients.
  const thisMonday = mondayUtc(new Date());
  let deviceIndex = 1;
  let sessions = 0;
  for (const [index, p] of DEMO_PATIENTS.entries()) {
    // Longer histories started earlier, so caseloads show different lengths of history.
    const enrolledAt = new Date(thisMonday.getTime() - p.weeks * 7 * DAY_MS);
    const [pat] = await db("patients")
      .insert({
        display_name: p.displayName,
        research_id: `FHG-${String(index + 1).padStart(3, "0")}`,
        birth_year: p.birthYear,
        sex: p.sex,
        condition: p.condition,
        condition_detail: p.conditionDetail,
        enrolled_on: enrolledAt.toISOString().slice(0, 10),
        research_consent: p.researchConsent,
        expected_uploads_per_week: 1,
        height_cm: DEMO_HEIGHTS_CM[p.key] ?? null,
      })
      .returning("id");
    const patientId = pat.id as string;
    for (const c of p.clinicians) await db("caseload").insert({ clinician_id: staff.get(c), patient_id: patientId, since: enrolledAt });
    let patientUserId: string | null = null;
    if (p.email) {
      const [u] = await db("users")
        .insert({ email: p.email, display_name: p.displayName, password_hash: hash, role: "patient", status: "active", patient_id: patientId })
        .returning("id");
      patientUserId = u.id as string;
    }
    const serials: Record<string, string> = {};
    for (const placement of PLACEMENTS) {
      const serial = demoSerial(deviceIndex++);
      serials[placement] = serial;
      const [dev] = await db("devices")
        .insert({ serial, kind: "imu6", firmware: DEMO_DEVICE_FIRMWARE, status: "assigned" })
        .returning("id");
      await db("device_assignments").insert({
        device_id: dev.id,
        patient_id: patientId,
        placement,
        valid_from: enrolledAt,
        created_by: staff.get("admin"),
      });
    }

    const uploader: AuthContext = patientUserId
      ? { userId: patientUserId, role: "patient", scopes: scopesFor("patient"), patientId, tokenId: "seed" }
      : { userId: staff.get(p.clinicians[0]!)!, role: "clinician", scopes: scopesFor("clinician"), patientId: null, tokenId: "seed" };
    const weeks = Math.min(p.weeks, maxWeeks);
    for (let week = 0; week < weeks; week++) {
      if (p.missedWeeks.includes(week)) continue;
      // Tuesday to Thursday mornings, local clinic time ≈ UTC.
      const at = new Date(enrolledAt.getTime() + week * 7 * DAY_MS + (1 + (week % 3)) * DAY_MS + (9 * 60 + ((index * 7 + week * 13) % 50)) * 60_000);
      const synth = synthesizeSession(weekSynthOptions(p, index, week, serials, at.toISOString()));
      const req = { ip: "127.0.0.1", headers: { "user-agent": "pendula-demo-seed" }, get: () => "pendula-demo-seed" } as unknown as Request;
      const result = await uploadSession(deps, req, {
        auth: uploader,
        patientId,
        files: synth.files.map((f) => ({ originalName: f.fileName, buffer: Buffer.from(f.text, "utf8") })),
      });
      // Recorded before processing, as a clinician would at the visit, so the analysis is told about it.
      await db("walk_sessions").where({ id: result.id }).update({ walking_aid: demoWalkingAid(p, week) });
      await processSession(deps, result.id);
      // Uploaded the same morning it was recorded, not at seed time.
      const uploadedAt = new Date(at.getTime() + 40 * 60_000);
      await db("walk_sessions").where({ id: result.id }).update({ created_at: uploadedAt, processed_at: uploadedAt, updated_at: uploadedAt });
      await db("raw_files").where({ session_id: result.id }).update({ created_at: uploadedAt });
      sessions += 1;
    }
    log(`  ${p.displayName}: ${weeks - p.missedWeeks.filter((w) => w < weeks).length} sessions`);
  }
  for (let i = 0; i < DEMO_SPARE_DEVICES; i++) {
    await db("devices").insert({ serial: demoSerial(deviceIndex++), kind: i % 3 === 2 ? "imu9" : "imu6", firmware: DEMO_DEVICE_FIRMWARE, status: i === 5 ? "maintenance" : "in_stock" });
  }
  log(`seeded ${DEMO_CLINIC}: ${DEMO_STAFF.length} staff, ${DEMO_PATIENTS.length} patients, ${deviceIndex - 1} devices, ${sessions} processed sessions`);
}

async function main(): Promise<void> {
  const { values } = parseArgs({ options: { "if-empty": { type: "boolean", default: false }, "max-weeks": { type: "string" } } });
  const config = loadConfigOrExit();
  const runtime = createRuntime(config, { application: "pendula-seed" });
  const deps: AppDeps = { ...runtime.deps, queue: noQueue() };
  try {
    if (!(await isEmpty(deps.db))) {
      if (values["if-empty"]) {
        console.error("demo seed: database already has users; leaving it as it is");
        return;
      }
      throw new Error("the database is not empty; the demo seed only fills an empty one");
    }
    const maxWeeks = values["max-weeks"] ? Number(values["max-weeks"]) : Number.POSITIVE_INFINITY;
    const started = Date.now();
    console.error(`demo seed: synthesising and analysing every demo session (this takes a minute)`);
    await seed(deps, maxWeeks, (s) => console.error(s));
    console.error(`demo seed: done in ${((Date.now() - started) / 1000).toFixed(1)} s`);
  } finally {
    await runtime.close();
  }
}

if (import.meta.url === `file://${process.argv[1]}`) await main();
