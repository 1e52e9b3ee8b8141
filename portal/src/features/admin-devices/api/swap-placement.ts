import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { PLACEMENTS, swapPlacementResponse } from "@pendula/ingest-server/contracts";
import { api } from "@/lib/api-client";
import { localDateTime } from "./date-time";
import { deviceKeys } from "./device-keys";
import type { Assignment } from "./devices";

export const swapPlacementInputSchema = z.object({
  placement: z.enum(PLACEMENTS, { error: "choose a placement" }),
  at: localDateTime("swap"),
});

export type SwapPlacementInput = z.output<typeof swapPlacementInputSchema>;

/**
 * Moves the device to another limb of the same patient: the server ends the running assignment at
 * `at` and starts the new one at the same instant in one transaction, so no recording falls between
 * two placements and a refused swap (409) leaves the old assignment untouched. Resolves to the
 * assignment that starts at `at` (the server also returns the one it ended).
 */
export async function swapPlacement(deviceId: string, assignmentId: string, input: SwapPlacementInput): Promise<Assignment> {
  const result = await api.post(
    `/devices/${encodeURIComponent(deviceId)}/assignments/${encodeURIComponent(assignmentId)}/swap`,
    input,
    { schema: swapPlacementResponse },
  );
  return result.started;
}

/**
 * `onSwapped` runs from the mutation itself, not from `mutate(…, {onSuccess})`: the refetch that
 * follows can unmount the form that asked, and a per-call callback would then never fire.
 */
export function useSwapPlacement(deviceId: string, onSwapped?: (assignment: Assignment) => void) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ assignmentId, input }: { assignmentId: string; input: SwapPlacementInput }) =>
      swapPlacement(deviceId, assignmentId, input),
    onSuccess: (assignment) => onSwapped?.(assignment),
    onSettled: () => queryClient.invalidateQueries({ queryKey: deviceKeys.all }),
  });
}
