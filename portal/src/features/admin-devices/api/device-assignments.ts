import { queryOptions, useQuery } from "@tanstack/react-query";
import { assignmentList } from "@pendula/ingest-server/contracts";
import { api } from "@/lib/api-client";
import { deviceKeys } from "./device-keys";
import type { Assignment } from "./devices";

export function getDeviceAssignments(deviceId: string, signal?: AbortSignal): Promise<Assignment[]> {
  return api.get(`/devices/${encodeURIComponent(deviceId)}/assignments`, { schema: assignmentList, signal });
}

export function deviceAssignmentsQueryOptions(deviceId: string) {
  return queryOptions({
    queryKey: deviceKeys.assignments(deviceId),
    queryFn: ({ signal }) => getDeviceAssignments(deviceId, signal),
    // Oldest first: the timeline and the table read left to right, top to bottom, in time.
    select: (rows: Assignment[]) => [...rows].sort((a, b) => a.from.localeCompare(b.from)),
  });
}

export function useDeviceAssignments(deviceId: string) {
  return useQuery(deviceAssignmentsQueryOptions(deviceId));
}
