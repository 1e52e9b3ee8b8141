import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { CONDITIONS, ROLES, SEXES, createInvitationResponse, type CreateInvitationResponse } from "@pendula/ingest-server/contracts";
import { api } from "@/lib/api-client";
import { userKeys } from "./user-keys";

const newPatientSchema = z.object({
  birthYear: z.coerce
    .number({ error: "enter the year of birth" })
    .int({ error: "enter the year of birth" })
    .min(1900, { error: "enter a year from 1900" })
    .max(new Date().getFullYear(), { error: "the year of birth cannot be in the future" }),
  sex: z.enum(SEXES, { error: "choose one" }),
  condition: z.enum(CONDITIONS, { error: "choose a condition" }),
  enrolledOn: z.iso.date({ error: "enter the enrolment date" }),
  researchConsent: z.boolean(),
  /** An admin's record of consent counts only with what it rests on (the server refuses it otherwise). */
  researchConsentReason: z.string().trim().max(500).optional(),
})
  .refine((p) => !p.researchConsent || (p.researchConsentReason ?? "").length >= 10, {
    path: ["researchConsentReason"],
    error: "say what the consent rests on, at least 10 characters (e.g. the signed form on file)",
  })
  .transform(({ researchConsentReason, ...p }) => (p.researchConsent ? { ...p, researchConsentReason } : p));

/**
 * The invite form. A patient account must point at exactly one patient record: an existing one
 * (`patientId`) or a new one described in `patient`. Staff accounts carry neither.
 */
export const invitationInputSchema = z
  .object({
    email: z.string().trim().toLowerCase().pipe(z.email({ error: "enter a valid e-mail address" })),
    displayName: z.string().trim().min(1, { error: "enter a display name" }).max(120),
    role: z.enum(ROLES, { error: "choose a role" }),
    patientMode: z.enum(["existing", "new"]).optional(),
    patientId: z.string().optional(),
    patient: z.unknown().optional(),
  })
  .transform((v, ctx) => {
    const base = { email: v.email, displayName: v.displayName, role: v.role };
    if (v.role !== "patient") return base;
    if (v.patientMode === "existing") {
      if (!v.patientId) {
        ctx.addIssue({ code: "custom", path: ["patientId"], message: "choose the patient record" });
        return z.NEVER;
      }
      return { ...base, patientId: v.patientId };
    }
    const patient = newPatientSchema.safeParse(v.patient);
    if (!patient.success) {
      for (const issue of patient.error.issues) ctx.addIssue({ code: "custom", path: ["patient", ...issue.path.map(String)], message: issue.message });
      return z.NEVER;
    }
    return { ...base, patient: patient.data };
  });

export type InvitationInput = z.output<typeof invitationInputSchema>;

export function createInvitation(input: InvitationInput): Promise<CreateInvitationResponse> {
  return api.post("/invitations", input, { schema: createInvitationResponse });
}

export function useCreateInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createInvitation,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: userKeys.all }),
  });
}
