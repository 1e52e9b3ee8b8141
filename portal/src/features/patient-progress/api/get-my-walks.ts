import { queryOptions, useSuspenseQuery, type QueryClient } from "@tanstack/react-query";
import { patientSessions, type SessionSummary } from "@pendula/ingest-server/contracts";
import { api } from "@/lib/api-client";

/** One of the patient's walks: GET /api/patients/:id/sessions (contracts `sessionSummary`). */
export type WalkSummary = SessionSummary;

export const progressKeys = {
  all: ["patient-progress"] as const,
  walks: (patientId: string) => [...progressKeys.all, "walks", patientId] as const,
};

export const getMyWalks = (patientId: string, signal?: AbortSignal) =>
  api.get(`/patients/${encodeURIComponent(patientId)}/sessions`, { schema: patientSessions, query: { limit: 500 }, signal });

export const myWalksQueryOptions = (patientId: string) =>
  queryOptions({ queryKey: progressKeys.walks(patientId), queryFn: ({ signal }) => getMyWalks(patientId, signal) });

export const useMyWalks = (patientId: string) => useSuspenseQuery(myWalksQueryOptions(patientId));

export const prefetchMyWalks = (queryClient: QueryClient, patientId: string) => queryClient.ensureQueryData(myWalksQueryOptions(patientId));
