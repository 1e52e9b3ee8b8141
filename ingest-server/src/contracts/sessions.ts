import { z } from "zod";
import type { Analysis } from "@pendula/signal";
import { isoDateTime } from "./common";
import { PLACEMENTS, SESSION_STATUSES, WALKING_AIDS } from "./enums";

/** Multipart fields besides `files` (one file per device; BIDS sets as their three files). */
export const uploadFields = z.object({
  patientId: z.uuid({ error: "patientId must be a UUID" }).optional(),
  /** BIDS Motion only: clock time of the first sample (BIDS keeps it in *_scans.tsv acq_time). */
  startUtc: isoDateTime.optional(),
});

export const uploadResponse = z.strictObject({
  id: z.uuid(),
  status: z.enum(SESSION_STATUSES),
  duplicate: z.boolean().optional(),
});
export type UploadResponse = z.infer<typeof uploadResponse>;

export const sessionFile = z.strictObject({
  placement: z.enum(PLACEMENTS),
  deviceSerial: z.string().optional(),
  sizeBytes: z.number().int(),
  format: z.string(),
  originalName: z.string(),
});

/** The stored analysis object exactly as signal's analyze() returns it (and the CLI prints with --json). */
export const analysisSchema = z.custom<Analysis>((v) => typeof v === "object" && v !== null && "metrics" in v, {
  error: "analysis must be the analyze() object",
});

export const sessionSummary = z.strictObject({
  id: z.uuid(),
  patientId: z.uuid(),
  status: z.enum(SESSION_STATUSES),
  progressPct: z.number().int(),
  recordedAt: isoDateTime,
  uploadedAt: isoDateTime,
  durationS: z.number().nullable(),
  algorithmVersion: z.string().nullable(),
  error: z.string().optional(),
  cadenceStepsPerMin: z.number().nullable().optional(),
  strideTimeCvPct: z.number().nullable().optional(),
  phaseCoordinationIndexPct: z.number().nullable().optional(),
  walkingSpeedMPerS: z.number().nullable().optional(),
  strideLengthM: z.number().nullable().optional(),
  /** Walking aid used in this test, as recorded by the clinician; null when not recorded. */
  walkingAid: z.enum(WALKING_AIDS).nullable().optional(),
});
export type SessionSummary = z.infer<typeof sessionSummary>;

export const sessionDetail = sessionSummary.extend({
  files: z.array(sessionFile),
  analysis: analysisSchema.optional(),
  /** Per stored metric key (session_metrics), how many strides/steps/arm cycles its value rests on, when known. */
  metricCounts: z.record(z.string(), z.strictObject({ n: z.number().int(), countNoun: z.string() })).optional(),
});
export type SessionDetail = z.infer<typeof sessionDetail>;

export const signalQuery = z.object({
  placement: z.enum(PLACEMENTS).optional(),
  from: z.coerce.number().min(0).optional(),
  to: z.coerce.number().min(0).optional(),
  maxPoints: z.coerce.number().int().min(10).max(20_000).default(2000),
});

export const signalResponse = z.strictObject({
  sessionId: z.uuid(),
  unit: z.literal("deg/s"),
  quantity: z.literal("sagittal angular velocity"),
  fromS: z.number(),
  toS: z.number(),
  traces: z.array(
    z.strictObject({
      placement: z.enum(PLACEMENTS),
      sampleRateHz: z.number(),
      /** True when min/max decimation was applied (each bucket gives its minimum and maximum). */
      decimated: z.boolean(),
      timeS: z.array(z.number()),
      value: z.array(z.number()),
    }),
  ),
});
export type SignalResponse = z.infer<typeof signalResponse>;

const walkingAidMessage = `walkingAid must be one of ${WALKING_AIDS.join(", ")}, or null to clear it`;

/** PATCH /api/sessions/:id: what the clinician records about a session. A bad value is a 422. */
export const sessionUpdate = z
  .object({
    walkingAid: z.enum(WALKING_AIDS, { error: walkingAidMessage }).nullable(),
  })
  .strict();
export type SessionUpdate = z.infer<typeof sessionUpdate>;
export const sessionUpdateResponse = z.strictObject({ id: z.uuid(), walkingAid: z.enum(WALKING_AIDS).nullable() });

export const reprocessResponse = z.strictObject({ id: z.uuid(), status: z.enum(SESSION_STATUSES) });
