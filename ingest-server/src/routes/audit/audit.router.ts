import type { AppDeps } from "../../deps";
import { auditPage, listAuditQuery } from "../../contracts/audit";
import { ApiRouter, type RouteModule } from "../../http/api-router";
import { HttpError } from "../../http-error";
import { auditRepository } from "./audit.repository";

export function auditRouter(deps: AppDeps): ApiRouter {
  return new ApiRouter("/api/audit", deps).endpoint({
    method: "get",
    path: "/",
    summary: "Audit events, newest first, filtered by actor, action, patient and time",
    access: { scopes: ["audit:read"] },
    request: { query: listAuditQuery },
    response: auditPage,
    handler: async ({ query }) => {
      if (query.from && query.to && Date.parse(query.from) >= Date.parse(query.to)) {
        throw new HttpError(400, "invalid_request", "from must be before to");
      }
      const page = await auditRepository.list(deps.db, query);
      return { ...page, limit: query.limit, offset: query.offset };
    },
  });
}

export const auditRoutes: RouteModule = { prefix: "/api/audit", router: auditRouter };
