import type { z } from "zod";
import { env } from "@/config/env";
import { ApiError, errorFromBody } from "./api-error";

export { ApiError } from "./api-error";

/*
 * The access token lives only in memory (never localStorage), so a script injected into the page
 * cannot read a long-lived credential. The refresh token is an httpOnly cookie the browser sends
 * to POST /api/auth/refresh; on a 401 we refresh once and retry the request once.
 */
let accessToken: string | null = null;
let refreshInFlight: Promise<string | null> | null = null;
const unauthenticatedListeners = new Set<() => void>();

/*
 * A hint (not a credential) that this browser signed in before, so a visitor who never did is not
 * sent to POST /auth/refresh: that answers 401 without a cookie, and browsers log every 401 in the
 * console. The refresh cookie stays httpOnly; the hint only decides whether asking is worth it.
 */
const SESSION_HINT_KEY = "pendula.signed-in";

function setSessionHint(on: boolean): void {
  try {
    if (on) window.localStorage.setItem(SESSION_HINT_KEY, "1");
    else window.localStorage.removeItem(SESSION_HINT_KEY);
  } catch {
    // Storage can be disabled (private modes); then every load simply tries the refresh cookie.
  }
}

function hasSessionHint(): boolean {
  try {
    return window.localStorage.getItem(SESSION_HINT_KEY) !== null;
  } catch {
    return true;
  }
}

export function getAccessToken(): string | null {
  return accessToken;
}

export function setAccessToken(token: string | null): void {
  accessToken = token;
  setSessionHint(token !== null);
}

/** Called when a refresh fails: the session is over and the app should show sign-in. */
export function onUnauthenticated(listener: () => void): () => void {
  unauthenticatedListeners.add(listener);
  return () => unauthenticatedListeners.delete(listener);
}

export function apiUrl(path: string): string {
  return `${env.API_BASE_URL}${path.startsWith("/") ? path : `/${path}`}`;
}

const NO_REFRESH_PATHS = ["/auth/login", "/auth/refresh", "/auth/logout"];

/**
 * Tabs of one browser share the refresh cookie, and each refresh rotates it. Where the Web Locks
 * API exists, tabs take turns: the second tab's request leaves only after the first one's answer
 * has set the new cookie, so it presents that one instead of the token just replaced (the server
 * would accept that once within its grace window, but taking turns needs no grace at all).
 */
function oneTabAtATime<T>(fn: () => Promise<T>): Promise<T> {
  const locks = typeof navigator !== "undefined" ? navigator.locks : undefined;
  // request() resolves with the callback's return value, itself a promise here; then() flattens it.
  return locks ? locks.request("pendula-refresh", fn).then((settled) => settled) : fn();
}

/** Asks the server for a new access token with the refresh cookie; concurrent 401s share one call. */
export function refreshAccessToken(): Promise<string | null> {
  if (!hasSessionHint()) return Promise.resolve(null);
  refreshInFlight ??= (async () => {
    try {
      const res = await oneTabAtATime(() =>
        fetch(apiUrl("/auth/refresh"), {
          method: "POST",
          credentials: "include",
          headers: { Accept: "application/json" },
        }),
      );
      if (!res.ok) {
        setSessionHint(false);
        return null;
      }
      const body = (await res.json()) as { accessToken?: unknown };
      const token = typeof body.accessToken === "string" ? body.accessToken : null;
      setAccessToken(token);
      return token;
    } catch {
      return null;
    } finally {
      refreshInFlight = null;
    }
  })();
  return refreshInFlight;
}

export interface RequestOptions<T> {
  method?: "GET" | "POST" | "PUT" | "PATCH" | "DELETE";
  /** A plain object is sent as JSON; FormData goes as multipart. */
  body?: unknown;
  query?: Record<string, string | number | boolean | undefined | null>;
  /** Validates the response; a mismatch is an ApiError("bad_response"), not a silent wrong screen. */
  schema?: z.ZodType<T>;
  signal?: AbortSignal;
  /** Return the raw Response (downloads, CSV). */
  raw?: boolean;
}

function buildUrl(path: string, query?: RequestOptions<unknown>["query"]): string {
  const url = apiUrl(path);
  if (!query) return url;
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(query)) if (v !== undefined && v !== null) params.set(k, String(v));
  const qs = params.toString();
  return qs ? `${url}?${qs}` : url;
}

