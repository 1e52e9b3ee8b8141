import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { request } from "@/lib/api-client";
import { localDateTime } from "./date-time";
import { deviceKeys } from "./device-keys";
import { assignmentSchema, type Assignment } from "./devices";

export const endAssignmentInputSchema = z.object({ to: localDateTime("end") });

export type EndAssignmentInput = z.output<typeof endAssignmentInputSchema>;

export function endAssignment(deviceId: string, assignmentId: string, input: EndAssignmentInput): Promise<Assignment> {
  return request(`/devices/${encodeURIComponent(deviceId)}/assignments/${encodeURIComponent(assignmentId)}`, {
    method: "PATCH",
    body: input,
    schema: assignmentSchema,
  });
}

export function useEndAssignment(deviceId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ assignmentId, input }: { assignmentId: string; input: EndAssignmentInput }) =>
      endAssignment(deviceId, assignmentId, input),
    onSettled: () => queryClient.invalidateQueries({ queryKey: deviceKeys.all }),
  });
}
