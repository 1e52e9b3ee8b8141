import type { AppDeps } from "../../deps";
import { idParams } from "../../contracts/common";
import { listUsersQuery, updateUserRequest, userPage, userSummary } from "../../contracts/users";
import { ApiRouter, type RouteModule } from "../../http/api-router";
import { getUser, listUsers, updateUser } from "./users.service";

export function usersRouter(deps: AppDeps): ApiRouter {
  return new ApiRouter("/api/users", deps)
    .endpoint({
      method: "get",
      path: "/",
      summary: "List and filter user accounts",
      access: { scopes: ["users:read"] },
      request: { query: listUsersQuery },
      response: userPage,
      handler: ({ query }) => listUsers(deps, query),
    })
    .endpoint({
      method: "get",
      path: "/:id",
      summary: "One user account",
      access: { scopes: ["users:read"] },
      request: { params: idParams },
      response: userSummary,
      handler: ({ params }) => getUser(deps, params.id),
    })
    .endpoint({
      method: "patch",
      path: "/:id",
      summary: "Change a user's role, status or display name",
      access: { scopes: ["users:write"] },
      request: { params: idParams, body: updateUserRequest },
      response: userSummary,
      handler: ({ auth, params, body }, req) => updateUser(deps, auth, params.id, body, req),
    })
    .endpoint({
      method: "post",
      path: "/:id/disable",
      summary: "Disable an account and end its sessions",
      access: { scopes: ["users:write"] },
      request: { params: idParams },
      response: userSummary,
      handler: ({ auth, params }, req) => updateUser(deps, auth, params.id, { status: "disabled" }, req),
    });
}

export const usersRoutes: RouteModule = { prefix: "/api/users", router: usersRouter };
