import type { Role } from "@pendula/ingest-server/contracts";

/** Words for the four roles; a Record over the server's enumeration, so a new role needs its words. */
export const ROLE_LABEL: Record<Role, string> = {
  patient: "Patient",
  clinician: "Clinician",
  researcher: "Researcher",
  admin: "Administrator",
};

/** Words for a role; a value this build does not know is shown as it came. */
export function roleLabel(value: string): string {
  return Object.hasOwn(ROLE_LABEL, value) ? ROLE_LABEL[value as Role] : value;
}
