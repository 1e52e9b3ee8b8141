import { z } from "zod";
import { email, newPassword } from "./common";
import { ROLES } from "./enums";

export const loginRequest = z.object({
  email,
  // No policy on sign-in: old passwords must still work; only a sane upper bound.
  password: z.string().min(1, { error: "password is required" }).max(1024),
});
export type LoginRequest = z.input<typeof loginRequest>;

export const sessionUser = z.object({
  id: z.uuid(),
  role: z.enum(ROLES),
  displayName: z.string(),
  patientId: z.uuid().optional(),
});

/** Answer of sign-in, refresh and invitation accept. The refresh token travels only as a cookie. */
export const tokenResponse = z.object({
  accessToken: z.string(),
  tokenType: z.literal("Bearer"),
  expiresIn: z.number().int().describe("seconds until the access token expires"),
  user: sessionUser,
});
export type TokenResponse = z.infer<typeof tokenResponse>;

const token = z.string().min(20, { error: "token is malformed" }).max(200).regex(/^[A-Za-z0-9_-]+$/, { error: "token is malformed" });

export const acceptInvitationRequest = z.object({ token, password: newPassword });
export type AcceptInvitationRequest = z.input<typeof acceptInvitationRequest>;

export const passwordResetRequest = z.object({ email });
export type PasswordResetRequest = z.input<typeof passwordResetRequest>;

export const passwordResetConfirm = z.object({ token, password: newPassword });
export type PasswordResetConfirm = z.input<typeof passwordResetConfirm>;

export const acceptedResponse = z.object({ status: z.literal("accepted"), message: z.string() });
