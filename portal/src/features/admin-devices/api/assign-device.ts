import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { assignmentView, PLACEMENTS } from "@pendula/ingest-server/contracts";
import { api } from "@/lib/api-client";
import { localDateTime } from "./date-time";
import { deviceKeys } from "./device-keys";
import { type Assignment } from "./devices";

export const assignDeviceInputSchema = z.object({
  patientId: z.string().min(1, { error: "choose a patient" }),
  placement: z.enum(PLACEMENTS, { error: "choose a placement" }),
  from: localDateTime("start"),
});

export type AssignDeviceInput = z.output<typeof assignDeviceInputSchema>;

export function assignDevice(deviceId: string, input: AssignDeviceInput): Promise<Assignment> {
  return api.post(`/devices/${encodeURIComponent(deviceId)}/assignments`, input, { schema: assignmentView });
}

/**
 * `onAssigned` runs from the mutation itself, not from `mutate(…, {onSuccess})`: the refetch that
 * follows can unmount the form that asked, and a per-call callback would then never fire.
 */
export function useAssignDevice(deviceId: string, onAssigned?: (assignment: Assignment) => void) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: AssignDeviceInput) => assignDevice(deviceId, input),
    onSuccess: (assignment) => onAssigned?.(assignment),
    onSettled: () => queryClient.invalidateQueries({ queryKey: deviceKeys.all }),
  });
}
