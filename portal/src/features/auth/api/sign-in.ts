import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { api, setAccessToken } from "@/lib/api-client";
import { loginResponse, meResponse, tokenResponse } from "@pendula/ingest-server/contracts";
import { authKeys, ENROLMENT_SCOPE, type Me, type TokenResponse } from "./auth-keys";

export const SignInInputSchema = z.object({
  email: z.email("Enter the e-mail address your care team or administrator used to invite you."),
  password: z.string().min(1, "Enter your password."),
});
export type SignInInput = z.infer<typeof SignInInputSchema>;

/** Six digits, spaces allowed (apps often show "123 456"). */
export const TotpCodeSchema = z
  .string()
  .transform((s) => s.replace(/\s/g, ""))
  .pipe(z.string().regex(/^\d{6}$/, "Enter the 6 digits your authenticator app shows now."));

export const RecoveryCodeSchema = z
  .string()
  .trim()
  .min(12, "A recovery code has 12 letters and digits, like 7K3M-Q9PA-2XHD.")
  .max(40, "A recovery code has 12 letters and digits, like 7K3M-Q9PA-2XHD.");

/** The password step ends signed in, or with a challenge that a code from the authenticator answers. */
export type SignInResult = { kind: "signed-in"; me: Me } | { kind: "second-factor"; challenge: string; expiresIn: number };

/** After any answer that carries a session: keep the token in memory and read who it is. */
async function adoptSession(res: TokenResponse, email?: string): Promise<Me> {
  setAccessToken(res.accessToken);
  // /me carries the e-mail, name and scopes the shell uses; the token answer alone is enough to route.
  try {
    return await api.get("/me", { schema: meResponse });
  } catch {
    return { ...res.user, email: email ?? "", scopes: res.secondFactor === "enrolment_required" ? [ENROLMENT_SCOPE] : [] };
  }
}

export async function signIn(input: SignInInput): Promise<SignInResult> {
  const res = await api.post("/auth/login", input, { schema: loginResponse });
  if ("secondFactorRequired" in res) return { kind: "second-factor", challenge: res.challenge, expiresIn: res.expiresIn };
  return { kind: "signed-in", me: await adoptSession(res, input.email) };
}

export interface SecondFactorInput {
  challenge: string;
  method: "totp" | "recovery_code";
  code: string;
}

export async function completeSecondFactor(input: SecondFactorInput): Promise<Me> {
  const res = await api.post("/auth/login/second-factor", input, { schema: tokenResponse });
  return adoptSession(res);
}

/** Drop anything cached for a previous person on this device before the new one sees a screen. */
function useAdoptMe() {
  const queryClient = useQueryClient();
  return (me: Me) => {
    queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== authKeys.all[0] });
    queryClient.removeQueries({ queryKey: authKeys.secondFactor() });
    queryClient.setQueryData(authKeys.me(), me);
  };
}

export function useSignIn() {
  const adopt = useAdoptMe();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (result) => {
      if (result.kind === "signed-in") adopt(result.me);
    },
  });
}

export function useCompleteSecondFactor() {
  const adopt = useAdoptMe();
  return useMutation({ mutationFn: completeSecondFactor, onSuccess: adopt });
}

/** For answers that replace the session in place (a confirmed enrolment). */
export { adoptSession };

export async function signOut(): Promise<void> {
  try {
    await api.post("/auth/logout");
  } finally {
    setAccessToken(null);
  }
}

export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSettled: () => {
      queryClient.clear();
      queryClient.setQueryData(authKeys.me(), null);
    },
  });
}
