import { QueryClientProvider, type QueryClient } from "@tanstack/react-query";
import { useEffect, useState, type ReactNode } from "react";
import { RouterProvider } from "react-router-dom";
import { authKeys } from "@/features/auth/api/auth-keys";
import { onUnauthenticated } from "@/lib/api-client";
import { createQueryClient } from "@/lib/query-client";
import { createAppRouter } from "./router";

export function AppProviders({ queryClient, children }: { queryClient: QueryClient; children: ReactNode }) {
  return <QueryClientProvider client={queryClient}>{children}</QueryClientProvider>;
}

export function App() {
  const [queryClient] = useState(createQueryClient);
  const [router] = useState(() => createAppRouter(queryClient));

  // When a refresh fails mid-session, forget the person and go to sign-in, keeping the page to return to.
  useEffect(
    () =>
      onUnauthenticated(() => {
        queryClient.setQueryData(authKeys.me(), null);
        const here = router.state.location;
        if (!here.pathname.startsWith("/sign-in")) {
          void router.navigate(`/sign-in?next=${encodeURIComponent(here.pathname + here.search)}`, { replace: true });
        }
      }),
    [queryClient, router],
  );

  return (
    <AppProviders queryClient={queryClient}>
      <RouterProvider router={router} />
    </AppProviders>
  );
}
