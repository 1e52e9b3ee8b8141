import type { AppDeps } from "../../deps";
import { meResponse } from "../../contracts/me";
import { ApiRouter, type RouteModule } from "../../http/api-router";
import { HttpError } from "../../http-error";

export function meRouter(deps: AppDeps): ApiRouter {
  return new ApiRouter("/api/me", deps).endpoint({
    method: "get",
    path: "/",
    summary: "The signed-in user",
    access: "authenticated",
    response: meResponse,
    handler: async ({ auth }) => {
      const user = await deps.db("users").where({ id: auth.userId }).first("id", "email", "role", "display_name", "patient_id");
      if (!user) throw new HttpError(401, "invalid_token", "account no longer exists");
      return {
        id: user.id,
        email: user.email,
        role: user.role,
        displayName: user.display_name,
        ...(user.patient_id ? { patientId: user.patient_id } : {}),
        scopes: auth.scopes,
      };
    },
  });
}

export const meRoutes: RouteModule = { prefix: "/api/me", router: meRouter };
