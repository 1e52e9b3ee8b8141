import { z } from "zod";

export const ROLES = ["patient", "clinician", "researcher", "admin"] as const;
export type Role = (typeof ROLES)[number];

// The shapes of issue 4's auth contract (`POST /api/auth/login`, `GET /api/me`); extra fields
// the server adds are kept optional so the portal keeps working while the API grows.
export const SessionUserSchema = z.object({
  id: z.string(),
  role: z.enum(ROLES),
  patientId: z.string().nullish(),
});

export const MeSchema = SessionUserSchema.extend({
  email: z.string(),
  displayName: z.string().nullish(),
  name: z.string().nullish(),
  scopes: z.array(z.string()).optional(),
});
export type Me = z.infer<typeof MeSchema>;

/** The only scope of a staff session that has not set up its second factor yet (server: auth/scopes.ts). */
export const ENROLMENT_SCOPE = "second-factor:enrol";
/** Where a staff account without a second factor is kept until it has one. */
export const SECOND_FACTOR_SETUP_PATH = "/second-factor/setup";

/** True for a staff session that may do nothing but set up its authenticator app. */
export function needsSecondFactorSetup(me: Pick<Me, "scopes"> | null | undefined): boolean {
  return Boolean(me?.scopes?.includes(ENROLMENT_SCOPE));
}

export const TokenResponseSchema = z.object({
  accessToken: z.string(),
  user: SessionUserSchema,
  secondFactor: z.enum(["verified", "enrolment_required", "not_enrolled"]).optional(),
});
export type TokenResponse = z.infer<typeof TokenResponseSchema>;

export const ChallengeResponseSchema = z.object({
  secondFactorRequired: z.literal(true),
  challenge: z.string(),
  expiresIn: z.number(),
  methods: z.array(z.string()),
});

export const LoginResponseSchema = z.union([TokenResponseSchema, ChallengeResponseSchema]);

export const authKeys = {
  all: ["auth"] as const,
  me: () => [...authKeys.all, "me"] as const,
  secondFactor: () => [...authKeys.all, "second-factor"] as const,
};

/** Where each role lands after sign-in, and where a wrong-role URL sends it back to. */
export const ROLE_HOME: Record<Role, string> = {
  patient: "/patient",
  clinician: "/clinician",
  researcher: "/research",
  admin: "/admin",
};

/** A `next` URL is honoured only inside the signed-in role's own area. */
export function safeNextPath(role: Role, next: string | null): string {
  const home = ROLE_HOME[role];
  if (next && next.startsWith("/") && !next.startsWith("//") && (next === home || next.startsWith(`${home}/`))) return next;
  return home;
}
