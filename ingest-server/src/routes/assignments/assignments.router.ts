import type { AppDeps } from "../../deps";
import { idParams } from "../../contracts/common";
import {
  assignmentList,
  assignmentParams,
  assignmentView,
  createAssignmentRequest,
  endAssignmentRequest,
  swapPlacementRequest,
  swapPlacementResponse,
} from "../../contracts/devices";
import { ApiRouter, type RouteModule } from "../../http/api-router";
import { createAssignment, endAssignment, listAssignments, swapAssignmentPlacement } from "./assignments.service";

const PREFIX = "/api/devices";

export function assignmentsRouter(deps: AppDeps): ApiRouter {
  return new ApiRouter(PREFIX, deps)
    .endpoint({
      method: "get",
      path: "/:id/assignments",
      summary: "Assignment history of a sensor, newest first",
      access: { scopes: ["assignments:read"] },
      request: { params: idParams },
      response: assignmentList,
      handler: ({ params }) => listAssignments(deps, params.id),
    })
    .endpoint({
      method: "post",
      path: "/:id/assignments",
      summary: "Put a sensor on a patient's placement from a moment on (409 when it overlaps)",
      access: { scopes: ["assignments:write"] },
      status: 201,
      request: { params: idParams, body: createAssignmentRequest },
      response: assignmentView,
      handler: ({ auth, params, body }, req) => createAssignment(deps, auth, params.id, body, req),
    })
    .endpoint({
      method: "patch",
      path: "/:id/assignments/:assignmentId",
      summary: "End (or move the end of) an assignment",
      access: { scopes: ["assignments:write"] },
      request: { params: assignmentParams, body: endAssignmentRequest },
      response: assignmentView,
      handler: ({ params, body }, req) => endAssignment(deps, params.id, params.assignmentId, body, req),
    })
    .endpoint({
      method: "post",
      path: "/:id/assignments/:assignmentId/swap",
      summary: "Move a sensor to another placement on the same patient",
      access: { scopes: ["assignments:write"] },
      status: 201,
      request: { params: assignmentParams, body: swapPlacementRequest },
      response: swapPlacementResponse,
      handler: ({ auth, params, body }, req) => swapAssignmentPlacement(deps, auth, params.id, params.assignmentId, body, req),
    });
}

export const assignmentsRoutes: RouteModule = { prefix: PREFIX, router: assignmentsRouter };
