import type { AppDeps } from "../../deps";
import { idParams } from "../../contracts/common";
import {
  careTeam,
  caseloadLinkPage,
  caseloadLinkView,
  createCaseloadLinkRequest,
  endCaseloadLinkRequest,
  listCaseloadLinksQuery,
} from "../../contracts/caseload-links";
import { ApiRouter, type RouteModule } from "../../http/api-router";
import { createCaseloadLink, endCaseloadLink, listCaseloadLinks, readCareTeam } from "./caseload-links.service";

export function caseloadLinksRouter(deps: AppDeps): ApiRouter {
  return new ApiRouter("/api/caseload-links", deps)
    .endpoint({
      method: "get",
      path: "/",
      summary: "Caseload links, newest first (admin: all, filtered by clinician, patient and state; clinician: their own)",
      access: { scopes: ["users:read", "patients:read:caseload"] },
      request: { query: listCaseloadLinksQuery },
      response: caseloadLinkPage,
      handler: ({ auth, query }, req) => listCaseloadLinks(deps, auth, query, req),
    })
    .endpoint({
      method: "post",
      path: "/",
      summary: "Give a clinician access to a patient, with a reason (admin); 409 when the link is already open",
      access: { scopes: ["users:write"] },
      status: 201,
      request: { body: createCaseloadLinkRequest },
      response: caseloadLinkView,
      handler: ({ auth, body }, req) => createCaseloadLink(deps, auth, body, req),
    })
    .endpoint({
      method: "delete",
      path: "/:id",
      summary: "End a caseload link, with a reason (admin); the link stays in the history",
      access: { scopes: ["users:write"] },
      request: { params: idParams, body: endCaseloadLinkRequest },
      response: caseloadLinkView,
      handler: ({ auth, params, body }, req) => endCaseloadLink(deps, auth, params.id, body, req),
    })
    .endpoint({
      method: "get",
      path: "/care-team",
      summary: "The signed-in patient's clinicians who can read their walks, and former ones",
      access: { scopes: ["sessions:read:own"] },
      response: careTeam,
      handler: ({ auth }, req) => readCareTeam(deps, auth, req),
    });
}

export const caseloadLinksRoutes: RouteModule = { prefix: "/api/caseload-links", router: caseloadLinksRouter };
