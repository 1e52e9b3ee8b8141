import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import { userPage, type ListUsersQuery, type UserPage } from "@pendula/ingest-server/contracts";
import { api } from "@/lib/api-client";
import { userKeys } from "./user-keys";

export type UserFilters = Pick<ListUsersQuery, "role" | "status" | "q"> & { limit: number; offset: number };
export type { UserSummary } from "@pendula/ingest-server/contracts";

export const USER_PAGE_SIZE = 25;

export function getUsers(filters: UserFilters, signal?: AbortSignal): Promise<UserPage> {
  return api.get("/users", { query: { ...filters }, schema: userPage, signal });
}

export function usersQueryOptions(filters: UserFilters) {
  return queryOptions({
    queryKey: userKeys.list(filters),
    queryFn: ({ signal }) => getUsers(filters, signal),
    // Keep the old page on screen while the next one loads, so paging does not flash empty.
    placeholderData: keepPreviousData,
  });
}

export function useUsers(filters: UserFilters) {
  return useQuery(usersQueryOptions(filters));
}
