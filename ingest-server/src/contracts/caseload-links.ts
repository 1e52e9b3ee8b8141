import { z } from "zod";
import { isoDateTime, page, paging } from "./common";

/**
 * A caseload link gives one clinician clinical access to one patient (sessions, trends, notes,
 * training). Links are made and ended explicitly, each with a reason; an ended link stays as history.
 */
const reason = z
  .string()
  .trim()
  .min(3, { error: "give a reason of at least 3 characters" })
  .max(500, { error: "the reason is at most 500 characters" });

export const caseloadLinkView = z.strictObject({
  id: z.uuid(),
  clinicianId: z.uuid(),
  clinicianName: z.string(),
  clinicianEmail: z.string(),
  patientId: z.uuid(),
  patientName: z.string(),
  active: z.boolean(),
  createdAt: isoDateTime,
  /** Null for links recorded before links were tracked one by one, or written outside the API. */
  createdBy: z.uuid().nullable(),
  createdByName: z.string().nullable(),
  reason: z.string().nullable(),
  endedAt: isoDateTime.nullable(),
  endedBy: z.uuid().nullable(),
  endedByName: z.string().nullable(),
  endReason: z.string().nullable(),
});
export type CaseloadLinkView = z.infer<typeof caseloadLinkView>;

export const CASELOAD_LINK_STATES = ["active", "ended", "all"] as const;

export const listCaseloadLinksQuery = paging.extend({
  clinicianId: z.uuid().optional(),
  patientId: z.uuid().optional(),
  state: z.enum(CASELOAD_LINK_STATES).default("active"),
});
export type ListCaseloadLinksQuery = z.input<typeof listCaseloadLinksQuery>;

export const caseloadLinkPage = page(caseloadLinkView);
export type CaseloadLinkPage = z.infer<typeof caseloadLinkPage>;

export const createCaseloadLinkRequest = z.strictObject({
  clinicianId: z.uuid({ error: "clinicianId must be a UUID" }),
  patientId: z.uuid({ error: "patientId must be a UUID" }),
  reason,
});
export type CreateCaseloadLinkRequest = z.input<typeof createCaseloadLinkRequest>;

export const endCaseloadLinkRequest = z.strictObject({ reason });
export type EndCaseloadLinkRequest = z.input<typeof endCaseloadLinkRequest>;

/** What a patient is told about who can read their walks: names and dates, nothing else. */
export const careTeamMember = z.strictObject({
  clinicianName: z.string(),
  active: z.boolean(),
  since: isoDateTime,
  until: isoDateTime.nullable(),
});
export const careTeam = z.array(careTeamMember);
export type CareTeamMember = z.infer<typeof careTeamMember>;
