import type { AppDeps } from "../../deps";
import { meResponse } from "../../contracts/me";
import { ApiRouter, type RouteModule } from "../../http/api-router";
import { getMe } from "./me.service";

export function meRouter(deps: AppDeps): ApiRouter {
  return new ApiRouter("/api/me", deps).endpoint({
    method: "get",
    path: "/",
    summary: "The signed-in user",
    access: "authenticated",
    response: meResponse,
    handler: ({ auth }) => getMe(deps, auth),
  });
}

export const meRoutes: RouteModule = { prefix: "/api/me", router: meRouter };
