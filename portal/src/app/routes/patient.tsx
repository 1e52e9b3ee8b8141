import type { QueryClient } from "@tanstack/react-query";
import type { RouteObject } from "react-router-dom";

export function patientRoutes(_queryClient: QueryClient): RouteObject[] {
  return [];
}
