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
});
export type Me = z.infer<typeof MeSchema>;

export const LoginResponseSchema = z.object({
  accessToken: z.string(),
  user: SessionUserSchema,
});

export const authKeys = {
  all: ["auth"] as const,
  me: () => [...authKeys.all, "me"] as const,
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
