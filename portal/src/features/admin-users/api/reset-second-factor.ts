import { useMutation } from "@tanstack/react-query";
import { secondFactorResetRequest, secondFactorResetResponse, type SecondFactorResetRequest } from "@pendula/ingest-server/contracts";
import { request } from "@/lib/api-client";

/** Same rules as the server: a reason of 5–500 characters, kept in the audit log. */
export const resetSecondFactorSchema = secondFactorResetRequest;

export function resetSecondFactor(userId: string, input: SecondFactorResetRequest) {
  return request(`/auth/second-factor/users/${encodeURIComponent(userId)}/reset`, { method: "POST", body: input, schema: secondFactorResetResponse });
}

export const useResetSecondFactor = () =>
  useMutation({ mutationFn: ({ userId, input }: { userId: string; input: SecondFactorResetRequest }) => resetSecondFactor(userId, input) });
