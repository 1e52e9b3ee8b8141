import { z } from "zod";
import { isoDateTime } from "./common";

/**
 * GET /api/patients/:id/trends: one point per processed session and metric, with the clinical-change
 * annotations of clinical/annotate-trends.ts (baseline, MDC, flags, reference bands, coordination
 * events, cautions). Every field the server sends is named here and nothing else is accepted, so a
 * new annotation fails the route tests until it is described.
 *
 * Metric keys (`key`, `metricKey`, `importantChange.metric`) are plain strings here: the metric
 * catalogue is the one description of which keys exist.
 */

export const trendsQuery = z.object({
  /** Comma-separated metric keys; default all stored ones. */
  metrics: z.string().max(2000).optional(),
  from: isoDateTime.optional(),
  to: isoDateTime.optional(),
});

/** A point's change against the baseline; `changed` is for angles, which have no better/worse direction. */
export const CHANGE_FLAGS = ["improved", "worsened", "within-error", "changed"] as const;
export type ChangeFlag = (typeof CHANGE_FLAGS)[number];

/** `higher-is-better` / `higher-is-worse`; null when the metric has no agreed clinical direction. */
export const METRIC_DIRECTIONS = ["higher-is-better", "higher-is-worse"] as const;

export const trendPoint = z.strictObject({
  sessionId: z.uuid(),
  recordedAt: isoDateTime,
  value: z.number(),
  /** Absent on baseline sessions, excluded points, and before a baseline and MDC exist. */
  flag: z.enum(CHANGE_FLAGS).optional(),
  /** True for the sessions that form the baseline. */
  baseline: z.boolean().optional(),
  /** Why the point is shown but not compared: "few-strides", "weak-coupling", "no-coupling-strength". */
  excludedReason: z.string().optional(),
  /** Strides/steps behind the value; null when the analysis gave no count. */
  n: z.number().int().nullable(),
  /** Walking aid recorded for the session the point comes from. */
  walkingAid: z.string().nullable(),
  /** The session's walking speed, on speed-dependent metrics (PCI, stride-time CV) only. */
  walkingSpeedMPerS: z.number().optional(),
});
export type TrendPoint = z.infer<typeof trendPoint>;

export const trendBaseline = z.strictObject({
  /** Mean of the baseline sessions; for an angle, the circular mean in (−180°, 180°]. */
  mean: z.number(),
  /** Sample SD (n − 1); for an angle, of the wrapped deviations from the circular mean. */
  sd: z.number(),
  n: z.number().int(),
});
export type TrendBaseline = z.infer<typeof trendBaseline>;

export const MDC_SOURCES = ["published", "patient-baseline"] as const;

export const trendMdc = z.strictObject({
  /** MDC95 in the metric's unit. */
  value: z.number(),
  source: z.enum(MDC_SOURCES),
  citation: z.string(),
  /** The SEM behind `value` (MDC95 / 2.772). */
  sem: z.number(),
  /** Who, how and where the published value comes from; or how the baseline value was formed. */
  basis: z.string(),
  /** The other estimate when both existed and this one was larger. */
  alternative: z.strictObject({ value: z.number(), source: z.enum(MDC_SOURCES), citation: z.string() }).optional(),
});
export type TrendMdc = z.infer<typeof trendMdc>;

export const trendSlopeFlag = z.strictObject({
  flag: z.enum(CHANGE_FLAGS),
  slopePerWeek: z.number(),
  changeOverWindow: z.number(),
  windowWeeks: z.number(),
  spanWeeks: z.number(),
  n: z.number().int(),
  fromSessionId: z.uuid(),
  toSessionId: z.uuid(),
});
export type TrendSlopeFlag = z.infer<typeof trendSlopeFlag>;

