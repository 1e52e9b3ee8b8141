import { existsSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import cookieParser from "cookie-parser";
import express, { type Express } from "express";
import helmet from "helmet";
import { z } from "zod";
import type { AppDeps } from "./deps";
import { ApiRouter, type EndpointRecord, type RouteModule } from "./http/api-router";
import { allowedHosts } from "./middleware/allowed-hosts";
import { apiNotFound, errorHandler } from "./middleware/error-handler";
import { proxyWarning } from "./middleware/proxy-warning";
import { requestId } from "./middleware/request-id";
import { buildOpenApiDocument } from "./openapi/build-document";
import { ROUTE_TABLE } from "./routes";

export type { AppDeps } from "./deps";

const DEFAULT_PORTAL_DIST = fileURLToPath(new URL("../../portal/dist", import.meta.url));

export interface CreateAppOptions {
  /** Replaces the route table (tests of the foundation itself). */
  routes?: RouteModule[];
}

/**
 * The Express application without `listen` (server.ts listens; supertest drives it in-process).
 * `app.locals.endpoints` lists every API endpoint with its access rule.
 */
export function createApp(deps: AppDeps, options: CreateAppOptions = {}): Express {
  const { config } = deps;
  const app = express();
  app.disable("x-powered-by");
  app.set("trust proxy", config.trustProxy ? "loopback" : false);
  app.set("query parser", "simple");

  app.use(requestId);
  app.use(allowedHosts(config.allowedHosts));
  app.use(proxyWarning(config.trustProxy));
  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          "default-src": ["'self'"],
          "script-src": ["'self'"],
          "style-src": ["'self'"],
          "font-src": ["'self'"],
          "img-src": ["'self'", "data:"],
          "connect-src": ["'self'"],
          "object-src": ["'none'"],
          "base-uri": ["'self'"],
          "form-action": ["'self'"],
          "frame-ancestors": ["'none'"],
          ...(config.secureCookies ? { "upgrade-insecure-requests": [] } : {}),
        },
      },
      strictTransportSecurity: config.secureCookies ? { maxAge: 31_536_000, includeSubDomains: true } : false,
      referrerPolicy: { policy: "no-referrer" },
      crossOriginResourcePolicy: { policy: "same-origin" },
    }),
  );
  // No CORS middleware on purpose: the portal is served from this origin, so browsers on any other
  // origin get no Access-Control-Allow-Origin and cannot read answers.
  app.use(cookieParser());
  app.use("/api", express.json({ limit: config.jsonBodyLimit }));
  // Every API answer may carry health data (and the few public ones are cheap), so none is kept
  // by a browser or a shared cache; the trend and session answers keep their ETag for clients that
  // revalidate on their own (http/answer-cache.ts).
  app.use("/api", (_req, res, next) => {
    res.setHeader("Cache-Control", "no-store");
    next();
  });

  const endpoints: EndpointRecord[] = [];
  const system = new ApiRouter("/api", deps);
  system.endpoint({
    method: "get",
    path: "/health",
    summary: "Liveness and database reachability",
    access: "public",
    response: z.strictObject({ status: z.literal("ok") }),
    handler: async () => {
      await deps.db.raw("SELECT 1");
      return { status: "ok" as const };
    },
  });
  system.endpoint({
    method: "get",
    path: "/openapi.json",
    summary: "This API's OpenAPI 3.1 document, generated from the zod contracts",
    access: "public",
    handler: () => buildOpenApiDocument(endpoints, { title: "Pendula API", version: "0.1.0" }),
  });
  app.use(system.prefix, system.router);
  endpoints.push(...system.endpoints);

  for (const module of options.routes ?? ROUTE_TABLE) {
    const built = module.router(deps);
    app.use(module.prefix, built.router);
    endpoints.push(...built.endpoints);
  }
  app.locals.endpoints = endpoints;

  app.use("/api", apiNotFound);
  servePortal(app, config.portalDist ?? DEFAULT_PORTAL_DIST);
  app.use(apiNotFound);
  app.use(errorHandler);
  return app;
}

/** Every endpoint of an app built by createApp, for the OpenAPI document and route-matrix tests. */
export function listEndpoints(app: Express): EndpointRecord[] {
  return app.locals.endpoints as EndpointRecord[];
}

function servePortal(app: Express, dist: string): void {
  const index = path.join(dist, "index.html");
  if (!existsSync(index)) return;
  app.use(express.static(dist, { index: false, maxAge: "1h" }));
  // SPA fallback: any other GET that wants HTML gets the portal shell; the client router takes over.
  app.get("/{*path}", (req, res, next) => {
    if (!req.accepts("html")) return next();
    res.setHeader("Cache-Control", "no-cache");
    res.sendFile(index);
  });
}
