import { describe, expect, it } from "vitest";
import { invitationInputSchema } from "../api/create-invitation";

const base = {
  email: "new.walker@example.test",
  displayName: "New Walker",
  role: "patient",
  patientMode: "new",
  patient: { birthYear: "1958", sex: "female", condition: "stroke", enrolledOn: "2026-11-30" },
};

describe("invite form: research consent recorded by an admin", () => {
  it("needs what the consent rests on when it is ticked, and sends it", () => {
    const without = invitationInputSchema.safeParse({ ...base, patient: { ...base.patient, researchConsent: true, researchConsentReason: "" } });
    expect(without.success).toBe(false);
    expect(without.error?.issues[0]?.path).toEqual(["patient", "researchConsentReason"]);
    const withReason = invitationInputSchema.parse({ ...base, patient: { ...base.patient, researchConsent: true, researchConsentReason: "signed form filed at the visit" } });
    expect(withReason).toMatchObject({ patient: { researchConsent: true, researchConsentReason: "signed form filed at the visit" } });
  });

  it("sends no reason when consent is not ticked", () => {
    const parsed = invitationInputSchema.parse({ ...base, patient: { ...base.patient, researchConsent: false, researchConsentReason: "typed then unticked" } });
    expect(parsed).toMatchObject({ patient: { researchConsent: false } });
    expect((parsed as { patient: Record<string, unknown> }).patient).not.toHaveProperty("researchConsentReason");
  });
});
