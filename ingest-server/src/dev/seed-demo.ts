import { parseArgs } from "node:util";
import type { Request } from "express";
import type { Knex } from "knex";
import { type KinematicOptions, type SensorRecording, sensorCsvText, synthesizeKinematicSession } from "@pendula/signal";
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
import { isDemoMode, loadConfigOrExit } from "../config/env";
import type { AppDeps } from "../deps";
import type { AuthContext } from "../middleware/authenticate";
import { processSession } from "../processing/process-session";
import type { JobQueue } from "../queue/queue";
import { insertConsentEvent } from "../routes/consent/consent.repository";
import { uploadSession } from "../routes/sessions/upload.service";
import { enrolDemoStaff } from "./demo-second-factor";
import { withUploadFiles } from "../uploads/temp-files";
import { createRuntime } from "../runtime";

/**
 * `tsx ingest-server/src/dev/seed-demo.ts [--if-empty] [--max-weeks N]`
 *
 * Builds the invented demo scenario (db/seeds/demo-scenario.ts): staff, patients, caseloads,
 * devices and their assignments, then for every patient and week synthesises that week's four
 * sensor files with the kinematic gait generator (signal/src/synth/kinematic), sends them through
 * the same upload service a patient's browser uses (sniffing, device → placement mapping, object
 * storage) and processes them with the worker's own processSession(). No metric number is typed
 * in by hand: every value the demo shows comes out of analyze().
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

/** Placements of the weekly test, in the order the files are written. */
type DemoPlacement = (typeof PLACEMENTS)[number];

/**
 * How the body carries the week's walking aid (`demoWalkingAid`; a week with no record is walked
 * without one). A cane is held in the hand opposite the weaker leg (common
 * practice), so that arm does not swing; both hands rest on a rollator. With crutches the arms move
 * them forward, each crutch with the opposite foot (four-point crutch gait, common practice): the
 * generator's nearest pattern is a 1:1 arm rhythm with the contralateral leg. The analysis reports
 * no arm–leg coupling for any recorded aid.
 */
function armsWithAid(aid: string | null, affected: "left" | "right"): { heldStill: ("left" | "right")[]; forceOneToOne: boolean } {
  if (aid === "rollator") return { heldStill: ["left", "right"], forceOneToOne: false };
  if (aid === "cane") return { heldStill: [affected === "left" ? "right" : "left"], forceOneToOne: false };
  return { heldStill: [], forceOneToOne: aid === "crutches" };
}

/**
 * File-level imperfections of a home recording that the generator's model leaves to the devices:
 * each device starts a few milliseconds after the first (its start_utc says so), a shank strapped on
 * upside down (180° about the forward axis), a short dropout of samples, gyro units.
 */
export interface DemoFileOptions {
  serials: Record<string, string>;
  gyroUnits: "deg/s" | "rad/s";
  startOffsetsS: Partial<Record<DemoPlacement, number>>;
  upsideDownShank: DemoPlacement | null;
  gaps: { placement: DemoPlacement; startS: number; durationS: number }[];
}

export interface DemoWeek {
  options: KinematicOptions;
  files: DemoFileOptions;
}

/**
 * One patient-week of the invented scenario as settings of the kinematic generator
 * (signal/docs/kinematic-generator.md). The trajectory's numbers map as follows:
 * - cadence → stride time; stride CV → the generator's stride-time CV;
 * - asymmetry → a longer swing (shorter stance) of the affected leg, steps timed so both double
 *   supports stay equal, smaller excursions of that leg, and after a stroke some circumduction and a
 *   slightly stiff swing knee;
 * - slower walkers take shorter steps (bout excursions scale with cadence), and in Parkinson's
 *   disease steps are shorter at the same cadence, so speed follows from the body model and height;
 * - arms: 2:1 below the trajectory's cadence threshold and 1:1 above it, a range that grows with
 *   recovery and is smaller on the affected side; an arm on a cane or rollator is held still.
 * Two things of the plan the generator cannot express. Its arms are locked to the contralateral leg,
 * so coupling strength is not a setting: every swinging arm comes out strongly coupled (R near 1)
 * whatever the week's planned coupling, and arms that drift on their own rhythm cannot be made.
 * It also models no turns: the hallway test (walk, turn, walk back) becomes three straight passes
 * with a short stand at each end, which the analysis sees as separate bouts.
 * The factors below are choices of this invented scenario, not reference values.
 */
