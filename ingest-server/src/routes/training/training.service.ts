import type { Request } from "express";
import { audit } from "../../audit/audit";
import { assertPatientAccess } from "../../auth/patient-access";
import type { AppDeps } from "../../deps";
import type { AuthContext } from "../../middleware/authenticate";
import { insertTraining, listTraining, type TrainingKind, type TrainingRow } from "./training.repository";

const toEntry = (t: TrainingRow) => ({
  id: t.id,
  patientId: t.patient_id,
  authorId: t.author_id,
  performedOn: t.performed_on,
  kind: t.kind,
  minutes: t.minutes,
  description: t.description,
  createdAt: new Date(t.created_at).toISOString(),
});

export async function listPatientTraining(deps: AppDeps, req: Request, auth: AuthContext, patientId: string) {
  await assertPatientAccess(deps.db, auth, patientId, "clinical");
  const rows = await listTraining(deps.db, patientId);
  await audit(deps.db, req, { action: "training.list", resourceType: "patient", resourceId: patientId, patientId });
  return { items: rows.map(toEntry) };
}

export async function addPatientTraining(
  deps: AppDeps,
  req: Request,
  auth: AuthContext,
  patientId: string,
  body: { performedOn: string; kind: TrainingKind; minutes: number; description?: string },
) {
  await assertPatientAccess(deps.db, auth, patientId, "clinical");
  return deps.db.transaction(async (trx) => {
    const row = await insertTraining(trx, {
      patient_id: patientId,
      author_id: auth.userId,
      performed_on: body.performedOn,
      kind: body.kind,
      minutes: body.minutes,
      description: body.description ?? null,
    });
    await audit(trx, req, { action: "training.create", resourceType: "training", resourceId: row.id, patientId, details: { kind: body.kind, minutes: body.minutes } });
    return toEntry(row);
  });
}
