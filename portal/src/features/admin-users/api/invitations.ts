import { queryOptions, useQuery } from "@tanstack/react-query";
import { invitationList, type InvitationSummary } from "@pendula/ingest-server/contracts";
import { api } from "@/lib/api-client";
import { userKeys } from "./user-keys";

export type InvitationState = "pending" | "accepted" | "expired" | "all";
export type { InvitationSummary };

export function getInvitations(state: InvitationState, signal?: AbortSignal): Promise<InvitationSummary[]> {
  return api.get("/invitations", { query: { state }, schema: invitationList, signal });
}

export function invitationsQueryOptions(state: InvitationState) {
  return queryOptions({
    queryKey: userKeys.invitations(state),
    queryFn: ({ signal }) => getInvitations(state, signal),
    select: (rows: InvitationSummary[]) => [...rows].sort((a, b) => b.createdAt.localeCompare(a.createdAt)),
  });
}

export function useInvitations(state: InvitationState) {
  return useQuery(invitationsQueryOptions(state));
}
