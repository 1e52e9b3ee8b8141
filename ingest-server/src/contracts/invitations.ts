import { z } from "zod";
import { email, isoDateTime } from "./common";
import { CONDITIONS, ROLES, SEXES } from "./enums";

const isoDate = z.iso.date();

/** The patient record created with a patient's invitation (or give patientId of an existing one). */
export const newPatientFields = z.object({
  birthYear: z.number().int().min(1900).max(2100),
  sex: z.enum(SEXES),
  condition: z.enum(CONDITIONS),
  conditionDetail: z.string().trim().max(500).optional(),
  enrolledOn: isoDate,
  /** A clinician's tick is a proposal the patient confirms in the portal; an admin's needs researchConsentReason. */
  researchConsent: z.boolean().default(false),
  researchConsentReason: z.string().trim().max(500).optional(),
  expectedUploadsPerWeek: z.number().int().min(0).max(14).default(1),
});

export const createInvitationRequest = z
  .object({
    email,
    displayName: z.string().trim().min(1).max(120),
    role: z.enum(ROLES),
    patient: newPatientFields.optional(),
    patientId: z.uuid().optional(),
    /** Refused (422 use_caseload_links): access is given by caseload links, never by an invitation. */
    clinicianIds: z.array(z.uuid()).max(20).optional(),
  })
  .superRefine((v, ctx) => {
    if (v.role === "patient" && !v.patient === !v.patientId) {
      ctx.addIssue({ code: "custom", path: ["patient"], message: "a patient invitation needs exactly one of patient or patientId" });
    }
    if (v.role !== "patient" && (v.patient || v.patientId || v.clinicianIds)) {
      ctx.addIssue({ code: "custom", path: ["role"], message: "patient, patientId and clinicianIds only apply to role patient" });
    }
  });
export type CreateInvitationRequest = z.input<typeof createInvitationRequest>;

export const invitationSummary = z.strictObject({
  id: z.uuid(),
  userId: z.uuid(),
  email: z.string(),
  displayName: z.string(),
  role: z.enum(ROLES),
  patientId: z.uuid().nullable(),
  invitedBy: z.uuid().nullable(),
  createdAt: isoDateTime,
  expiresAt: isoDateTime,
  acceptedAt: isoDateTime.nullable(),
});
export type InvitationSummary = z.infer<typeof invitationSummary>;

export const createInvitationResponse = invitationSummary.extend({
  /** False when SMTP refused the message; the invitation stands and can be sent again. */
  emailSent: z.boolean(),
});
export type CreateInvitationResponse = z.infer<typeof createInvitationResponse>;

export const listInvitationsQuery = z.object({
  state: z.enum(["pending", "accepted", "expired", "all"]).default("pending"),
});
export const invitationList = z.array(invitationSummary);
