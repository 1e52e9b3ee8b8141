import { queryOptions, useSuspenseQuery, type QueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "@/lib/api-client";

// The fields of ingest-server/src/contracts/sessions.ts `sessionSummary` these screens read.
export const walkSummarySchema = z.object({
  id: z.string(),
  status: z.enum(["queued", "processing", "done", "failed"]),
  recordedAt: z.string(),
  durationS: z.number().nullish(),
  cadenceStepsPerMin: z.number().nullish(),
  strideTimeCvPct: z.number().nullish(),
  walkingSpeedMPerS: z.number().nullish(),
});
export type WalkSummary = z.infer<typeof walkSummarySchema>;

const walkPageSchema = z.object({ items: z.array(walkSummarySchema), total: z.number() });

export const progressKeys = {
  all: ["patient-progress"] as const,
  walks: (patientId: string) => [...progressKeys.all, "walks", patientId] as const,
};

export const getMyWalks = (patientId: string, signal?: AbortSignal) =>
  api.get(`/patients/${encodeURIComponent(patientId)}/sessions`, { schema: walkPageSchema, query: { limit: 500 }, signal });

export const myWalksQueryOptions = (patientId: string) =>
  queryOptions({ queryKey: progressKeys.walks(patientId), queryFn: ({ signal }) => getMyWalks(patientId, signal) });

export const useMyWalks = (patientId: string) => useSuspenseQuery(myWalksQueryOptions(patientId));

export const prefetchMyWalks = (queryClient: QueryClient, patientId: string) => queryClient.ensureQueryData(myWalksQueryOptions(patientId));
