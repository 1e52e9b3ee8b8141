import { queryOptions, useMutation, useQuery, useQueryClient, useSuspenseQuery } from "@tanstack/react-query";
import { z } from "zod";
import type { Analysis } from "@pendula/signal";
import { api, request } from "@/lib/api-client";
import { WALKING_AIDS, reprocessResponse, sessionUpdate, sessionUpdateResponse, type SessionUpdate } from "@pendula/ingest-server/contracts";

// ingest-server/src/contracts/sessions.ts (`sessionDetail`, `signalResponse`), copied because the
// contracts index does not re-export them yet. The analysis is signal's own `Analysis` object.
export const sessionDetailSchema = z.object({
  id: z.string(),
  patientId: z.string(),
  status: z.enum(["queued", "processing", "done", "failed"]),
  progressPct: z.number().optional(),
  recordedAt: z.string(),
  uploadedAt: z.string().optional(),
  durationS: z.number().nullish(),
  algorithmVersion: z.string().nullish(),
  error: z.string().nullish(),
  files: z.array(z.object({ placement: z.string(), deviceSerial: z.string().optional(), originalName: z.string().optional() })).optional(),
  walkingAid: z.enum(WALKING_AIDS).nullish(),
  /** Per metric key: how many strides/steps/arm cycles the value rests on, and which of them. */
  metricCounts: z.record(z.string(), z.object({ n: z.number(), countNoun: z.string() })).optional(),
  analysis: z.custom<Analysis>((v) => typeof v === "object" && v !== null && "metrics" in v && "events" in v).optional(),
});
export type SessionDetail = z.infer<typeof sessionDetailSchema>;

export const signalSchema = z.object({
  sessionId: z.string(),
  unit: z.string(),
  fromS: z.number(),
  toS: z.number(),
  traces: z.array(
    z.object({
      placement: z.string(),
      sampleRateHz: z.number(),
      decimated: z.boolean().optional(),
      timeS: z.array(z.number()),
      value: z.array(z.number()),
    }),
  ),
});
export type SignalTraces = z.infer<typeof signalSchema>;

export const sessionKeys = {
  all: ["session-review"] as const,
  detail: (id: string) => [...sessionKeys.all, id] as const,
  signal: (id: string, placement: string) => [...sessionKeys.detail(id), "signal", placement] as const,
};

const enc = encodeURIComponent;

export const sessionQueryOptions = (id: string) =>
  queryOptions({
    queryKey: sessionKeys.detail(id),
    queryFn: ({ signal }) => api.get(`/sessions/${enc(id)}`, { schema: sessionDetailSchema, signal }),
    // While the worker has it (after an upload or a reprocess), look again every few seconds.
    refetchInterval: (q) => (q.state.data?.status === "queued" || q.state.data?.status === "processing" ? 3000 : false),
  });

export const signalQueryOptions = (id: string, placement: string) =>
  queryOptions({
    queryKey: sessionKeys.signal(id, placement),
    queryFn: ({ signal }) => api.get(`/sessions/${enc(id)}/signal`, { schema: signalSchema, query: { placement, maxPoints: 6000 }, signal }),
    staleTime: Infinity,
  });

export const useSession = (id: string) => useSuspenseQuery(sessionQueryOptions(id));

export { sessionUpdate, type SessionUpdate };

/** PATCH /api/sessions/:id (ingest-server/src/contracts/sessions.ts `sessionUpdate`): the walking aid of this test. */
export const updateSession = (id: string, input: SessionUpdate) =>
  request(`/sessions/${enc(id)}`, { method: "PATCH", body: input, schema: sessionUpdateResponse });

/** Saves the walking aid; the session answer is refetched, and `onSaved` lets the route refresh other screens' data. */
export function useUpdateSession(id: string, onSaved?: () => void) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: SessionUpdate) => updateSession(id, input),
    onSuccess: () => onSaved?.(),
    onSettled: () => queryClient.invalidateQueries({ queryKey: sessionKeys.detail(id) }),
  });
}
export const useSignal = (id: string, placement: string, enabled: boolean) => useQuery({ ...signalQueryOptions(id, placement), enabled });

/** POST /api/sessions/:id/reprocess: analyse again from the stored raw files (e.g. with the walking aid just recorded). */
export function useReprocessSession(id: string, onQueued?: () => void) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => request(`/sessions/${enc(id)}/reprocess`, { method: "POST", schema: reprocessResponse }),
    onSuccess: () => onQueued?.(),
    onSettled: () => queryClient.invalidateQueries({ queryKey: sessionKeys.detail(id) }),
  });
}