export function weekKinematicOptions(patient: DemoPatient, index: number, week: number, serials: Record<string, string>, startUtc: string): DemoWeek {
  const t = patient.trajectory;
  const f = recoveryFraction(t, week);
  const seed = index * 1000 + week + 1;
  const cadence = lerp(t.cadenceStart, t.cadenceEnd, f) + 2 * wobble(seed);
  const cv = Math.max(1.2, lerp(t.strideCvStartPct, t.strideCvEndPct, f) + 0.35 * wobble(seed + 7));
  const asym = Math.max(0, lerp(t.asymmetryStart, t.asymmetryEnd, f));
  const affected = t.affectedSide;
  // Slower walking spends longer in stance (common practice: stance ≈ 60 % at comfortable speed).
  const stanceSound = Math.min(0.7, 0.6 + Math.max(0, 105 - cadence) * 0.002);
  // The affected leg's swing is `asym` longer than the sound leg's (the trajectory's definition).
  const stanceAffected = Math.max(0.52, 1 - (1 - stanceSound) * (1 + asym));
  const bySide = <T>(onAffected: T, onSound: T): { left: T; right: T } => (affected === "left" ? { left: onAffected, right: onSound } : { left: onSound, right: onAffected });
  const stance = bySide(stanceAffected, stanceSound);
  // Right IC at this fraction of the left stride: equal double supports on both sides.
  const stepFraction = 0.5 + (stance.left - stance.right) / 2;
  const stroke = patient.condition === "stroke";
  // Scenario choice: step excursions from 0.55 at 55 steps/min to 1 at 105 steps/min.
  const stepScale = Math.min(1, Math.max(0.55, 0.55 + (0.45 * (cadence - 55)) / 50)) * (patient.condition === "parkinsons" ? 0.88 : 1);
  const aid = demoWalkingAid(patient, week);
  const { heldStill, forceOneToOne } = armsWithAid(aid, affected);
  const range = 14 + 24 * f + 2 * wobble(seed + 5);
  const coupling: "1:1" | "2:1" = !forceOneToOne && t.armOneToOneAboveCadence !== null && cadence < t.armOneToOneAboveCadence ? "2:1" : "1:1";
  // Freezing of gait: standing pauses inside the walk, fewer as the patient improves.
  const freezes = /freezing/i.test(patient.conditionDetail) ? (f < 0.5 ? [{ atS: 9, durationS: 2.4, boutIndex: 0 }, { atS: 14, durationS: 1.6, boutIndex: 2 }] : [{ atS: 12, durationS: 1.2, boutIndex: 1 }]) : [];
  const misalignment = 8 + 4 * Math.abs(wobble(seed + 3));
  const options: KinematicOptions = {
    seed,
    sampleRateHz: index % 3 === 0 ? 128 : 100,
    startUtc,
    heightCm: DEMO_HEIGHTS_CM[patient.key] ?? 170,
    leadInS: 4,
    leadOutS: 3,
    bouts: [0, 1, 2].map(() => ({ durationS: 27, romScale: stepScale })),
    standingBetweenS: 3,
    strideTimeS: 120 / cadence,
    strideTimeCvPct: cv,
    stepFraction,
    legs: bySide(
      { stanceFraction: stanceAffected, romScale: 1 - 0.5 * asym, swingKneeScale: stroke ? 1 - 0.6 * asym : 1, circumductionDeg: stroke ? 25 * asym : 0 },
      { stanceFraction: stanceSound },
    ),
    hesitations: freezes,
    arms: {
      coupling,
      relativePhaseDeg: 15 + 10 * wobble(seed + 11),
      // The affected side swings less (common practice in hemiparesis and Parkinson's disease).
      rangeDeg: bySide(range * (1 - 1.5 * asym), range),
      heldStill,
      // Once in a while a wrist band is put on end for end.
      wear: week === 2 && index % 5 === 4 ? { left: "upside-down" } : {},
    },
    misalignmentDeg: Object.fromEntries(PLACEMENTS.map((p, k) => [p, misalignment + k])),
    // One week a shank device's clock is 60 ms off the others' (the analysis aligns the legs).
    clockOffsetS: week === 3 && index % 4 === 2 ? { right_shank: 0.06 } : {},
  };
  const files: DemoFileOptions = {
    serials,
    gyroUnits: index % 4 === 1 ? "rad/s" : "deg/s",
    startOffsetsS: { left_shank: 0, right_shank: 0.012, left_wrist: 0.031, right_wrist: 0.047 },
    // Home recordings are not perfect: one week with an upside-down shank, one with a dropout.
    upsideDownShank: week === 4 && index % 5 === 2 ? "right_shank" : null,
    gaps: week === 6 && index % 4 === 0 ? [{ placement: "left_wrist", startS: 50, durationS: 0.09 }] : [],
  };
  return { options, files };
}

