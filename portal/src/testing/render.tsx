import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { render } from "@testing-library/react";
import type { ReactNode } from "react";
import { createMemoryRouter, RouterProvider, type RouteObject } from "react-router-dom";

/** A fresh client per test: no cache leaks between tests, and failures surface at once. */
export function createTestQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: { queries: { retry: false, gcTime: Infinity }, mutations: { retry: false } },
  });
}

export function renderRoutes(routes: RouteObject[], initialPath: string, queryClient = createTestQueryClient()) {
  const router = createMemoryRouter(routes, { initialEntries: [initialPath] });
  const utils = render(
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
    </QueryClientProvider>,
  );
  return { ...utils, router, queryClient };
}

/** Renders one component inside providers and a throwaway router (for hooks that need both). */
export function renderWithProviders(ui: ReactNode, { path = "/", queryClient = createTestQueryClient() } = {}) {
  return renderRoutes([{ path: "*", element: ui }], path, queryClient);
}
