import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { assignmentView } from "@pendula/ingest-server/contracts";
import { request } from "@/lib/api-client";
import { localDateTime } from "./date-time";
import { deviceKeys } from "./device-keys";
import type { Assignment } from "./devices";

export const endAssignmentInputSchema = z.object({ to: localDateTime("end") });

export type EndAssignmentInput = z.output<typeof endAssignmentInputSchema>;

export function endAssignment(deviceId: string, assignmentId: string, input: EndAssignmentInput): Promise<Assignment> {
  return request(`/devices/${encodeURIComponent(deviceId)}/assignments/${encodeURIComponent(assignmentId)}`, {
    method: "PATCH",
    body: input,
    schema: assignmentView,
  });
}

/**
 * `onEnded` runs from the mutation itself, not from `mutate(…, {onSuccess})`: the refetch that
 * follows can unmount the form that asked, and a per-call callback would then never fire.
 */
export function useEndAssignment(deviceId: string, onEnded?: (assignment: Assignment) => void) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ assignmentId, input }: { assignmentId: string; input: EndAssignmentInput }) =>
      endAssignment(deviceId, assignmentId, input),
    onSuccess: (assignment) => onEnded?.(assignment),
    onSettled: () => queryClient.invalidateQueries({ queryKey: deviceKeys.all }),
  });
}
