import { idParams } from "../../contracts/common";
import { createNote, note, noteList } from "../../contracts/notes";
import type { AppDeps } from "../../deps";
import { ApiRouter, type RouteModule } from "../../http/api-router";
import { addPatientNote, listPatientNotes } from "./notes.service";

export function notesRouter(deps: AppDeps): ApiRouter {
  const api = new ApiRouter("/api/patients", deps);
  api.endpoint({
    method: "get",
    path: "/:id/notes",
    summary: "Clinician notes on the patient, newest first (clinician of the caseload only)",
    access: { scopes: ["notes:read"] },
    request: { params: idParams },
    response: noteList,
    handler: ({ auth, params }, req) => listPatientNotes(deps, req, auth, params.id),
  });
  api.endpoint({
    method: "post",
    path: "/:id/notes",
    summary: "Add a note, optionally about one session",
    access: { scopes: ["notes:write"] },
    request: { params: idParams, body: createNote },
    status: 201,
    response: note,
    handler: ({ auth, params, body }, req) => addPatientNote(deps, req, auth, params.id, body),
  });
  return api;
}

export const notesRoutes: RouteModule = { prefix: "/api/patients", router: notesRouter };
