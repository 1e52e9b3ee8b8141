import {
  cohortDefinition,
  cohortMetricsJson,
  cohortMetricsQuery,
  cohortPreview,
  createResearchProjectRequest,
  exportRules as exportRulesSchema,
  researchProject,
  researchProjectList,
} from "../../contracts/research";
import type { AppDeps } from "../../deps";
import { ApiRouter, type RouteModule } from "../../http/api-router";
import { unprocessableUnless } from "../unprocessable-body";
import { createProject, listProjects } from "./projects.service";
import { exportCohort, exportRules, previewCohort } from "./research.service";

const list = (s: string | undefined) => (s ? s.split(",").map((x) => x.trim()).filter(Boolean) : undefined);

export function researchRouter(deps: AppDeps): ApiRouter {
  const api = new ApiRouter("/api/research", deps);
  api.endpoint({
    method: "get",
    path: "/projects",
    summary: "Research projects: a researcher's own; an admin sees every project and its owner",
    access: { scopes: ["research:read", "users:read"] },
    response: researchProjectList,
    handler: ({ auth }) => listProjects(deps, auth),
  });
  api.endpoint({
    method: "post",
    path: "/projects",
    summary: "Create a research project (its own pseudonym key; subject ids differ between projects)",
    access: { scopes: ["research:read"] },
    before: [unprocessableUnless(createResearchProjectRequest, "invalid_project")],
    request: { body: createResearchProjectRequest },
    status: 201,
    response: researchProject,
    handler: ({ auth, body }, req) => createProject(deps, req, auth, body),
  });
  api.endpoint({
    method: "get",
    path: "/export-rules",
    summary: "How exported values are rounded per metric, and the study clock (4-week blocks, cap, release lag)",
    access: { scopes: ["research:read"] },
    response: exportRulesSchema,
    handler: () => exportRules(),
  });
  api.endpoint({
    method: "post",
    path: "/cohorts",
    summary: "Preview a cohort definition: subjects and sessions per condition × age band; small cells suppressed without their attributes",
    access: { scopes: ["research:read"] },
    request: { body: cohortDefinition },
    response: cohortPreview,
    handler: ({ body }, req) => previewCohort(deps, req, body),
  });
  api.endpoint({
    method: "get",
    path: "/cohort-metrics",
    summary: "De-identified per-session metrics of a cohort under one of your projects' pseudonyms, as JSON, CSV (text/csv) or a FHIR R4 Bundle",
    access: { scopes: ["research:read"] },
    request: { query: cohortMetricsQuery },
    response: cohortMetricsJson,
    produces: "text/csv",
    handler: async ({ auth, query }, req, res) => {
      const def = cohortDefinition.parse({
        conditions: list(query.conditions),
        ageBands: list(query.ageBands),
        weeksSinceEnrolment: { from: query.weeksFrom ?? 0, to: query.weeksTo ?? 5200 },
        metrics: list(query.metrics),
      });
      const out = await exportCohort(deps, req, auth, query.projectId, def, query.format);
      if (out.kind === "csv") {
        res.status(200).type("text/csv; charset=utf-8").setHeader("Content-Disposition", 'attachment; filename="cohort-metrics.csv"');
        res.send(out.body);
        return undefined;
      }
      if (out.kind === "fhir") {
        res.status(200).type("application/fhir+json; charset=utf-8").send(JSON.stringify(out.body));
        return undefined;
      }
      return out.body;
    },
  });
  return api;
}

export const researchRoutes: RouteModule = { prefix: "/api/research", router: researchRouter };
