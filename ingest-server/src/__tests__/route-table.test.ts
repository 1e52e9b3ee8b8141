import request from "supertest";
import type { z } from "zod";
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

  it("describes every JSON answer with objects that refuse unknown keys at every level", () => {
    const loose: string[] = [];
    let objects = 0;
    for (const e of listEndpoints(ctx.app)) {
      if (!e.response) continue;
      walkObjects(e.response, `${e.method} ${e.path}`, (where, strict) => {
        objects++;
        if (!strict) loose.push(where);
      });
    }
    expect(objects).toBeGreaterThan(50);
    expect(loose).toEqual([]);
  });
});

/**
 * Visits every object schema inside a response schema (through arrays, unions, optional, nullable,
 * records, pipes and lazy schemas) and says whether it is strict: zod's strictObject sets a `never`
 * catch-all, so an unknown key fails the parse instead of being stripped or passed through.
 */
function walkObjects(schema: z.ZodType, where: string, visit: (where: string, strict: boolean) => void, seen = new Set<unknown>()): void {
  if (seen.has(schema)) return;
  seen.add(schema);
  const def = (schema as unknown as { _zod: { def: Record<string, unknown> & { type: string } } })._zod.def;
  const inner = (s: unknown, at: string) => walkObjects(s as z.ZodType, at, visit, seen);
  switch (def.type) {
    case "object": {
      const catchall = def.catchall as { _zod: { def: { type: string } } } | undefined;
      visit(where, catchall?._zod.def.type === "never");
      for (const [key, value] of Object.entries(def.shape as Record<string, unknown>)) inner(value, `${where}.${key}`);
      return;
    }
    case "array":
      return inner(def.element, `${where}[]`);
    case "union":
      return (def.options as unknown[]).forEach((o, i) => inner(o, `${where}|${i}`));
    case "intersection":
      inner(def.left, where);
      return inner(def.right, where);
    case "record":
      return inner(def.valueType, `${where}{}`);
    case "tuple":
      return (def.items as unknown[]).forEach((o, i) => inner(o, `${where}[${i}]`));
    case "optional":
    case "nullable":
    case "default":
    case "prefault":
    case "readonly":
    case "nonoptional":
    case "catch":
      return inner(def.innerType, where);
    case "pipe":
      inner(def.in, where);
      return inner(def.out, where);
    case "lazy":
      return inner((def.getter as () => unknown)(), where);
    default:
      return;
  }
}
