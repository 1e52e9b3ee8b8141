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

export type AuditRowValues = ReturnType<typeof auditRow>;

/**
 * The INSERT of one audit row per row of the common table expression `cte`, for a data-modifying
 * WITH clause: a read's access check and its audit row then go to the database as one statement,
 * and nothing is logged when the check finds no row. `resourceId`/`patientId` name columns of `cte`.
 */
export function auditEachRowOf(db: Knex, row: AuditRowValues, cte: string, columns: { resourceId: string; patientId: string }): Knex.Raw {
  return db.raw(
    `INSERT INTO audit_events (actor_id, actor_role, action, resource_type, resource_id, patient_id, ip, user_agent, details)
     SELECT ?, ?, ?, ?, ??::text, ??, ?, ?, ?::jsonb FROM ??`,
    [row.actor_id, row.actor_role, row.action, row.resource_type, `${cte}.${columns.resourceId}`, `${cte}.${columns.patientId}`, row.ip, row.user_agent, row.details, cte],
  );
}

/**
 * Writes one audit event: who (token or explicit actor), what, when (database clock), from where
 * (ip, user agent). Pass a transaction as `db` to make the event commit with the change it records.
 */
export async function audit(db: Knex | Knex.Transaction, req: Requestish | null, entry: AuditEntry): Promise<void> {
  await db("audit_events").insert(auditRow(req, entry));
}
