import { queryOptions, useQuery } from "@tanstack/react-query";
import { api, getAccessToken, refreshAccessToken } from "@/lib/api-client";
import { isApiError } from "@/lib/api-error";
import { meResponse } from "@pendula/ingest-server/contracts";
import { authKeys, type Me } from "./auth-keys";

/**
 * The signed-in person, or null. After a page reload the in-memory access token is gone, so we
 * first try the refresh cookie; a visitor with no session simply gets null (not an error).
 */
export async function getMe(): Promise<Me | null> {
  if (!getAccessToken() && !(await refreshAccessToken())) return null;
  try {
    return await api.get("/me", { schema: meResponse });
  } catch (error) {
    if (isApiError(error) && error.status === 401) return null;
    throw error;
  }
}

export const meQueryOptions = () =>
  queryOptions({
    queryKey: authKeys.me(),
    queryFn: getMe,
    staleTime: 5 * 60_000,
    retry: false,
  });

export function useMe() {
  return useQuery(meQueryOptions());
}
