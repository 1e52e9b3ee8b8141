import type { QueryClient } from "@tanstack/react-query";
import { createBrowserRouter, type RouteObject } from "react-router-dom";
import { AppShell, AuthLayout, PendingPage } from "./layout/app-shell";
import { NotFound, RouteError } from "./layout/route-error";
import { adminRoutes } from "./routes/admin";
import { AcceptInvitationRoute, AccountSecurityRoute, ResetConfirmRoute, ResetRequestRoute, SecondFactorSetupRoute, SignInRoute } from "./routes/auth";
import { clinicianRoutes } from "./routes/clinician";
import { homeRedirect, redirectSignedIn, requireRole, requireUser } from "./routes/guards";
import { patientRoutes } from "./routes/patient";
import { researcherRoutes } from "./routes/researcher";

/**
 * The whole route tree. Sign-in screens are in the entry chunk (the first thing anyone sees);
 * every role's screens are `lazy`, so a patient's phone never downloads the clinician charts.
 * Each role area sits behind its guard; a person in the wrong area is sent to their own home.
 */
export function createRoutes(queryClient: QueryClient): RouteObject[] {
  return [
    {
      path: "/",
      errorElement: <RouteError />,
      hydrateFallbackElement: <PendingPage />,
      children: [
        { index: true, loader: homeRedirect(queryClient) },
        {
          element: <AuthLayout />,
          children: [
            { path: "sign-in", loader: redirectSignedIn(queryClient), element: <SignInRoute /> },
            { path: "accept-invitation", element: <AcceptInvitationRoute /> },
            { path: "reset-password", element: <ResetRequestRoute /> },
            { path: "reset-password/confirm", element: <ResetConfirmRoute /> },
          ],
        },
        {
          id: "signed-in",
          element: <AppShell />,
          loader: requireUser(queryClient),
          errorElement: <RouteError />,
          children: [
            // Each area has its own error boundary so a failed screen keeps the navigation around it.
            { path: "patient", loader: requireRole(queryClient, "patient"), errorElement: <RouteError />, children: patientRoutes(queryClient) },
            { path: "clinician", loader: requireRole(queryClient, "clinician"), errorElement: <RouteError />, children: clinicianRoutes(queryClient) },
            { path: "research", loader: requireRole(queryClient, "researcher"), errorElement: <RouteError />, children: researcherRoutes(queryClient) },
            { path: "admin", loader: requireRole(queryClient, "admin"), errorElement: <RouteError />, children: adminRoutes(queryClient) },
            // Every role: the authenticator app (a staff account without one is held on the setup screen).
            { path: "second-factor/setup", element: <SecondFactorSetupRoute /> },
            { path: "account/security", element: <AccountSecurityRoute /> },
          ],
        },
        { path: "*", element: <NotFound /> },
      ],
    },
  ];
}

export function createAppRouter(queryClient: QueryClient) {
  return createBrowserRouter(createRoutes(queryClient));
}
