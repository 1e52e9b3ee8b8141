import type { QueryClient } from "@tanstack/react-query";
import type { RouteObject } from "react-router-dom";
import type { NavItem } from "./nav";

/*
 * Researcher screens (cohort builder, preview with suppression, CSV/FHIR export) plug in here.
 * The router mounts these under `/research`, behind the researcher role guard and inside the
 * shared layout; give them an `index` route for the researcher's home. Use `lazy` so their code
 * loads only for researchers. Owned by the researcher/admin portal work.
 */
export function researcherRoutes(_queryClient: QueryClient): RouteObject[] {
  return [];
}

/** Links shown in the researcher's navigation bar (paths relative to the site root). */
export const researcherNav: NavItem[] = [];
