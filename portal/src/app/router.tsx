import type { QueryClient } from "@tanstack/react-query";
import { createBrowserRouter, type RouteObject } from "react-router-dom";
import { AppShell, AuthLayout, PendingPage } from "./layout/app-shell";
import { NotFound, RouteError } from "./layout/route-error";
import { adminRoutes } from "./routes/admin";
import { accountRoutes, SignInRoute } from "./routes/auth";
import { clinicianRoutes } from "./routes/clinician";
import { homeRedirect, redirectSignedIn, requireRole, requireUser } from "./routes/guards";
import { patientRoutes } from "./routes/patient";
import { researcherRoutes } from "./routes/researcher";

/**
 * The whole route tree. The sign-in screen is in the entry chunk (the first thing anyone sees);
 * the other account screens and every role's screens are `lazy`, so a patient's phone never downloads the clinician charts.
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
            accountRoutes.acceptInvitation,
            accountRoutes.resetRequest,
            accountRoutes.resetConfirm,
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
            accountRoutes.secondFactorSetup,
            accountRoutes.accountSecurity,
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
