import type { RouteModule } from "../http/api-router";
import { assignmentsRoutes } from "./assignments/assignments.router";
import { auditRoutes } from "./audit/audit.router";
import { authRoutes } from "./auth/auth.router";
import { caseloadLinksRoutes } from "./caseload-links/caseload-links.router";
import { consentRoutes } from "./consent/consent.router";
import { devMailboxRoutes } from "./dev-mailbox/dev-mailbox.router";
import { devicesRoutes } from "./devices/devices.router";
import { invitationsRoutes } from "./invitations/invitations.router";
import { meRoutes } from "./me/me.router";
import { notesRoutes } from "./notes/notes.router";
import { patientsRoutes } from "./patients/patients.router";
import { researchRoutes } from "./research/research.router";
import { sessionsRoutes } from "./sessions/sessions.router";
import { trainingRoutes } from "./training/training.router";
import { usersRoutes } from "./users/users.router";

/**
 * The route table: every resource module mounted by createApp, in order. Add a module here and it
 * is mounted, documented in /api/openapi.json and enumerated by listEndpoints(app).
 * Each module lives in routes/<resource>/<resource>.router.ts and exports one RouteModule.
 */
export const ROUTE_TABLE: RouteModule[] = [
  authRoutes,
  meRoutes,
  usersRoutes,
  invitationsRoutes,
  devicesRoutes,
  assignmentsRoutes,
  auditRoutes,
  caseloadLinksRoutes,
  devMailboxRoutes,
  sessionsRoutes,
  patientsRoutes,
  notesRoutes,
  trainingRoutes,
  researchRoutes,
  consentRoutes,
];
