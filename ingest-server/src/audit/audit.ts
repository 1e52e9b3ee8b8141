import type { Request } from "express";
import type { Knex } from "knex";

export interface AuditEntry {
  /** Dotted verb, e.g. `auth.login`, `user.update`, `patient.read`, `export.cohort_metrics`. */
  action: string;
  resourceType: string;
  resourceId?: string | null;
  patientId?: string | null;
  /** Structured context; never passwords, tokens or clinical free text. */
  details?: Record<string, unknown>;
  /** Actor when the request is not authenticated yet (sign-in, invitation accept). */
  actorId?: string | null;
  actorRole?: string | null;
}

type Requestish = Pick<Request, "ip" | "headers"> & { auth?: { userId: string; role: string } };

/** The audit_events row for an entry, for inserts that run inside a larger statement. */
export function auditRow(req: Requestish | null, entry: AuditEntry) {
  const ua = req?.headers["user-agent"];
  return {
    actor_id: entry.actorId !== undefined ? entry.actorId : (req?.auth?.userId ?? null),
    actor_role: entry.actorRole !== undefined ? entry.actorRole : (req?.auth?.role ?? null),
    action: entry.action,
    resource_type: entry.resourceType,
    resource_id: entry.resourceId ?? null,
    patient_id: entry.patientId ?? null,
    ip: req?.ip ?? null,
    user_agent: typeof ua === "string" ? ua.slice(0, 512) : null,
    details: entry.details === undefined ? null : JSON.stringify(entry.details),
  };
}

/**
 * Writes one audit event: who (token or explicit actor), what, when (database clock), from where
 * (ip, user agent). Pass a transaction as `db` to make the event commit with the change it records.
 */
export async function audit(db: Knex | Knex.Transaction, req: Requestish | null, entry: AuditEntry): Promise<void> {
  await db("audit_events").insert(auditRow(req, entry));
}
