import { isDemoMode } from "../../config/env";
import type { AppDeps } from "../../deps";
import { mailboxResponse } from "../../contracts/mailbox";
import { readMailbox } from "../../dev/smtp-fake";
import { ApiRouter, type RouteModule } from "../../http/api-router";
import { audit } from "../../audit/audit";

const PREFIX = "/api/dev/mailbox";

/**
 * Messages captured by the local SMTP fake, so an admin can follow invitation and reset links in a
 * demo. Mounted only in demo mode with DEV_MAILBOX_DIR set (production refuses that setting), so a
 * production server has no such route at all: any admin could otherwise read reset links.
 */
export function devMailboxRouter(deps: AppDeps): ApiRouter {
  const router = new ApiRouter(PREFIX, deps);
  const dir = deps.config.devMailboxDir;
  if (!dir || !isDemoMode(deps.config)) return router;
  return router.endpoint({
    method: "get",
    path: "/",
    summary: "Development mailbox: messages captured by the local SMTP fake (newest first)",
    access: { scopes: ["mailbox:read"] },
    response: mailboxResponse,
    handler: async (_input, req) => {
      await audit(deps.db, req, { action: "mailbox.read", resourceType: "mailbox" });
      return { messages: readMailbox(dir).slice(0, 200) };
    },
  });
}

export const devMailboxRoutes: RouteModule = { prefix: PREFIX, router: devMailboxRouter };
