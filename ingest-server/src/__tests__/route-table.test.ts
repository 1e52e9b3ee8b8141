import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { listEndpoints } from "../app";
import { SCOPES } from "../auth/scopes";
import { createTestContext, type TestContext } from "../testing/harness";

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext();
});
afterAll(() => ctx?.close());

describe("the route table", () => {
  it("gives every endpoint an access rule made of known scopes, with no method+path defined twice", () => {
    const endpoints = listEndpoints(ctx.app);
    expect(endpoints.length).toBeGreaterThan(20);
    const seen = new Set<string>();
    for (const e of endpoints) {
      const key = `${e.method} ${e.path}`;
      expect(seen.has(key), key).toBe(false);
      seen.add(key);
      if (typeof e.access === "object") {
        expect(e.access.scopes.length, key).toBeGreaterThan(0);
        for (const s of e.access.scopes) expect(SCOPES, key).toContain(s);
      } else {
        expect(["public", "authenticated"], key).toContain(e.access);
      }
    }
  });

  it("keeps public endpoints to the sign-in family, health and the API document", () => {
    const open = listEndpoints(ctx.app).filter((e) => e.access === "public").map((e) => e.path);
    for (const p of open) expect(p).toMatch(/^\/api\/(auth\/|health$|openapi\.json$)/);
  });

  it("answers every scoped endpoint with 401 when no token is sent", async () => {
    for (const e of listEndpoints(ctx.app).filter((x) => x.access !== "public")) {
      const path = e.path.replace(/:[A-Za-z]+/g, "00000000-0000-4000-8000-000000000000");
      const res = await request(ctx.app)[e.method](path);
      expect(res.status, `${e.method} ${e.path}`).toBe(401);
    }
  });

  it("documents every endpoint in /api/openapi.json", async () => {
    const doc = await request(ctx.app).get("/api/openapi.json");
    expect(doc.status).toBe(200);
    for (const e of listEndpoints(ctx.app)) {
      const path = e.path.replace(/:([A-Za-z0-9_]+)/g, "{$1}");
      expect(doc.body.paths[path]?.[e.method], `${e.method} ${path}`).toBeDefined();
    }
  });
});
