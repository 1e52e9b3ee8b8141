import type { QueryClient } from "@tanstack/react-query";
import type { RouteObject } from "react-router-dom";
import type { NavItem } from "./nav";

/*
 * Researcher screens. `lazy` keeps the cohort builder out of everyone else's first load. The
 * preview is a POST made on demand, so there is nothing for a loader to prefetch.
 */
export function researcherRoutes(_queryClient: QueryClient): RouteObject[] {
  return [
    {
      index: true,
      lazy: async () => ({ Component: (await import("@/features/research/components/research-page")).ResearchPage }),
    },
  ];
}

/** Links shown in the researcher's navigation bar (paths relative to the site root). */
export const researcherNav: NavItem[] = [{ to: "/research", label: "Cohort builder", end: true }];
