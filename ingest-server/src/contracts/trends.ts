import { z } from "zod";
import { isoDateTime } from "./common";

export const trendsQuery = z.object({
  /** Comma-separated metric keys; default all stored ones. */
  metrics: z.string().max(2000).optional(),
  from: isoDateTime.optional(),
  to: isoDateTime.optional(),
});

export const trendPoint = z
  .object({
    sessionId: z.uuid(),
    recordedAt: isoDateTime,
    value: z.number(),
    flag: z.string().optional(),
    /** Strides/steps behind the value; null when the analysis gave no count. */
    n: z.number().int().nullable().optional(),
    /** Walking aid recorded for the session the point comes from. */
    walkingAid: z.string().nullable().optional(),
  })
  .catchall(z.unknown());

export const trendMetric = z
  .object({
    key: z.string(),
    unit: z.string(),
    label: z.string().optional(),
    /** What `points[].n` counts: "strides", "steps" or "arm cycles". */
    countNoun: z.string().optional(),
    points: z.array(trendPoint),
  })
  // Clinical-change annotations (bands, mdc, events…) are added freely by the clinical module.
  .catchall(z.unknown());

export const trendsResponse = z
  .object({
    patientId: z.uuid(),
    metrics: z.array(trendMetric),
  })
  .catchall(z.unknown());
export type TrendsResponse = z.infer<typeof trendsResponse>;
