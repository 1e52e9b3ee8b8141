import { queryOptions, useMutation, useQueryClient, useSuspenseQuery } from "@tanstack/react-query";
import { z } from "zod";
import { HEIGHT_CM_RANGE, patientUpdate, reprocessResponse, type PatientUpdate } from "@pendula/ingest-server/contracts";
import { api, request } from "@/lib/api-client";

// GET /api/patients/:id/trends (ingest-server/src/contracts/trends.ts) with the clinical-change
// annotations (ingest-server/src/clinical/annotate-trends.ts): bands with citations, MDC, slope
// flag, coordination events and cautions. All annotations are optional so a bare trend still draws.
const flagEnum = z.enum(["improved", "worsened", "within-error"]);

export const trendPointSchema = z.object({
  sessionId: z.string(),
  recordedAt: z.string(),
  value: z.number(),
  flag: z.string().optional(),
  baseline: z.boolean().optional(),
  /** Strides/steps/arm cycles behind the value (metric's countNoun says which). */
  n: z.number().nullish(),
  walkingAid: z.string().nullish(),
  /** The session's walking speed, on speed-dependent metrics (PCI, stride-time CV). */
  walkingSpeedMPerS: z.number().optional(),
  /** Shown but not compared (e.g. "few-strides", "weak-coupling"). */
  excludedReason: z.string().optional(),
});

export const bandSchema = z.object({
  low: z.number(),
  high: z.number(),
  label: z.string(),
  citation: z.string().optional(),
  /** Who the band describes, how they walked and with what system (clinical/reference-bands.ts). */
  population: z.object({ description: z.string() }).catchall(z.unknown()).optional(),
  walkingCondition: z.string().optional(),
  measurementSystem: z.string().optional(),
  note: z.string().optional(),
});
export type TrendBand = z.infer<typeof bandSchema>;

export const mdcSchema = z.object({
  value: z.number(),
  source: z.string(),
  citation: z.string().optional(),
  confirmed: z.boolean().optional(),
  sem: z.number().optional(),
});

// The mean may be missing (an angle spread evenly has no mean); the summary then shows no change.
export const baselineSchema = z.object({ mean: z.number().nullable(), n: z.number().nullish() });

export const slopeFlagSchema = z.object({
  flag: flagEnum,
  slopePerWeek: z.number(),
  changeOverWindow: z.number().optional(),
  windowWeeks: z.number().optional(),
  n: z.number().optional(),
});

export const trendMetricSchema = z.object({
  key: z.string(),
  unit: z.string(),
  label: z.string().optional(),
  countNoun: z.string().optional(),
  points: z.array(trendPointSchema),
  bands: z.array(bandSchema).optional(),
  mdc: mdcSchema.nullish(),
  /** The patient's baseline (first compared sessions) the flags measure from; null until there are enough. */
  baseline: baselineSchema.nullish(),
  slopeFlag: slopeFlagSchema.nullish(),
  direction: z.string().nullish(),
  /** Why no band is drawn for this patient (e.g. "No published band for this patient…"). */
  bandNote: z.string().nullish(),
  /** Why speed is shown beside this metric, with its source. */
  speedNote: z.string().optional(),
});
export type TrendMetric = z.infer<typeof trendMetricSchema>;

export const coordinationEventSchema = z.object({
  kind: z.string(),
  sessionId: z.string().optional(),
  recordedAt: z.string(),
  metricKey: z.string().optional(),
  from: z.number().optional(),
  to: z.number().optional(),
  message: z.string(),
});
export type CoordinationEvent = z.infer<typeof coordinationEventSchema>;

export const trendsSchema = z.object({
  metrics: z.array(trendMetricSchema),
  events: z.array(coordinationEventSchema).optional(),
  cautions: z.array(z.string()).optional(),
});
export type Trends = z.infer<typeof trendsSchema>;

