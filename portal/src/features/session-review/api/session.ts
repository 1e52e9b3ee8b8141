import { queryOptions, useMutation, useQuery, useQueryClient, useSuspenseQuery } from "@tanstack/react-query";
import { api, request } from "@/lib/api-client";
import {
  reprocessResponse,
  sessionDetail,
  sessionUpdate,
  sessionUpdateResponse,
  signalResponse,
  type SessionUpdate,
} from "@pendula/ingest-server/contracts";

// GET /api/sessions/:id and its signal answer with the server's contracts; `analysis` is signal's own `Analysis` object.
export type { SessionDetail, SignalResponse as SignalTraces } from "@pendula/ingest-server/contracts";

export const sessionKeys = {
  all: ["session-review"] as const,
  detail: (id: string) => [...sessionKeys.all, id] as const,
  signal: (id: string, placement: string) => [...sessionKeys.detail(id), "signal", placement] as const,
};

const enc = encodeURIComponent;

export const sessionQueryOptions = (id: string) =>
  queryOptions({
    queryKey: sessionKeys.detail(id),
    queryFn: ({ signal }) => api.get(`/sessions/${enc(id)}`, { schema: sessionDetail, signal }),
    // While the worker has it (after an upload or a reprocess), look again every few seconds.
    refetchInterval: (q) => (q.state.data?.status === "queued" || q.state.data?.status === "processing" ? 3000 : false),
  });

export const signalQueryOptions = (id: string, placement: string) =>
  queryOptions({
    queryKey: sessionKeys.signal(id, placement),
    queryFn: ({ signal }) => api.get(`/sessions/${enc(id)}/signal`, { schema: signalResponse, query: { placement, maxPoints: 6000 }, signal }),
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
