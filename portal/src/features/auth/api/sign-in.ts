import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { api, setAccessToken } from "@/lib/api-client";
import { authKeys, LoginResponseSchema, MeSchema, type Me } from "./auth-keys";

export const SignInInputSchema = z.object({
  email: z.email("Enter the e-mail address your care team or administrator used to invite you."),
  password: z.string().min(1, "Enter your password."),
});
export type SignInInput = z.infer<typeof SignInInputSchema>;

export async function signIn(input: SignInInput): Promise<Me> {
  const res = await api.post("/auth/login", input, { schema: LoginResponseSchema });
  setAccessToken(res.accessToken);
  // /me carries the e-mail and name the shell shows; the login answer alone is enough to route.
  try {
    return await api.get("/me", { schema: MeSchema });
  } catch {
    return { ...res.user, email: input.email };
  }
}

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (me) => {
      // Drop anything cached for a previous person on this device before the new one sees a screen.
      queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== authKeys.all[0] });
      queryClient.setQueryData(authKeys.me(), me);
    },
  });
}

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
