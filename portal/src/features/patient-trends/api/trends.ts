import { queryOptions, useMutation, useQueryClient, useSuspenseQuery } from "@tanstack/react-query";
import {
  HEIGHT_CM_RANGE,
  patientDetail,
  patientSessions,
  patientUpdate,
  reprocessResponse,
  trendsResponse,
  type PatientUpdate,
} from "@pendula/ingest-server/contracts";
import { api, request } from "@/lib/api-client";

// GET /api/patients/:id/trends answers with the server's strict contract: each metric's points,
// baseline, MDC, slope flag, reference bands with their cohorts, a published important change,
// coordination events and cautions (ingest-server/src/clinical/annotate-trends.ts).
export type {
  CoordinationEvent,
  PatientDetail,
  SessionSummary as PatientSession,
  TrendBand,
  TrendMetric,
  TrendsResponse as Trends,
} from "@pendula/ingest-server/contracts";

export const trendsKeys = {
  all: ["patient-trends"] as const,
  patient: (id: string) => [...trendsKeys.all, id] as const,
  detail: (id: string) => [...trendsKeys.patient(id), "detail"] as const,
  trends: (id: string) => [...trendsKeys.patient(id), "trends"] as const,
  sessions: (id: string) => [...trendsKeys.patient(id), "sessions"] as const,
};

const enc = encodeURIComponent;

export const patientDetailQueryOptions = (id: string) =>
  queryOptions({ queryKey: trendsKeys.detail(id), queryFn: ({ signal }) => api.get(`/patients/${enc(id)}`, { schema: patientDetail, signal }) });

export const trendsQueryOptions = (id: string) =>
  queryOptions({ queryKey: trendsKeys.trends(id), queryFn: ({ signal }) => api.get(`/patients/${enc(id)}/trends`, { schema: trendsResponse, signal }) });

export const patientSessionsQueryOptions = (id: string) =>
  queryOptions({
    queryKey: trendsKeys.sessions(id),
    queryFn: ({ signal }) =>
      api.get(`/patients/${enc(id)}/sessions`, { schema: patientSessions, query: { limit: 500 }, signal }),
  });

export const usePatientDetail = (id: string) => useSuspenseQuery(patientDetailQueryOptions(id));
export const useTrends = (id: string) => useSuspenseQuery(trendsQueryOptions(id));
export const usePatientSessions = (id: string) => useSuspenseQuery(patientSessionsQueryOptions(id));

export { HEIGHT_CM_RANGE, patientUpdate, type PatientUpdate };

/** PATCH /api/patients/:id (ingest-server/src/contracts/patients.ts `patientUpdate`): the patient's height. */
export const updatePatient = (id: string, input: PatientUpdate) =>
  request(`/patients/${enc(id)}`, { method: "PATCH", body: input, schema: patientDetail });

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
