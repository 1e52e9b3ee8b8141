import type { QueryClient } from "@tanstack/react-query";
import type { RouteObject } from "react-router-dom";

export function clinicianRoutes(_queryClient: QueryClient): RouteObject[] {
  return [];
}
