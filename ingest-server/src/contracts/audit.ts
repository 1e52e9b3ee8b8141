import { z } from "zod";
import { isoDateTime, page, paging } from "./common";

/** Fields the audit answer leaves out for an admin (see `withheld` below). */
export const AUDIT_WITHHELD_FIELDS = ["ip", "userAgent", "details"] as const;

/**
 * Actions whose details describe a patient's care (training kind and minutes, the walking aid
 * of a session); the audit answer never carries them. Prefixes end in '.'.
 */
export const CLINICAL_DETAIL_ACTIONS = ["training.", "session.update"] as const;

export const isClinicalDetailAction = (action: string): boolean =>
  CLINICAL_DETAIL_ACTIONS.some((a) => (a.endsWith(".") ? action.startsWith(a) : action === a));

const auditEventFields = z.strictObject({
  id: z.string(),
  at: isoDateTime,
  actorId: z.uuid().nullable(),
  actorRole: z.string().nullable(),
  actorEmail: z.string().nullable(),
  action: z.string(),
  resourceType: z.string(),
  resourceId: z.string().nullable(),
  patientId: z.uuid().nullable(),
  ip: z.string().nullable(),
  userAgent: z.string().nullable(),
  details: z.record(z.string(), z.unknown()).nullable(),
  /**
   * What this answer leaves out of the stored row: a patient's network address and browser
   * (`ip`, `userAgent`) and clinical details (`details`). The stored row keeps them.
   */
  withheld: z.array(z.enum(AUDIT_WITHHELD_FIELDS)),
});

// The contract itself refuses a patient's address or a clinical detail, so a handler that forgot
// to leave them out answers 500 instead of leaking them.
export const auditEventView = auditEventFields.superRefine((e, ctx) => {
  if (e.actorRole === "patient" && (e.ip !== null || e.userAgent !== null)) {
    ctx.addIssue({ code: "custom", path: ["ip"], message: "a patient's network address and browser are not shown" });
  }
  if (isClinicalDetailAction(e.action) && e.details !== null) {
    ctx.addIssue({ code: "custom", path: ["details"], message: "clinical details are not shown in the audit log" });
  }
});
export type AuditEventView = z.infer<typeof auditEventView>;

export const listAuditQuery = paging.extend({
  actorId: z.uuid().optional(),
  /** Exact action, or a prefix ending in '.' (`auth.` lists every sign-in event). */
  action: z.string().trim().min(1).max(80).regex(/^[a-z_.]+$/).optional(),
  patientId: z.uuid().optional(),
  from: isoDateTime.optional(),
  to: isoDateTime.optional(),
});
export type ListAuditQuery = z.input<typeof listAuditQuery>;

export const auditPage = page(auditEventView);
export type AuditPage = z.infer<typeof auditPage>;
