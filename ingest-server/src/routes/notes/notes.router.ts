import type { Request } from "express";
import { audit } from "../../audit/audit";
import { assertPatientAccess } from "../../auth/patient-access";
import { idParams } from "../../contracts/common";
import { createNote, note, noteList } from "../../contracts/notes";
import type { AppDeps } from "../../deps";
import { HttpError } from "../../http-error";
import { ApiRouter, type RouteModule } from "../../http/api-router";
import type { AuthContext } from "../../middleware/authenticate";

interface NoteRow {
  id: string;
  patient_id: string;
  session_id: string | null;
  author_id: string;
  author_name: string;
  body: string;
  created_at: Date;
}

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

function selectNotes(deps: AppDeps) {
  return deps.db("clinician_notes as n")
    .join("users as u", "u.id", "n.author_id")
    .select("n.id", "n.patient_id", "n.session_id", "n.author_id", "u.display_name as author_name", "n.body", "n.created_at");
}

async function listNotes(deps: AppDeps, req: Request, auth: AuthContext, patientId: string) {
  await assertCaseload(deps, auth, patientId);
  const rows: NoteRow[] = await selectNotes(deps).where("n.patient_id", patientId).orderBy("n.created_at", "desc").limit(500);
  await audit(deps.db, req, { action: "note.list", resourceType: "patient", resourceId: patientId, patientId });
  return { items: rows.map(toNote) };
}

async function addNote(deps: AppDeps, req: Request, auth: AuthContext, patientId: string, body: { body: string; sessionId?: string }) {
  await assertCaseload(deps, auth, patientId);
  if (body.sessionId) {
    const s = await deps.db("walk_sessions").where({ id: body.sessionId, patient_id: patientId }).first("id");
    if (!s) throw new HttpError(422, "invalid_session", "sessionId is not a session of this patient");
  }
  const id = await deps.db.transaction(async (trx) => {
    const [row] = await trx("clinician_notes")
      .insert({ patient_id: patientId, session_id: body.sessionId ?? null, author_id: auth.userId, body: body.body })
      .returning("id");
    // The audit event never carries the note's text.
    await audit(trx, req, { action: "note.create", resourceType: "note", resourceId: row.id, patientId, details: { length: body.body.length } });
    return row.id as string;
  });
  const [row] = (await selectNotes(deps).where("n.id", id)) as NoteRow[];
  return toNote(row!);
}

export function notesRouter(deps: AppDeps): ApiRouter {
  const api = new ApiRouter("/api/patients", deps);
  api.endpoint({
    method: "get",
    path: "/:id/notes",
    summary: "Clinician notes on the patient, newest first (clinician of the caseload only)",
    access: { scopes: ["notes:read"] },
    request: { params: idParams },
    response: noteList,
    handler: ({ auth, params }, req) => listNotes(deps, req, auth, params.id),
  });
  api.endpoint({
    method: "post",
    path: "/:id/notes",
    summary: "Add a note, optionally about one session",
    access: { scopes: ["notes:write"] },
    request: { params: idParams, body: createNote },
    status: 201,
    response: note,
    handler: ({ auth, params, body }, req) => addNote(deps, req, auth, params.id, body),
  });
  return api;
}

export const notesRoutes: RouteModule = { prefix: "/api/patients", router: notesRouter };
