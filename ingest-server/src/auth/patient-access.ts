import type { Knex } from "knex";
import type { AuthContext } from "../middleware/authenticate";
import { HttpError } from "../http-error";

/**
 * `clinical`: sessions, trends, notes, training — the patient themself or a clinician with the
 * patient on their caseload. `identity`: name, devices, account — additionally admins.
 * Everyone else gets the same 404 as for a patient that does not exist, so ids cannot be probed.
 */
export type PatientAccessMode = "clinical" | "identity";

export async function assertPatientAccess(
  db: Knex,
  auth: AuthContext,
  patientId: string,
  mode: PatientAccessMode,
): Promise<void> {
  const denied = () => new HttpError(404, "not_found", "patient not found");
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(patientId)) throw denied();
  switch (auth.role) {
    case "patient":
      if (auth.patientId !== patientId) throw denied();
      return;
    case "clinician": {
      const row = await db("caseload").where({ clinician_id: auth.userId, patient_id: patientId }).first("patient_id");
      if (!row) throw denied();
      return;
    }
    case "admin": {
      if (mode !== "identity") throw denied();
      const row = await db("patients").where({ id: patientId }).first("id");
      if (!row) throw denied();
      return;
    }
    default:
      throw denied();
  }
}

/** Patient ids this caller may read clinically (null = every patient is out of reach). */
export function clinicalPatientScope(db: Knex, auth: AuthContext): Knex.QueryBuilder | string[] | null {
  if (auth.role === "patient") return auth.patientId ? [auth.patientId] : [];
  if (auth.role === "clinician") return db("caseload").where({ clinician_id: auth.userId }).select("patient_id");
  return null;
}
