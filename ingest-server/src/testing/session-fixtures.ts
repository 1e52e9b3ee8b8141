import { ListObjectsV2Command } from "@aws-sdk/client-s3";
import request from "supertest";
import type { Test } from "supertest";
// The generator is signal's own synthetic gait source (truth = its own events); it is not part of
// the package's public entry, so tests import it from the workspace.
import { synthesizeSession, type SynthOptions, type SynthSession } from "../../../signal/src/synth";
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
