import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import {
  enrolmentConfirmed,
  enrolmentStart,
  meResponse,
  recoveryCodesResponse,
  secondFactorStatus,
  type EnrolmentStart,
  type SecondFactorStatus,
} from "@pendula/ingest-server/contracts";
import { api } from "@/lib/api-client";
import { authKeys } from "./auth-keys";
import { adoptSession } from "./sign-in";

export type { EnrolmentStart, SecondFactorStatus };

export const getSecondFactorStatus = () => api.get("/auth/second-factor", { schema: secondFactorStatus });

export const secondFactorQueryOptions = () =>
  queryOptions({ queryKey: authKeys.secondFactor(), queryFn: getSecondFactorStatus, staleTime: 30_000 });

export const useSecondFactorStatus = () => useQuery(secondFactorQueryOptions());

export const startEnrolment = () => api.post("/auth/second-factor/enrolment", undefined, { schema: enrolmentStart });

/** The first code activates the app; the answer replaces the session by one that passed the second factor. */
export async function confirmEnrolment(code: string): Promise<string[]> {
  const res = await api.post("/auth/second-factor/enrolment/confirm", { code }, { schema: enrolmentConfirmed });
  await adoptSession(res.session);
  return res.recoveryCodes;
}

export async function regenerateRecoveryCodes(code: string): Promise<string[]> {
  return (await api.post("/auth/second-factor/recovery-codes", { code }, { schema: recoveryCodesResponse })).recoveryCodes;
}

export async function removeSecondFactor(code: string): Promise<void> {
  await api.post("/auth/second-factor/remove", { code });
}

export const useStartEnrolment = () => useMutation({ mutationFn: startEnrolment });

export function useConfirmEnrolment() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: confirmEnrolment,
    onSuccess: async () => {
      queryClient.setQueryData(authKeys.me(), await api.get("/me", { schema: meResponse }));
      await queryClient.invalidateQueries({ queryKey: authKeys.secondFactor() });
    },
  });
}

export function useRegenerateRecoveryCodes() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: regenerateRecoveryCodes,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: authKeys.secondFactor() }),
  });
}

export function useRemoveSecondFactor() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: removeSecondFactor,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: authKeys.secondFactor() }),
  });
}