export const patientDetailSchema = z.object({
  id: z.string(),
  displayName: z.string(),
  researchId: z.string().optional(),
  enrolledOn: z.string().optional(),
  birthYear: z.number().optional(),
  condition: z.string().optional(),
  conditionDetail: z.string().nullish(),
  expectedUploadsPerWeek: z.number().optional(),
  heightCm: z.number().nullish(),
});
export type PatientDetail = z.infer<typeof patientDetailSchema>;

export const patientSessionSchema = z.object({
  id: z.string(),
  status: z.string(),
  recordedAt: z.string(),
  durationS: z.number().nullish(),
  error: z.string().nullish(),
  cadenceStepsPerMin: z.number().nullish(),
  strideTimeCvPct: z.number().nullish(),
  phaseCoordinationIndexPct: z.number().nullish(),
  walkingSpeedMPerS: z.number().nullish(),
  strideLengthM: z.number().nullish(),
  walkingAid: z.string().nullish(),
});
export type PatientSession = z.infer<typeof patientSessionSchema>;

export const trendsKeys = {
  all: ["patient-trends"] as const,
  patient: (id: string) => [...trendsKeys.all, id] as const,
  detail: (id: string) => [...trendsKeys.patient(id), "detail"] as const,
  trends: (id: string) => [...trendsKeys.patient(id), "trends"] as const,
  sessions: (id: string) => [...trendsKeys.patient(id), "sessions"] as const,
};

const enc = encodeURIComponent;

export const patientDetailQueryOptions = (id: string) =>
  queryOptions({ queryKey: trendsKeys.detail(id), queryFn: ({ signal }) => api.get(`/patients/${enc(id)}`, { schema: patientDetailSchema, signal }) });

export const trendsQueryOptions = (id: string) =>
  queryOptions({ queryKey: trendsKeys.trends(id), queryFn: ({ signal }) => api.get(`/patients/${enc(id)}/trends`, { schema: trendsSchema, signal }) });

export const patientSessionsQueryOptions = (id: string) =>
  queryOptions({
    queryKey: trendsKeys.sessions(id),
    queryFn: ({ signal }) =>
      api.get(`/patients/${enc(id)}/sessions`, { schema: z.object({ items: z.array(patientSessionSchema) }), query: { limit: 500 }, signal }),
  });

export const usePatientDetail = (id: string) => useSuspenseQuery(patientDetailQueryOptions(id));
export const useTrends = (id: string) => useSuspenseQuery(trendsQueryOptions(id));
export const usePatientSessions = (id: string) => useSuspenseQuery(patientSessionsQueryOptions(id));

export { HEIGHT_CM_RANGE, patientUpdate, type PatientUpdate };

/** PATCH /api/patients/:id (ingest-server/src/contracts/patients.ts `patientUpdate`): the patient's height. */
export const updatePatient = (id: string, input: PatientUpdate) =>
  request(`/patients/${enc(id)}`, { method: "PATCH", body: input, schema: patientDetailSchema });

export function useUpdatePatient(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: PatientUpdate) => updatePatient(id, input),
    onSuccess: (detail) => queryClient.setQueryData(trendsKeys.detail(id), detail),
    onSettled: () => queryClient.invalidateQueries({ queryKey: trendsKeys.detail(id) }),
  });
}

/**
 * Re-runs the analysis of sessions from their stored raw files (POST /api/sessions/:id/reprocess,
 * one at a time), e.g. after the height was entered so their walking speed can be computed.
 */
export async function reprocessSessions(ids: readonly string[]): Promise<number> {
  for (const id of ids) await request(`/sessions/${enc(id)}/reprocess`, { method: "POST", schema: reprocessResponse });
  return ids.length;
}

export function useReprocessSessions(patientId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (ids: readonly string[]) => reprocessSessions(ids),
    onSettled: () => queryClient.invalidateQueries({ queryKey: trendsKeys.patient(patientId) }),
  });
}
