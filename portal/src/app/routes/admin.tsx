import type { QueryClient } from "@tanstack/react-query";
import { redirect, type RouteObject } from "react-router-dom";
import { afterGuard } from "./guards";
import type { NavItem } from "./nav";

/*
 * Admin screens, each loaded with its route. Loaders start the first request while the chunk is
 * still parsing (prefetch, not ensure: a failed request shows the screen's own error state with
 * a retry button instead of the route error page).
 */
export function adminRoutes(queryClient: QueryClient): RouteObject[] {
  return [
    { index: true, loader: () => redirect("/admin/devices") },
    {
      path: "devices",
      lazy: async () => {
        const [page, api] = await Promise.all([
          import("@/features/admin-devices/components/device-inventory-page"),
          import("@/features/admin-devices/api/devices"),
        ]);
        return {
          Component: page.DeviceInventoryPage,
          loader: afterGuard(queryClient, "admin", async () => {
            void queryClient.prefetchQuery(api.devicesQueryOptions());
          }),
        };
      },
    },
    {
      path: "devices/:deviceId",
      lazy: async () => {
        const [page, api, history] = await Promise.all([
          import("@/features/admin-devices/components/device-page"),
          import("@/features/admin-devices/api/devices"),
          import("@/features/admin-devices/api/device-assignments"),
        ]);
        return {
          Component: page.DevicePage,
          loader: afterGuard(queryClient, "admin", async ({ params }: { params: { deviceId?: string } }) => {
            void queryClient.prefetchQuery(api.devicesQueryOptions());
            if (params.deviceId) void queryClient.prefetchQuery(history.deviceAssignmentsQueryOptions(params.deviceId));
          }),
        };
      },
    },
    {
      path: "users",
      lazy: async () => ({ Component: (await import("@/features/admin-users/components/users-page")).UsersPage }),
    },
    {
      path: "invitations",
      lazy: async () => ({ Component: (await import("@/features/admin-users/components/invitations-page")).InvitationsPage }),
    },
    {
      path: "caseloads",
      lazy: async () => {
        const [page, api] = await Promise.all([
          import("@/features/admin-caseloads/components/caseload-links-page"),
          import("@/features/admin-caseloads/api/caseload-links"),
        ]);
        return {
          Component: page.CaseloadLinksPage,
          loader: afterGuard(queryClient, "admin", async () => {
            void queryClient.prefetchQuery(api.caseloadLinksQueryOptions({ state: "active", limit: api.CASELOAD_LINK_PAGE_SIZE, offset: 0 }));
          }),
        };
      },
    },
    {
      path: "audit",
      lazy: async () => ({ Component: (await import("@/features/admin-audit/components/audit-log-page")).AuditLogPage }),
    },
    {
      path: "mailbox",
      lazy: async () => ({ Component: (await import("@/features/admin-mailbox/components/mailbox-page")).MailboxPage }),
    },
  ];
}

/** Links shown in the admin's navigation bar (paths relative to the site root). */
export const adminNav: NavItem[] = [
  { to: "/admin/devices", label: "Devices" },
  { to: "/admin/users", label: "Users" },
  { to: "/admin/invitations", label: "Invitations" },
  { to: "/admin/caseloads", label: "Caseloads" },
  { to: "/admin/audit", label: "Audit log" },
  { to: "/admin/mailbox", label: "Mailbox" },
];
