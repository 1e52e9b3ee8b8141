import type { ReactElement, ReactNode } from "react";
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { render } from "@testing-library/react";
import { createMemoryRouter, RouterProvider } from "react-router-dom";
import { vi } from "vitest";

/** A fresh client per test: no cache shared between tests, and no retries hiding a failed request. */
export function testQueryClient(): QueryClient {
  return new QueryClient({ defaultOptions: { queries: { retry: false, staleTime: Infinity }, mutations: { retry: false } } });
}

export function renderWithQuery(ui: ReactElement, client = testQueryClient()) {
  const wrapper = ({ children }: { children: ReactNode }) => <QueryClientProvider client={client}>{children}</QueryClientProvider>;
  return { client, ...render(ui, { wrapper }) };
}

/** Renders `element` at `path` inside a memory data router (for screens that read params or links). */
export function renderAtRoute(element: ReactElement, { path = "/", url = "/" }: { path?: string; url?: string } = {}) {
  const client = testQueryClient();
  const router = createMemoryRouter([{ path, element }, { path: "*", element: <p>elsewhere</p> }], { initialEntries: [url] });
  return { client, router, ...render(<QueryClientProvider client={client}><RouterProvider router={router} /></QueryClientProvider>) };
}

export interface RecordedCall {
  method: string;
  path: string;
  search: URLSearchParams;
  body: unknown;
}

type Responder = unknown | ((call: RecordedCall) => Response | unknown | Promise<Response | unknown>);

export function json(status: number, body: unknown, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(body), { status, headers: { "content-type": "application/json", ...headers } });
}

export function apiError(status: number, code: string, message: string): Response {
  return json(status, { error: { code, message } });
}

/**
 * Replaces global fetch with a table of "METHOD /path" → body or responder. Anything not in the
 * table answers 500 and is recorded, so a test sees an unexpected request instead of hanging.
 */
export function mockApi(routes: Record<string, Responder>) {
  const calls: RecordedCall[] = [];
  const fetchMock = vi.fn(async (input: RequestInfo | URL, init?: RequestInit) => {
    const url = new URL(typeof input === "string" ? input : input instanceof URL ? input.href : input.url, "http://portal.test");
    const method = (init?.method ?? "GET").toUpperCase();
    let body: unknown = undefined;
    if (typeof init?.body === "string") body = JSON.parse(init.body);
    const call: RecordedCall = { method, path: url.pathname, search: url.searchParams, body };
    calls.push(call);
    const responder = routes[`${method} ${url.pathname}`];
    if (responder === undefined) return apiError(500, "unmocked", `no mock for ${method} ${url.pathname}`);
    const result = typeof responder === "function" ? await (responder as (c: RecordedCall) => unknown)(call) : responder;
    return result instanceof Response ? result : json(200, result);
  });
  vi.stubGlobal("fetch", fetchMock);
  return { calls, fetchMock };
}
