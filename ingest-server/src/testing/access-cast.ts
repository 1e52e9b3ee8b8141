import type { PatientSeed, SeededUser, TestContext } from "./harness";

/**
 * One account per role and relation that the access rules tell apart: a clinician and the patient
 * in their caseload, a second clinician with a patient of their own (outside the first caseload),
 * a researcher and an admin, each with an access token.
 */
export interface AccessCast {
  clinician: SeededUser;
  otherClinician: SeededUser;
  patient: SeededUser;
  otherPatient: SeededUser;
  researcher: SeededUser;
  admin: SeededUser;
  /** Access token by user id. */
  tokens: Record<string, string>;
}

/** Seeds the cast into `ctx`; `patient` describes the first clinician's patient. */
export async function seedAccessCast(ctx: TestContext, options: { patient?: PatientSeed } = {}): Promise<AccessCast> {
  const clinician = await ctx.seedUser({ role: "clinician" });
  const otherClinician = await ctx.seedUser({ role: "clinician" });
  const patient = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id], patient: options.patient });
  const otherPatient = await ctx.seedUser({ role: "patient", caseloadOf: [otherClinician.id] });
  const researcher = await ctx.seedUser({ role: "researcher" });
  const admin = await ctx.seedUser({ role: "admin" });
  const tokens: Record<string, string> = {};
  for (const u of [clinician, otherClinician, patient, otherPatient, researcher, admin]) tokens[u.id] = await ctx.tokenFor(u);
  return { clinician, otherClinician, patient, otherPatient, researcher, admin, tokens };
}
