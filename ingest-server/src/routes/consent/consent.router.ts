import { idParams } from "../../contracts/common";
import { consentState, recordConsentRequest } from "../../contracts/consent";
import type { AppDeps } from "../../deps";
import { ApiRouter, type RouteModule } from "../../http/api-router";
import { unprocessableUnless } from "../unprocessable-body";
import { getConsent, recordConsent } from "./consent.service";

export function consentRouter(deps: AppDeps): ApiRouter {
  const api = new ApiRouter("/api/consent", deps);
  api.endpoint({
    method: "get",
    path: "/patients/:id",
    summary: "A patient's research consent: in force or not, and every recorded change (the patient, their clinicians, admins)",
    access: { scopes: ["sessions:read:own", "patients:read:caseload", "patients:list"] },
    request: { params: idParams },
    response: consentState,
    handler: ({ auth, params }, req) => getConsent(deps, req, auth, params.id),
  });
  api.endpoint({
    method: "post",
    path: "/patients/:id/events",
    summary:
      "Record research consent given or withdrawn. The patient's own word counts; an admin's counts with a reason; a clinician's 'given' waits for the patient's confirmation; a withdrawal always counts",
    access: { scopes: ["sessions:write:own", "sessions:write:caseload", "users:write"] },
    before: [unprocessableUnless(recordConsentRequest, "invalid_consent_event")],
    request: { params: idParams, body: recordConsentRequest },
    status: 201,
    response: consentState,
    handler: ({ auth, params, body }, req) => recordConsent(deps, req, auth, params.id, body),
  });
  return api;
}

export const consentRoutes: RouteModule = { prefix: "/api/consent", router: consentRouter };
