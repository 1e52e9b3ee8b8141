import { useMutation } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "@/lib/api-client";

// A password a person can type on a phone but that is not trivially guessed (NIST SP 800-63B §5.1.1:
// at least 8 characters, no composition rules; we ask for 10).
export const NewPasswordSchema = z
  .object({
    password: z.string().min(10, "Use at least 10 characters.").max(200, "Use at most 200 characters."),
    confirm: z.string(),
  })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords do not match." });

export const ResetRequestSchema = z.object({ email: z.email("Enter a valid e-mail address.") });

export async function acceptInvitation(input: { token: string; password: string }): Promise<void> {
  await api.post("/auth/invitations/accept", input);
}
export async function requestPasswordReset(input: { email: string }): Promise<void> {
  await api.post("/auth/password-reset/request", input);
}
export async function confirmPasswordReset(input: { token: string; password: string }): Promise<void> {
  await api.post("/auth/password-reset/confirm", input);
}

export const useAcceptInvitation = () => useMutation({ mutationFn: acceptInvitation });
export const useRequestPasswordReset = () => useMutation({ mutationFn: requestPasswordReset });
export const useConfirmPasswordReset = () => useMutation({ mutationFn: confirmPasswordReset });
