import type { Role } from "../contracts/enums";

/**
 * Every permission a route can ask for. Tokens carry the scopes of their role; routes check scopes,
 * never roles, so a new role is one line here. Which *patients* a scope reaches (own / caseload /
 * identity only) is decided per request by auth/patient-access.ts.
 */
export const SCOPES = [
  // patient
  "sessions:read:own",
  "sessions:write:own",
  // clinician
  "patients:read:caseload",
  "sessions:read:caseload",
  "sessions:write:caseload",
  "notes:read",
  "notes:write",
  "training:read",
  "training:write",
  // clinician (own caseload) and admin (any session): re-run processing from the stored raw files
  "sessions:reprocess",
  // researcher
  "research:read",
  // admin
  "users:read",
  "users:write",
  "devices:read",
  "devices:write",
  "assignments:read",
  "assignments:write",
  "audit:read",
  "mailbox:read",
  "patients:list",
  // admin (any role) and clinician (patients only; enforced by the invitations service)
  "invitations:write",
] as const;

export type Scope = (typeof SCOPES)[number];

export const ROLE_SCOPES: Record<Role, readonly Scope[]> = {
  patient: ["sessions:read:own", "sessions:write:own"],
  clinician: [
    "patients:read:caseload",
    "sessions:read:caseload",
    "sessions:write:caseload",
    "notes:read",
    "notes:write",
    "training:read",
    "training:write",
    "invitations:write",
    "sessions:reprocess",
  ],
  researcher: ["research:read"],
  admin: [
    "users:read",
    "users:write",
    "devices:read",
    "devices:write",
    "assignments:read",
    "assignments:write",
    "audit:read",
    "invitations:write",
    "mailbox:read",
    "patients:list",
    "sessions:reprocess",
  ],
};

/**
 * The only scope of a staff session that has not passed a second factor: it reaches the enrolment
 * endpoints and /api/me, nothing else (middleware/authenticate.ts refuses every other path).
 */
export const ENROLMENT_SCOPE = "second-factor:enrol";

/**
 * Roles that must sign in with a second factor. Researchers are included: their export reaches
 * every consenting patient's data, pseudonymised but still health data. Patients may add one.
 */
export const SECOND_FACTOR_ROLES: readonly Role[] = ["clinician", "admin", "researcher"];

export function secondFactorRequired(role: Role): boolean {
  return SECOND_FACTOR_ROLES.includes(role);
}

export function scopesFor(role: Role): Scope[] {
  return [...ROLE_SCOPES[role]];
}

export function hasAnyScope(granted: readonly string[], wanted: readonly Scope[]): boolean {
  return wanted.some((s) => granted.includes(s));
}
