import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { userSummary, type UserSummary } from "@pendula/ingest-server/contracts";
import { request } from "@/lib/api-client";
import { userKeys } from "./user-keys";

/** Role changes stay among staff roles: a patient account is tied to its patient record and is never re-roled. */
export const STAFF_ROLES = ["clinician", "researcher", "admin"] as const;

export const updateUserInputSchema = z
  .object({
    role: z.enum(STAFF_ROLES).optional(),
    status: z.enum(["active", "disabled"]).optional(),
  })
  .refine((v) => v.role !== undefined || v.status !== undefined, { error: "change the role or the status first" });

export type UpdateUserInput = z.infer<typeof updateUserInputSchema>;

export function updateUser(id: string, input: UpdateUserInput): Promise<UserSummary> {
  return request(`/users/${encodeURIComponent(id)}`, { method: "PATCH", body: input, schema: userSummary });
}

export function useUpdateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id: string; input: UpdateUserInput }) => updateUser(id, input),
    onSettled: () => queryClient.invalidateQueries({ queryKey: userKeys.lists() }),
  });
}
