import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import { z } from "zod";
import { auditPage, type AuditPage } from "@pendula/ingest-server/contracts";
import { api } from "@/lib/api-client";

export type { AuditEventView } from "@pendula/ingest-server/contracts";

export const AUDIT_PAGE_SIZE = 50;

/**
 * The filter form. Dates are whole days in the admin's time zone: `from` starts at its midnight and
 * `to` includes the whole of its day, which is what a person means by "from the 3rd to the 5th".
 */
export const auditFilterSchema = z
  .object({
    action: z
      .string()
      .trim()
      .regex(/^[a-z_.]*$/, { error: "actions are lower-case words joined by '.' or '_', e.g. auth.login or auth." })
      .max(80),
    actorId: z.union([z.literal(""), z.uuid({ error: "an actor id is a UUID" })]),
    patientId: z.union([z.literal(""), z.uuid({ error: "a patient id is a UUID" })]),
    fromDay: z.union([z.literal(""), z.iso.date()]),
    toDay: z.union([z.literal(""), z.iso.date()]),
  })
  .refine((f) => !f.fromDay || !f.toDay || f.fromDay <= f.toDay, { path: ["toDay"], error: "the last day must not be before the first" });

export type AuditFilterInput = z.input<typeof auditFilterSchema>;

export interface AuditQuery {
  action?: string;
  actorId?: string;
  patientId?: string;
  from?: string;
  to?: string;
  limit: number;
  offset: number;
}

export const EMPTY_AUDIT_FILTER: AuditFilterInput = { action: "", actorId: "", patientId: "", fromDay: "", toDay: "" };

export function toAuditQuery(filter: z.output<typeof auditFilterSchema>, offset: number): AuditQuery {
  const dayStart = (day: string) => new Date(`${day}T00:00:00`);
  const q: AuditQuery = { limit: AUDIT_PAGE_SIZE, offset };
  if (filter.action) q.action = filter.action;
  if (filter.actorId) q.actorId = filter.actorId;
  if (filter.patientId) q.patientId = filter.patientId;
  if (filter.fromDay) q.from = dayStart(filter.fromDay).toISOString();
  if (filter.toDay) {
    const end = dayStart(filter.toDay);
    end.setDate(end.getDate() + 1);
    q.to = end.toISOString();
  }
  return q;
}

export const auditKeys = {
  all: ["admin-audit"] as const,
  lists: () => [...auditKeys.all, "list"] as const,
  list: (q: AuditQuery) => [...auditKeys.lists(), q] as const,
};

export function getAuditEvents(q: AuditQuery, signal?: AbortSignal): Promise<AuditPage> {
  return api.get("/audit", { query: { ...q }, schema: auditPage, signal });
}

export function auditEventsQueryOptions(q: AuditQuery) {
  return queryOptions({ queryKey: auditKeys.list(q), queryFn: ({ signal }) => getAuditEvents(q, signal), placeholderData: keepPreviousData });
}

export function useAuditEvents(q: AuditQuery) {
  return useQuery(auditEventsQueryOptions(q));
}
