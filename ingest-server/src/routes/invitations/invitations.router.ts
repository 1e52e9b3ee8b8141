import type { AppDeps } from "../../deps";
import { createInvitationRequest, createInvitationResponse, invitationList, listInvitationsQuery } from "../../contracts/invitations";
import { ApiRouter, type RouteModule } from "../../http/api-router";
import { createInvitation, listInvitations } from "./invitations.service";

export function invitationsRouter(deps: AppDeps): ApiRouter {
  return new ApiRouter("/api/invitations", deps)
    .endpoint({
      method: "post",
      path: "/",
      summary: "Invite a person by e-mail (admin: any role; clinician: a patient, who joins their caseload)",
      access: { scopes: ["invitations:write"] },
      status: 201,
      request: { body: createInvitationRequest },
      response: createInvitationResponse,
      handler: ({ auth, body }, req) => createInvitation(deps, auth, body, req),
    })
    .endpoint({
      method: "get",
      path: "/",
      summary: "Invitations (admin: all; clinician: the ones they sent)",
      access: { scopes: ["invitations:write"] },
      request: { query: listInvitationsQuery },
      response: invitationList,
      handler: ({ auth, query }) => listInvitations(deps, auth, query.state),
    });
}

export const invitationsRoutes: RouteModule = { prefix: "/api/invitations", router: invitationsRouter };
