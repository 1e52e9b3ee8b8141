import type { QueryClient } from "@tanstack/react-query";
import type { RouteObject } from "react-router-dom";
import type { NavItem } from "./nav";

/*
 * Admin screens (devices and assignments, users and invitations, audit log, development
 * mailbox) plug in here. The router mounts these under `/admin`, behind the admin role guard and
 * inside the shared layout; give them an `index` route for the admin's home. Use `lazy` so their
 * code loads only for admins. Owned by the researcher/admin portal work.
 */
export function adminRoutes(_queryClient: QueryClient): RouteObject[] {
  return [];
}

/** Links shown in the admin's navigation bar (paths relative to the site root). */
export const adminNav: NavItem[] = [];
