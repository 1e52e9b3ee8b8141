import { idParams } from "../../contracts/common";
import { createTraining, trainingEntry, trainingList } from "../../contracts/training";
import type { AppDeps } from "../../deps";
import { ApiRouter, type RouteModule } from "../../http/api-router";
import { addPatientTraining, listPatientTraining } from "./training.service";

export function trainingRouter(deps: AppDeps): ApiRouter {
  const api = new ApiRouter("/api/patients", deps);
  api.endpoint({
    method: "get",
    path: "/:id/training",
    summary: "Training log of the patient, newest first",
    access: { scopes: ["training:read"] },
    request: { params: idParams },
    response: trainingList,
    handler: ({ auth, params }, req) => listPatientTraining(deps, req, auth, params.id),
  });
  api.endpoint({
    method: "post",
    path: "/:id/training",
    summary: "Log a training session",
    access: { scopes: ["training:write"] },
    request: { params: idParams, body: createTraining },
    status: 201,
    response: trainingEntry,
    handler: ({ auth, params, body }, req) => addPatientTraining(deps, req, auth, params.id, body),
  });
  return api;
}

export const trainingRoutes: RouteModule = { prefix: "/api/patients", router: trainingRouter };
