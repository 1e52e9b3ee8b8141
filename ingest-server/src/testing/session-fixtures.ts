import { ListObjectsV2Command } from "@aws-sdk/client-s3";
import request from "supertest";
import type { Test } from "supertest";
// The generator is signal's own synthetic gait source (truth = its own events); it is not part of
// the package's public entry, so tests import it from the workspace.
import { synthesizeSession, type SynthOptions, type SynthSession } from "../../../signal/src/synth";
import { readSensorCsv } from "@pendula/signal";
import { createS3Client } from "../storage/object-storage";
import type { TestContext } from "./harness";

export const FOUR_PLACEMENTS = ["left_shank", "right_shank", "left_wrist", "right_wrist"] as const;

/** Registers one device per placement and assigns it to the patient from `from` (open-ended). */
export async function seedDevices(
  ctx: TestContext,
  patientId: string,
  prefix: string,
  options: { from?: string; to?: string | null; placements?: readonly string[] } = {},
): Promise<Record<string, string>> {
  const serials: Record<string, string> = {};
  for (const placement of options.placements ?? FOUR_PLACEMENTS) {
    const serial = `${prefix}-${placement.replace("_", "-").toUpperCase()}`;
    const [device] = await ctx.db("devices").insert({ serial, kind: "imu6", firmware: "2.4.1", status: "assigned" }).returning("id");
    await ctx.db("device_assignments").insert({
      device_id: device.id,
      patient_id: patientId,
      placement,
      valid_from: options.from ?? "2026-01-01T00:00:00Z",
      valid_to: options.to ?? null,
    });
    serials[placement] = serial;
  }
  return serials;
}

export function synthFor(serials: Record<string, string>, options: SynthOptions = {}): SynthSession {
  return synthesizeSession({
    durationS: 60,
    placements: [...FOUR_PLACEMENTS],
    deviceSerials: serials,
    ...options,
  });
}

export function attachFiles(req: Test, files: Array<{ fileName: string; text: string | Buffer }>): Test {
  for (const f of files) req.attach("files", Buffer.isBuffer(f.text) ? f.text : Buffer.from(f.text, "utf8"), f.fileName);
  return req;
}

export function upload(ctx: TestContext, token: string, files: Array<{ fileName: string; text: string | Buffer }>, fields: Record<string, string> = {}): Test {
  let req = request(ctx.app).post("/api/sessions").set("Authorization", `Bearer ${token}`);
  for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
  return attachFiles(req, files);
}

/** Every object key in the test bucket (to prove an upload left nothing behind). */
export async function listObjectKeys(ctx: TestContext): Promise<string[]> {
  const client = createS3Client(ctx.config.s3);
  try {
    const keys: string[] = [];
    let token: string | undefined;
    do {
      const out = await client.send(new ListObjectsV2Command({ Bucket: ctx.config.s3.bucket, ContinuationToken: token }));
      for (const o of out.Contents ?? []) if (o.Key) keys.push(o.Key);
      token = out.IsTruncated ? out.NextContinuationToken : undefined;
    } while (token);
    return keys.sort();
  } finally {
    client.destroy();
  }
}

export async function storedCounts(ctx: TestContext) {
  const [s] = await ctx.db("walk_sessions").count<{ n: string }[]>({ n: "*" });
  const [f] = await ctx.db("raw_files").count<{ n: string }[]>({ n: "*" });
  return { sessions: Number(s?.n), files: Number(f?.n), objects: (await listObjectKeys(ctx)).length };
}

/**
 * A processed session written straight to the tables (for list, trend and export tests that do
 * not need a real analysis). The analysis column holds a minimal object.
 */
export async function insertDoneSession(
  ctx: TestContext,
  patientId: string,
  recordedAt: string,
  metrics: Record<string, number>,
  options: { algorithmVersion?: string; units?: Record<string, string> } = {},
): Promise<string> {
  const [row] = await ctx.db("walk_sessions")
    .insert({
      patient_id: patientId,
      recorded_at: recordedAt,
      status: "done",
      progress_pct: 100,
      analysis: JSON.stringify({ metrics }),
      algorithm_version: options.algorithmVersion ?? "test-1",
      content_sha256: `${patientId}-${recordedAt}`,
    })
    .returning("id");
  const rows = Object.entries(metrics).map(([metric_key, value]) => ({
    session_id: row.id,
    patient_id: patientId,
    recorded_at: recordedAt,
    metric_key,
    value,
    unit: options.units?.[metric_key] ?? (metric_key.endsWith("Pct") ? "%" : metric_key === "cadenceStepsPerMin" ? "/min" : "1"),
  }));
  if (rows.length) await ctx.db("session_metrics").insert(rows);
  return row.id as string;
}

const TRACKED_POINT: Record<string, string> = { left_shank: "LeftShank", right_shank: "RightShank", left_wrist: "LeftWrist", right_wrist: "RightWrist" };

/**
 * The same synthetic walk as one BIDS Motion set (one tracking system, one tracked point per
 * sensor, a LATENCY column), laid out per the BIDS motion specification: headerless
 * `_motion.tsv`, `_channels.tsv`, `_motion.json`. Needs a synth without start offsets or jitter,
 * so the sensors share one clock as a BIDS tracking system does.
 */
export function bidsSetFromSynth(synth: SynthSession, stem = "sub-07_task-homewalk_tracksys-imu"): Array<{ fileName: string; text: string }> {
  const recordings = synth.files.map((f) => ({ placement: f.placement, rec: readSensorCsv(f.text, f.fileName) }));
  const n = Math.min(...recordings.map((r) => r.rec.timeS.length));
  const channels = ["name\tcomponent\ttype\ttracked_point\tunits", "time\tn/a\tLATENCY\tn/a\ts"];
  for (const { placement } of recordings) {
    const point = TRACKED_POINT[placement]!;
    for (const c of ["x", "y", "z"]) channels.push(`${point}_acc_${c}\t${c}\tACCEL\t${point}\tm/s^2`);
    for (const c of ["x", "y", "z"]) channels.push(`${point}_gyro_${c}\t${c}\tGYRO\t${point}\tdeg/s`);
  }
  const rows: string[] = [];
  for (let i = 0; i < n; i++) {
    const cells = [recordings[0]!.rec.timeS[i]!.toFixed(5)];
    for (const { rec } of recordings) for (const a of [rec.accX, rec.accY, rec.accZ, rec.gyroX, rec.gyroY, rec.gyroZ]) cells.push(a[i]!.toFixed(4));
    rows.push(cells.join("\t"));
  }
  const json = { TaskName: "homewalk", SamplingFrequency: recordings[0]!.rec.nominalSampleRateHz, TrackingSystemName: "imu", Manufacturer: "Fernhollow test rig" };
  return [
    { fileName: `${stem}_motion.tsv`, text: rows.join("\n") + "\n" },
    { fileName: `${stem}_channels.tsv`, text: channels.join("\n") + "\n" },
    { fileName: `${stem}_motion.json`, text: JSON.stringify(json, null, 2) },
  ];
}
