import { queryOptions, useQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "@/lib/api-client";
import { deviceKeys } from "./device-keys";
import { assignmentSchema, type Assignment } from "./devices";

// Accept a bare array or `{items}`: the history is short, so the server may send it unpaged.
const historySchema = z
  .union([z.array(assignmentSchema), z.object({ items: z.array(assignmentSchema) })])
  .transform((v) => (Array.isArray(v) ? v : v.items));

export function getDeviceAssignments(deviceId: string, signal?: AbortSignal): Promise<Assignment[]> {
  return api.get(`/devices/${encodeURIComponent(deviceId)}/assignments`, { schema: historySchema, signal });
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