/**
 * The sensor CSV files of a generated session as the devices would write them: the session base
 * is the first device's start; a device starting `offset` later loses the samples before it and
 * carries a later start_utc (rounded to the header's millisecond), with its own clock from 0.
 */
export function demoSessionFiles(recordings: readonly SensorRecording[], o: DemoFileOptions): { fileName: string; text: string }[] {
  const RAD_PER_DEG = Math.PI / 180;
  return recordings.map((r) => {
    const placement = r.placement as DemoPlacement;
    const fs = r.nominalSampleRateHz;
    const skip = Math.round((o.startOffsetsS[placement] ?? 0) * fs);
    const gaps = o.gaps.filter((g) => g.placement === placement);
    const kept = new Uint32Array(r.timeS.length);
    let n = 0;
    for (let j = skip; j < r.timeS.length; j++) {
      const tS = r.timeS[j]!;
      if (gaps.length === 0 || !gaps.some((g) => tS >= g.startS && tS < g.startS + g.durationS)) kept[n++] = j;
    }
    const keep = kept.subarray(0, n);
    const t0 = r.timeS[skip]!;
    const column = (x: ArrayLike<number>, scale = 1) => {
      const out = new Float64Array(n);
      for (let k = 0; k < n; k++) out[k] = x[keep[k]!]! * scale;
      return out;
    };
    // Upside down: 180° about the forward axis, so y and z change sign on both sensors.
    const flip = o.upsideDownShank === placement ? -1 : 1;
    const g = o.gyroUnits === "rad/s" ? RAD_PER_DEG : 1;
    const serial = o.serials[placement] ?? r.deviceSerial;
    const startUtc = new Date(Date.parse(r.startUtc) + Math.round(t0 * 1000)).toISOString();
    const text = sensorCsvText(
      { deviceSerial: serial, placement: null, sampleRateHz: fs, startUtc, gyroUnits: o.gyroUnits },
      column(r.timeS).map((tS) => Math.round((tS - t0) * 1e5) / 1e5),
      [column(r.accX), column(r.accY, flip), column(r.accZ, flip)],
      [column(r.gyroX, g), column(r.gyroY, g * flip), column(r.gyroZ, g * flip)],
    );
    return { fileName: `walk-${placement.replace("_", "-")}-${serial}.csv`, text };
  });
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
      .insert({ email: s.email, display_name: s.displayName, password_hash: hash, role: s.role, status: "active", is_demo: true })
      .returning("id");
    staff.set(s.key, row.id as string);
  }
  // Staff roles sign in with a second factor; the demo staff share the published demo secret.
  await enrolDemoStaff(db, deps.config);
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
        expected_uploads_per_week: 1,
        height_cm: DEMO_HEIGHTS_CM[p.key] ?? null,
      })
      .returning("id");
    const patientId = pat.id as string;
    for (const c of p.clinicians) await db("caseload").insert({ clinician_id: staff.get(c), patient_id: patientId, since: enrolledAt });
    let patientUserId: string | null = null;
    if (p.email) {
      const [u] = await db("users")
        .insert({ email: p.email, display_name: p.displayName, password_hash: hash, role: "patient", status: "active", patient_id: patientId, is_demo: true })
        .returning("id");
      patientUserId = u.id as string;
    }
    if (p.researchConsent) {
      // Consent given on the enrolment day: demo patients with an account confirmed it themselves in
      // the portal; for the others the admin recorded the signed paper form (both count).
      await insertConsentEvent(db, {
        patientId,
        kind: "given",
        at: enrolledAt,
        ...(patientUserId
          ? { recorderRole: "patient" as const, recordedBy: patientUserId }
          : { recorderRole: "admin" as const, recordedBy: staff.get("admin")!, reason: "signed paper consent form filed at the enrolment visit" }),
      });
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
      const plan = weekKinematicOptions(p, index, week, serials, at.toISOString());
      const files = demoSessionFiles(synthesizeKinematicSession(plan.options).recordings, plan.files);
      const req = { ip: "127.0.0.1", headers: { "user-agent": "pendula-demo-seed" }, get: () => "pendula-demo-seed" } as unknown as Request;
      const bodies = files.map((f) => ({ originalName: f.fileName, bytes: f.text }));
      const result = await withUploadFiles(deps.config.upload.tmpDir, bodies, (paths) => uploadSession(deps, req, { auth: uploader, patientId, files: paths }));
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
  if (!isDemoMode(config)) {
    // The demo accounts share a published password; they must never reach a production database.
    console.error("demo seed: refused, PENDULA_MODE is not demo");
    process.exit(2);
  }
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
