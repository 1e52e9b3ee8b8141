import { vi } from "vitest";

export type MockHandler = (req: { url: URL; method: string; body: unknown; headers: Headers }) => { status?: number; body?: unknown } | undefined;

export interface MockApi {
  fetch: ReturnType<typeof vi.fn>;
  calls: { method: string; path: string; body: unknown }[];
}

/**
 * Replaces global fetch with a router over "METHOD /path" keys (path without the query string).
 * Unmatched requests answer 404 with the API's error shape, so a forgotten handler shows up as an
 * error state in the test rather than a hang.
 */
export function mockApi(routes: Record<string, MockHandler | { status?: number; body?: unknown }>): MockApi {
  const calls: MockApi["calls"] = [];
  const fetchMock = vi.fn(async (input: RequestInfo | URL, init: RequestInit = {}) => {
    const url = new URL(typeof input === "string" ? input : input instanceof URL ? input.href : input.url, "http://localhost");
    const method = (init.method ?? "GET").toUpperCase();
    let body: unknown = init.body;
    if (typeof init.body === "string") {
      try {
        body = JSON.parse(init.body);
      } catch {
        body = init.body;
      }
    }
    calls.push({ method, path: url.pathname, body });
    const route = routes[`${method} ${url.pathname}`];
    const result =
      typeof route === "function" ? route({ url, method, body, headers: new Headers(init.headers) }) : route;
    const answer = result ?? { status: 404, body: { error: { code: "not_found", message: `No mock for ${method} ${url.pathname}` } } };
    return new Response(answer.body === undefined ? null : JSON.stringify(answer.body), {
      status: answer.status ?? 200,
      headers: { "Content-Type": "application/json" },
    });
  });
  vi.stubGlobal("fetch", fetchMock);
  return { fetch: fetchMock, calls };
}
