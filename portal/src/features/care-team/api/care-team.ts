import { queryOptions, useQuery } from "@tanstack/react-query";
import { careTeam, type CareTeamMember } from "@pendula/ingest-server/contracts";
import { api } from "@/lib/api-client";

export type { CareTeamMember } from "@pendula/ingest-server/contracts";

export const careTeamKeys = {
  all: ["care-team"] as const,
  mine: () => [...careTeamKeys.all, "mine"] as const,
};

export function getMyCareTeam(signal?: AbortSignal): Promise<CareTeamMember[]> {
  return api.get("/caseload-links/care-team", { schema: careTeam, signal });
}

export function careTeamQueryOptions() {
  return queryOptions({ queryKey: careTeamKeys.mine(), queryFn: ({ signal }) => getMyCareTeam(signal) });
}

export function useMyCareTeam() {
  return useQuery(careTeamQueryOptions());
}
