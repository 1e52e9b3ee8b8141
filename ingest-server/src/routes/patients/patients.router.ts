import { idParams } from "../../contracts/common";
import { patientDetail, patientList, patientListQuery, patientSessions, patientSessionsQuery, patientUpdate } from "../../contracts/patients";
import { trendsQuery, trendsResponse } from "../../contracts/trends";
import type { AppDeps } from "../../deps";
import { ApiRouter, conformResponse, type RouteModule } from "../../http/api-router";
import { getPatient, getPatientSessions, getTrendsJson, listPatientsFor, updatePatient } from "./patients.service";
import { unprocessableUnless } from "../unprocessable-body";
import { AnswerCache, sendCachedAnswer } from "../../http/answer-cache";

const CLINICAL_READ = ["sessions:read:own", "sessions:read:caseload"] as const;

export function patientsRouter(deps: AppDeps): ApiRouter {
  const api = new ApiRouter("/api/patients", deps);
  const trendCache = new AnswerCache(deps.config.trendCacheBytes);
  api.endpoint({
    method: "get",
    path: "/",
    summary: "Clinician: own caseload with summary columns. Admin: all patients, identity only",
    access: { scopes: ["patients:read:caseload", "patients:list"] },
    request: { query: patientListQuery },
    response: patientList,
    handler: ({ auth, query }, req) => listPatientsFor(deps, req, auth, query.q),
  });
  api.endpoint({
    method: "get",
    path: "/:id",
    summary: "One patient (admin: identity only)",
    access: { scopes: ["patients:read:caseload", "patients:list", "sessions:read:own"] },
    request: { params: idParams },
    response: patientDetail,
    handler: ({ auth, params }, req) => getPatient(deps, req, auth, params.id),
  });
  api.endpoint({
    method: "patch",
    path: "/:id",
    summary: "Clinician of the caseload: edit the patient's clinical fields (standing height in cm, 100–230; 422 otherwise)",
    access: { scopes: ["sessions:write:caseload"] },
    before: [unprocessableUnless(patientUpdate, "invalid_patient_field")],
    request: { params: idParams, body: patientUpdate },
    response: patientDetail,
    handler: ({ auth, params, body }, req) => updatePatient(deps, req, auth, params.id, body),
  });
  api.endpoint({
    method: "get",
    path: "/:id/sessions",
    summary: "The patient's sessions, newest first",
    access: { scopes: [...CLINICAL_READ] },
    request: { params: idParams, query: patientSessionsQuery },
    response: patientSessions,
    handler: ({ auth, params, query }, req) => getPatientSessions(deps, req, auth, params.id, query.limit, query.offset),
  });
  api.endpoint({
    method: "get",
    path: "/:id/trends",
    summary: "Per metric: one point per processed session, with change flags, bands and events",
    access: { scopes: [...CLINICAL_READ] },
    request: { params: idParams, query: trendsQuery },
    response: trendsResponse,
    handler: async ({ auth, params, query }, req, res) => {
      const entry = await getTrendsJson(deps, req, auth, params.id, query, trendCache, (payload) =>
        JSON.stringify(conformResponse(trendsResponse, payload, "get", "/api/patients/:id/trends")),
      );
      sendCachedAnswer(req, res, entry);
    },
  });
  return api;
}

export const patientsRoutes: RouteModule = { prefix: "/api/patients", router: patientsRouter };
