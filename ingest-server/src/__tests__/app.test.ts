import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { z } from "zod";
import { listEndpoints } from "../app";
import { ApiRouter } from "../http/api-router";
import { HttpError } from "../http-error";
import { createTestContext, type TestContext } from "../testing/harness";

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext({
    routes: [
      {
        prefix: "/api/probe",
        router: (deps) =>
          new ApiRouter("/api/probe", deps)
            .endpoint({
              method: "post",
              path: "/echo",
              summary: "echo",
              access: "public",
              request: { body: z.object({ n: z.number().int().min(1) }) },
              response: z.object({ n: z.number() }),
              handler: ({ body }) => ({ n: body.n, secret: "stripped" }),
            })
            .endpoint({
              method: "get",
              path: "/teapot",
              summary: "service error",
              access: "public",
              handler: () => {
                throw new HttpError(418, "teapot", "short and stout", { spout: true });
              },
            })
            .endpoint({
              method: "get",
              path: "/boom",
              summary: "unknown error",
              access: "public",
              handler: () => {
                throw new Error("database password is hunter2 at /srv/x.ts:12");
              },
            })
            .endpoint({
              method: "get",
              path: "/broken-contract",
              summary: "handler answers outside its schema",
              access: "public",
              response: z.object({ n: z.number() }),
              handler: () => ({ n: "not a number" }),
            })
            .endpoint({
              method: "get",
              path: "/admin-only",
              summary: "scoped",
              access: { scopes: ["users:read"] },
              handler: ({ auth }) => ({ userId: auth.userId }),
            }),
      },
    ],
  });
});
afterAll(() => ctx?.close());

describe("createApp", () => {
  it("answers /api/health when the database is reachable", async () => {
    const res = await request(ctx.app).get("/api/health");
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ status: "ok" });
  });

  it("sets a strict content security policy and no CORS headers", async () => {
    const res = await request(ctx.app).get("/api/health").set("Origin", "https://elsewhere.example");
    const csp = res.headers["content-security-policy"] as string;
    expect(csp).toContain("default-src 'self'");
    expect(csp).toContain("script-src 'self'");
    expect(csp).not.toContain("unsafe-inline");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(res.headers["access-control-allow-origin"]).toBeUndefined();
    expect(res.headers["x-powered-by"]).toBeUndefined();
    expect(res.headers["x-request-id"]).toMatch(/^[0-9a-f-]{36}$/);
  });

  it("answers unknown /api paths with a JSON 404", async () => {
    const res = await request(ctx.app).get("/api/nothing-here");
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe("not_found");
  });

  it("turns zod failures into 400 with a tree of details", async () => {
    const res = await request(ctx.app).post("/api/probe/echo").send({ n: 0 });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("invalid_request");
    expect(res.body.error.details.properties.n.errors[0]).toMatch(/>=1|at least|too small/i);
  });

  it("rejects malformed JSON with 400 and oversized JSON with 413", async () => {
    const bad = await request(ctx.app).post("/api/probe/echo").set("Content-Type", "application/json").send("{nope");
    expect(bad.status).toBe(400);
    expect(bad.body.error.code).toBe("malformed_json");
    const big = await request(ctx.app)
      .post("/api/probe/echo")
      .send({ n: 1, pad: "x".repeat(200_000) });
    expect(big.status).toBe(413);
    expect(big.body.error.code).toBe("payload_too_large");
  });

  it("strips fields the response contract does not name", async () => {
    const res = await request(ctx.app).post("/api/probe/echo").send({ n: 3 });
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ n: 3 });
  });

  it("passes HttpError status, code and details through", async () => {
    const res = await request(ctx.app).get("/api/probe/teapot");
    expect(res.status).toBe(418);
    expect(res.body).toEqual({ error: { code: "teapot", message: "short and stout", details: { spout: true } } });
  });

  it("answers unknown errors with a bare 500 that leaks nothing", async () => {
    const res = await request(ctx.app).get("/api/probe/boom");
    expect(res.status).toBe(500);
    expect(res.body).toEqual({ error: { code: "internal", message: "internal server error" } });
  });

  it("treats a handler breaking its own response contract as a 500, not the client's fault", async () => {
    const res = await request(ctx.app).get("/api/probe/broken-contract");
    expect(res.status).toBe(500);
  });

  it("requires a token and a scope on scoped endpoints", async () => {
    expect((await request(ctx.app).get("/api/probe/admin-only")).status).toBe(401);
    const clinician = await ctx.seedUser({ role: "clinician" });
    const denied = await request(ctx.app)
      .get("/api/probe/admin-only")
      .set("Authorization", `Bearer ${await ctx.tokenFor(clinician)}`);
    expect(denied.status).toBe(403);
    const admin = await ctx.seedUser({ role: "admin" });
    const ok = await request(ctx.app)
      .get("/api/probe/admin-only")
      .set("Authorization", `Bearer ${await ctx.tokenFor(admin)}`);
    expect(ok.status).toBe(200);
    expect(ok.body).toEqual({ userId: admin.id });
  });

  it("lists every endpoint with its access rule and documents them in /api/openapi.json", async () => {
    const endpoints = listEndpoints(ctx.app).map((e) => `${e.method} ${e.path}`);
    expect(endpoints).toEqual(
      expect.arrayContaining(["get /api/health", "get /api/openapi.json", "post /api/probe/echo", "get /api/probe/admin-only"]),
    );
    const doc = await request(ctx.app).get("/api/openapi.json");
    expect(doc.status).toBe(200);
    expect(doc.body.openapi).toBe("3.1.0");
    const echo = doc.body.paths["/api/probe/echo"].post;
    expect(echo.requestBody.content["application/json"].schema.properties.n.type).toBe("integer");
    expect(doc.body.paths["/api/probe/admin-only"].get["x-pendula-access"]).toEqual({ scopes: ["users:read"] });
  });
});