async function send(path: string, options: RequestOptions<unknown>): Promise<Response> {
  const headers: Record<string, string> = { Accept: "application/json" };
  let body: BodyInit | undefined;
  if (options.body instanceof FormData) body = options.body;
  else if (options.body !== undefined) {
    headers["Content-Type"] = "application/json";
    body = JSON.stringify(options.body);
  }
  if (accessToken) headers.Authorization = `Bearer ${accessToken}`;
  try {
    return await fetch(buildUrl(path, options.query), {
      method: options.method ?? (body ? "POST" : "GET"),
      headers,
      body,
      credentials: "include",
      signal: options.signal,
    });
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === "AbortError") throw cause;
    throw new ApiError(0, "network", "Pendula could not reach the server.");
  }
}

async function readJson(res: Response): Promise<unknown> {
  const text = await res.text();
  if (!text) return undefined;
  try {
    return JSON.parse(text);
  } catch {
    return text;
  }
}

export async function request<T = unknown>(path: string, options: RequestOptions<T> = {}): Promise<T> {
  let res = await send(path, options);
  if (res.status === 401 && !NO_REFRESH_PATHS.some((p) => path.startsWith(p))) {
    const token = await refreshAccessToken();
    if (token) res = await send(path, options);
    if (res.status === 401) {
      accessToken = null;
      for (const listener of unauthenticatedListeners) listener();
    }
  }
  if (!res.ok) throw errorFromBody(res.status, await readJson(res), res.statusText);
  if (options.raw) return res as unknown as T;
  const data = res.status === 204 ? undefined : await readJson(res);
  if (!options.schema) return data as T;
  const parsed = options.schema.safeParse(data);
  if (!parsed.success) {
    throw new ApiError(res.status, "bad_response", `The server sent an unexpected answer for ${path}.`, parsed.error.issues);
  }
  return parsed.data;
}

export const api = {
  get: <T>(path: string, options: Omit<RequestOptions<T>, "method" | "body"> = {}) => request<T>(path, { ...options, method: "GET" }),
  post: <T>(path: string, body?: unknown, options: Omit<RequestOptions<T>, "method" | "body"> = {}) =>
    request<T>(path, { ...options, method: "POST", body }),
};

export interface UploadProgress {
  loadedBytes: number;
  totalBytes: number;
}

/**
 * Multipart upload through XMLHttpRequest, the one browser API that reports upload progress.
 * Retries once after a refresh on 401, like `request`.
 */
export function uploadWithProgress<T>(
  path: string,
  makeForm: () => FormData,
  onProgress: (p: UploadProgress) => void,
  options: { schema?: z.ZodType<T>; signal?: AbortSignal } = {},
): Promise<T> {
  const attempt = () =>
    new Promise<{ status: number; body: unknown; statusText: string }>((resolve, reject) => {
      const xhr = new XMLHttpRequest();
      xhr.open("POST", apiUrl(path));
      xhr.withCredentials = true;
      xhr.setRequestHeader("Accept", "application/json");
      if (accessToken) xhr.setRequestHeader("Authorization", `Bearer ${accessToken}`);
      xhr.upload.onprogress = (e) => onProgress({ loadedBytes: e.loaded, totalBytes: e.lengthComputable ? e.total : 0 });
      xhr.onload = () => {
        let body: unknown = xhr.responseText;
        try {
          body = xhr.responseText ? JSON.parse(xhr.responseText) : undefined;
        } catch {
          /* keep text */
        }
        resolve({ status: xhr.status, body, statusText: xhr.statusText });
      };
      xhr.onerror = () => reject(new ApiError(0, "network", "The upload could not reach the server."));
      xhr.onabort = () => reject(new DOMException("Upload cancelled", "AbortError"));
      options.signal?.addEventListener("abort", () => xhr.abort(), { once: true });
      xhr.send(makeForm());
    });

  return (async () => {
    let result = await attempt();
    if (result.status === 401 && (await refreshAccessToken())) result = await attempt();
    if (result.status < 200 || result.status >= 300) throw errorFromBody(result.status, result.body, result.statusText);
    if (!options.schema) return result.body as T;
    const parsed = options.schema.safeParse(result.body);
    if (!parsed.success) throw new ApiError(result.status, "bad_response", "The server sent an unexpected answer to the upload.");
    return parsed.data;
  })();
}