export const bandPopulation = z.strictObject({
  /** Who the cohort was, in words shown to the clinician. */
  description: z.string(),
  role: z.enum(["patient-group", "healthy-comparison"]),
  /** Inclusive age limits in years; absent = no limit on that side. */
  ageMin: z.number().optional(),
  ageMax: z.number().optional(),
  /** "source" when the limits are the study's own, "common practice" when they are a cut-off for the study's wording. */
  ageLimitsBasis: z.enum(["source", "common practice"]),
  /** Patient conditions the band may be shown for; absent = any condition. */
  conditions: z.array(z.string()).optional(),
});

/** A published reference band with who it describes and where it comes from. */
export const trendBand = z.strictObject({
  id: z.string(),
  low: z.number(),
  high: z.number(),
  /** Short text shown on the chart; names the population. */
  label: z.string(),
  /** Authors, journal and the table/figure/abstract location, in one line. */
  citation: z.string(),
  population: bandPopulation,
  walkingCondition: z.string(),
  measurementSystem: z.string(),
  /** The value exactly as published, with its unit. */
  publishedValue: z.string(),
  /** How low/high were derived from the published value. */
  derivation: z.string(),
  location: z.string(),
  note: z.string().optional(),
});
export type TrendBand = z.infer<typeof trendBand>;

/** A published clinically important change, for interpretation beside the MDC; flags never use it. */
export const importantChange = z.strictObject({
  id: z.string(),
  metric: z.string(),
  condition: z.string(),
  /** Smallest first, in the metric's unit. */
  thresholds: z.array(z.strictObject({ value: z.number(), meaning: z.string() })),
  population: z.string(),
  method: z.string(),
  citation: z.string(),
  location: z.string(),
});
export type ImportantChange = z.infer<typeof importantChange>;

export const trendMetric = z.strictObject({
  key: z.string(),
  unit: z.string(),
  /** From the metric catalogue; absent for a stored key the catalogue does not describe. */
  label: z.string().optional(),
  /** What `points[].n` counts: "strides", "steps" or "arm cycles". */
  countNoun: z.string().optional(),
  points: z.array(trendPoint),
  /** Why speed is shown beside this metric, with its source; absent for metrics that do not depend on speed. */
  speedNote: z.string().optional(),
  /** Null until there are enough compared sessions. */
  baseline: trendBaseline.nullable(),
  mdc: trendMdc.nullable(),
  slopeFlag: trendSlopeFlag.nullable(),
  direction: z.enum(METRIC_DIRECTIONS).nullable(),
  bands: z.array(trendBand),
  /** Why no band is shown; null when bands are shown. */
  bandNote: z.string().nullable(),
  importantChange: importantChange.nullable(),
});
export type TrendMetric = z.infer<typeof trendMetric>;

/** Pace around an arm–leg mode change: means before and after, and whether they differ beyond MDC95. */
export const paceComparison = z.strictObject({
  before: z.number().nullable(),
  after: z.number().nullable(),
  mdc: z.number().nullable(),
  beyondMdc: z.boolean().nullable(),
});

export const COORDINATION_EVENT_KINDS = ["arm-leg-mode-change", "coupling-drop", "pci-rise"] as const;

export const coordinationEvent = z.strictObject({
  kind: z.enum(COORDINATION_EVENT_KINDS),
  sessionId: z.uuid(),
  recordedAt: isoDateTime,
  metricKey: z.string(),
  from: z.number(),
  to: z.number(),
  message: z.string(),
  /** Mode changes only: cadence and walking speed before and after. */
  pace: z.strictObject({ cadenceStepsPerMin: paceComparison, walkingSpeedMPerS: paceComparison.nullable() }).optional(),
});
export type CoordinationEvent = z.infer<typeof coordinationEvent>;

export const trendsResponse = z.strictObject({
  patientId: z.uuid(),
  metrics: z.array(trendMetric),
  events: z.array(coordinationEvent),
  /** Shown beside every flag and event. */
  cautions: z.array(z.string()),
});
export type TrendsResponse = z.infer<typeof trendsResponse>;
