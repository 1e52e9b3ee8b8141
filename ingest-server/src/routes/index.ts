import type { RouteModule } from "../http/api-router";
import { notesRoutes } from "./notes/notes.router";
import { patientsRoutes } from "./patients/patients.router";
import { researchRoutes } from "./research/research.router";
import { sessionsRoutes } from "./sessions/sessions.router";
import { trainingRoutes } from "./training/training.router";

/**
 * The route table: every resource module mounted by createApp, in order. Add a module here and it
 * is mounted, documented in /api/openapi.json and enumerated by listEndpoints(app).
 * Each module lives in routes/<resource>/<resource>.router.ts and exports one RouteModule.
 */
export const ROUTE_TABLE: RouteModule[] = [
  sessionsRoutes,
  patientsRoutes,
  notesRoutes,
  trainingRoutes,
  researchRoutes,
];
