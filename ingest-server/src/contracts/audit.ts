import { z } from "zod";
import { isoDateTime, page, paging } from "./common";

export const auditEventView = z.object({
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
