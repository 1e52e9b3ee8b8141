import { ROLES, type MeResponse, type Role, type TokenResponse } from "@pendula/ingest-server/contracts";

// Sign-in and GET /api/me answer with the server's contracts (loginResponse, tokenResponse, meResponse).
export { ROLES, type Role, type TokenResponse };
/** The signed-in person as GET /api/me describes them. */
export type Me = MeResponse;

/** The only scope of a staff session that has not set up its second factor yet (server: auth/scopes.ts). */
export const ENROLMENT_SCOPE = "second-factor:enrol";
/** Where a staff account without a second factor is kept until it has one. */
export const SECOND_FACTOR_SETUP_PATH = "/second-factor/setup";

/** True for a staff session that may do nothing but set up its authenticator app. */
export function needsSecondFactorSetup(me: Pick<Me, "scopes"> | null | undefined): boolean {
  return Boolean(me?.scopes.includes(ENROLMENT_SCOPE));
}

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
