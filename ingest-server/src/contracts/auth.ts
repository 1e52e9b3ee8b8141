import { z } from "zod";
import { email, newPassword } from "./common";
import { ROLES } from "./enums";

export const loginRequest = z.object({
  email,
  // No policy on sign-in: old passwords must still work; only a sane upper bound.
  password: z.string().min(1, { error: "password is required" }).max(1024),
});
export type LoginRequest = z.input<typeof loginRequest>;

export const sessionUser = z.strictObject({
  id: z.uuid(),
  role: z.enum(ROLES),
  displayName: z.string(),
  patientId: z.uuid().optional(),
});

/**
 * Where the session stands with the second factor: `verified` (a code was given at sign-in),
 * `enrolment_required` (a staff account without an authenticator: the token reaches only the
 * enrolment screen), `not_enrolled` (a patient who has not chosen to add one).
 */
export const SECOND_FACTOR_STATES = ["verified", "enrolment_required", "not_enrolled"] as const;

/** Answer of sign-in, refresh and invitation accept. The refresh token travels only as a cookie. */
export const tokenResponse = z.strictObject({
  accessToken: z.string(),
  tokenType: z.literal("Bearer"),
  expiresIn: z.number().int().describe("seconds until the access token expires"),
  user: sessionUser,
  secondFactor: z.enum(SECOND_FACTOR_STATES),
});
export type TokenResponse = z.infer<typeof tokenResponse>;

/** Password accepted for an account with an authenticator: the code is asked for next. */
export const secondFactorChallenge = z.strictObject({
  secondFactorRequired: z.literal(true),
  challenge: z.string().describe("opaque; send it back with the code to POST /api/auth/login/second-factor"),
  expiresIn: z.number().int().describe("seconds the challenge stays open"),
  methods: z.array(z.enum(["totp", "recovery_code"])),
});
export type SecondFactorChallenge = z.infer<typeof secondFactorChallenge>;

export const loginResponse = z.union([tokenResponse, secondFactorChallenge]);
export type LoginResponse = z.infer<typeof loginResponse>;

/** Six digits from the authenticator app (spaces ignored). */
export const totpCodeInput = z
  .string()
  .transform((s) => s.replace(/\s/g, ""))
  .pipe(z.string().regex(/^\d{6}$/, { error: "the code is the 6 digits your authenticator app shows" }));

/** A recovery code as printed (XXXX-XXXX-XXXX); case, spaces and dashes do not matter. */
export const recoveryCodeInput = z.string().min(12, { error: "a recovery code has 12 characters" }).max(40, { error: "a recovery code has 12 characters" });

export const secondFactorLoginRequest = z.discriminatedUnion("method", [
  z.object({ challenge: z.string().min(20).max(200), method: z.literal("totp"), code: totpCodeInput }),
  z.object({ challenge: z.string().min(20).max(200), method: z.literal("recovery_code"), code: recoveryCodeInput }),
]);
export type SecondFactorLoginRequest = z.infer<typeof secondFactorLoginRequest>;

export const secondFactorStatus = z.strictObject({
  enrolled: z.boolean(),
  required: z.boolean().describe("true for staff roles: they cannot use Pendula without a second factor"),
  enrolledAt: z.iso.datetime({ offset: true }).nullable(),
  recoveryCodesLeft: z.number().int(),
});
export type SecondFactorStatus = z.infer<typeof secondFactorStatus>;

export const enrolmentStart = z.strictObject({
  secret: z.string().describe("base32, for typing into the app when the QR code cannot be scanned"),
  otpauthUri: z.string().describe("otpauth://totp/… for the QR code"),
  issuer: z.string(),
  accountLabel: z.string(),
  digits: z.number().int(),
  periodS: z.number().int(),
});
export type EnrolmentStart = z.infer<typeof enrolmentStart>;

export const codeRequest = z.object({ code: totpCodeInput });
export type CodeRequest = z.input<typeof codeRequest>;

export const recoveryCodesResponse = z.strictObject({
  recoveryCodes: z.array(z.string()).describe("shown once; only their digests are stored"),
});
export type RecoveryCodesResponse = z.infer<typeof recoveryCodesResponse>;

export const enrolmentConfirmed = recoveryCodesResponse.extend({ session: tokenResponse });
export type EnrolmentConfirmed = z.infer<typeof enrolmentConfirmed>;

export const secondFactorResetRequest = z.object({
  reason: z
    .string()
    .trim()
    .min(5, { error: "give the reason for the audit log (at least 5 characters)" })
    .max(500, { error: "the reason is at most 500 characters" }),
});
export type SecondFactorResetRequest = z.input<typeof secondFactorResetRequest>;

export const secondFactorResetResponse = z.strictObject({ userId: z.uuid(), enrolled: z.literal(false), endedSessions: z.number().int() });

const token = z.string().min(20, { error: "token is malformed" }).max(200).regex(/^[A-Za-z0-9_-]+$/, { error: "token is malformed" });

export const acceptInvitationRequest = z.object({ token, password: newPassword });
export type AcceptInvitationRequest = z.input<typeof acceptInvitationRequest>;

export const passwordResetRequest = z.object({ email });
export type PasswordResetRequest = z.input<typeof passwordResetRequest>;

export const passwordResetConfirm = z.object({ token, password: newPassword });
export type PasswordResetConfirm = z.input<typeof passwordResetConfirm>;

export const acceptedResponse = z.strictObject({ status: z.literal("accepted"), message: z.string() });
