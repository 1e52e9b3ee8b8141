import type { Request } from "express";
import { audit } from "../../audit/audit";
import { assertPatientAccess } from "../../auth/patient-access";
import type { AppDeps } from "../../deps";
import { HttpError } from "../../http-error";
import type { AuthContext } from "../../middleware/authenticate";
import { findNote, insertNote, isSessionOfPatient, listNotes, type NoteRow } from "./notes.repository";

const toNote = (n: NoteRow) => ({
  id: n.id,
  patientId: n.patient_id,
  sessionId: n.session_id,
  authorId: n.author_id,
  authorName: n.author_name,
  body: n.body,
  createdAt: new Date(n.created_at).toISOString(),
});

/** Clinical free text: only a clinician with the patient on their caseload (the scopes exclude admins and patients). */
async function assertCaseload(deps: AppDeps, auth: AuthContext, patientId: string) {
  if (auth.role !== "clinician") throw new HttpError(404, "not_found", "patient not found");
  await assertPatientAccess(deps.db, auth, patientId, "clinical");
}

export async function listPatientNotes(deps: AppDeps, req: Request, auth: AuthContext, patientId: string) {
  await assertCaseload(deps, auth, patientId);
  const rows = await listNotes(deps.db, patientId);
  await audit(deps.db, req, { action: "note.list", resourceType: "patient", resourceId: patientId, patientId });
  return { items: rows.map(toNote) };
}

export async function addPatientNote(deps: AppDeps, req: Request, auth: AuthContext, patientId: string, body: { body: string; sessionId?: string }) {
  await assertCaseload(deps, auth, patientId);
  if (body.sessionId && !(await isSessionOfPatient(deps.db, body.sessionId, patientId))) {
    throw new HttpError(422, "invalid_session", "sessionId is not a session of this patient");
  }
  const id = await deps.db.transaction(async (trx) => {
    const noteId = await insertNote(trx, { patient_id: patientId, session_id: body.sessionId ?? null, author_id: auth.userId, body: body.body });
    // The audit event never carries the note's text.
    await audit(trx, req, { action: "note.create", resourceType: "note", resourceId: noteId, patientId, details: { length: body.body.length } });
    return noteId;
  });
  return toNote((await findNote(deps.db, id))!);
}
