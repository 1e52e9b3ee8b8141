import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "@/lib/api-client";
import { authKeys, MeSchema, TokenResponseSchema } from "./auth-keys";
import { adoptSession } from "./sign-in";

export const SecondFactorStatusSchema = z.object({
  enrolled: z.boolean(),
  required: z.boolean(),
  enrolledAt: z.string().nullable(),
  recoveryCodesLeft: z.number(),
});
export type SecondFactorStatus = z.infer<typeof SecondFactorStatusSchema>;

export const EnrolmentStartSchema = z.object({
  secret: z.string(),
  otpauthUri: z.string(),
  issuer: z.string(),
  accountLabel: z.string(),
  digits: z.number(),
  periodS: z.number(),
});
export type EnrolmentStart = z.infer<typeof EnrolmentStartSchema>;

const RecoveryCodesSchema = z.object({ recoveryCodes: z.array(z.string()) });
const EnrolmentConfirmedSchema = RecoveryCodesSchema.extend({ session: TokenResponseSchema });

export const getSecondFactorStatus = () => api.get("/auth/second-factor", { schema: SecondFactorStatusSchema });

export const secondFactorQueryOptions = () =>
  queryOptions({ queryKey: authKeys.secondFactor(), queryFn: getSecondFactorStatus, staleTime: 30_000 });

export const useSecondFactorStatus = () => useQuery(secondFactorQueryOptions());

export const startEnrolment = () => api.post("/auth/second-factor/enrolment", undefined, { schema: EnrolmentStartSchema });

/** The first code activates the app; the answer replaces the session by one that passed the second factor. */
export async function confirmEnrolment(code: string): Promise<string[]> {
  const res = await api.post("/auth/second-factor/enrolment/confirm", { code }, { schema: EnrolmentConfirmedSchema });
  await adoptSession(res.session);
  return res.recoveryCodes;
}

export async function regenerateRecoveryCodes(code: string): Promise<string[]> {
  return (await api.post("/auth/second-factor/recovery-codes", { code }, { schema: RecoveryCodesSchema })).recoveryCodes;
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
      queryClient.setQueryData(authKeys.me(), await api.get("/me", { schema: MeSchema }));
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
