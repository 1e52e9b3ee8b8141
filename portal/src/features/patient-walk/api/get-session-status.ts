import { queryOptions, useQuery } from "@tanstack/react-query";
import { env } from "@/config/env";
import { api } from "@/lib/api-client";
import { sessionDetail } from "@pendula/ingest-server/contracts";
import { walkKeys } from "./walk-keys";

export const getSessionStatus = (id: string, signal?: AbortSignal) => api.get(`/sessions/${encodeURIComponent(id)}`, { schema: sessionDetail, signal });

/** Polls until the server has finished with the session, then stops. */
export const sessionStatusQueryOptions = (id: string) =>
  queryOptions({
    queryKey: walkKeys.session(id),
    queryFn: ({ signal }) => getSessionStatus(id, signal),
    refetchInterval: (query) => {
      const status = query.state.data?.status;
      return status === "done" || status === "failed" ? false : env.SESSION_POLL_MS;
    },
    staleTime: 0,
  });

export function useSessionStatus(id: string | null) {
  return useQuery({ ...sessionStatusQueryOptions(id ?? ""), enabled: Boolean(id) });
}
