import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { audit } from "../../../audit/audit";
import { createTestContext, type SeededUser, type TestContext } from "../../../testing/harness";

let ctx: TestContext;
let admin: SeededUser;
let token: string;
beforeAll(async () => {
  ctx = await createTestContext();
  admin = await ctx.seedUser({ role: "admin" });
  token = await ctx.tokenFor(admin);
});
afterAll(() => ctx?.close());

const as = (t: string) => ({ Authorization: `Bearer ${t}` });

describe("GET /api/audit", () => {
  it("filters by actor, action (exact or prefix), patient and time, newest first, with paging", async () => {
    const clinician = await ctx.seedUser({ role: "clinician" });
    const patientId = await ctx.seedPatient();
    const req = { ip: "127.0.0.9", headers: { "user-agent": "probe" }, auth: { userId: clinician.id, role: "clinician" } };
    await audit(ctx.db, req, { action: "patient.read", resourceType: "patient", resourceId: patientId, patientId });
    await audit(ctx.db, req, { action: "session.read", resourceType: "walk_session", patientId });
    await request(ctx.app).post("/api/auth/login").send({ email: admin.email, password: admin.password });

    const byActor = await request(ctx.app).get(`/api/audit?actorId=${clinician.id}`).set(as(token));
    expect(byActor.status).toBe(200);
    expect(byActor.body.items.map((e: { action: string }) => e.action)).toEqual(["session.read", "patient.read"]);
    expect(byActor.body.items[0]).toMatchObject({ actorRole: "clinician", actorEmail: clinician.email, ip: "127.0.0.9", userAgent: "probe" });

    const byPatient = await request(ctx.app).get(`/api/audit?patientId=${patientId}&action=patient.read`).set(as(token));
    expect(byPatient.body.total).toBe(1);
    const prefix = await request(ctx.app).get(`/api/audit?action=auth.`).set(as(token));
    expect(prefix.body.items.every((e: { action: string }) => e.action.startsWith("auth."))).toBe(true);
    expect(prefix.body.total).toBeGreaterThan(0);

    const future = await request(ctx.app).get(`/api/audit?from=${encodeURIComponent(new Date(Date.now() + 3_600_000).toISOString())}`).set(as(token));
    expect(future.body.total).toBe(0);
    const paged = await request(ctx.app).get(`/api/audit?limit=1`).set(as(token));
    expect(paged.body.items).toHaveLength(1);
    expect(paged.body.total).toBeGreaterThanOrEqual(3);
  });

  it("rejects bad filters with 400", async () => {
    expect((await request(ctx.app).get("/api/audit?from=yesterday").set(as(token))).status).toBe(400);
    expect((await request(ctx.app).get("/api/audit?action=DROP%20TABLE").set(as(token))).status).toBe(400);
    const t1 = "2026-05-01T00:00:00Z";
    expect((await request(ctx.app).get(`/api/audit?from=${t1}&to=${t1}`).set(as(token))).status).toBe(400);
  });

  it("is admin-only", async () => {
    for (const role of ["patient", "clinician", "researcher"] as const) {
      expect((await request(ctx.app).get("/api/audit").set(as(await ctx.tokenFor(await ctx.seedUser({ role }))))).status).toBe(403);
    }
    expect((await request(ctx.app).get("/api/audit")).status).toBe(401);
  });
});

describe("GET /api/dev/mailbox", () => {
  it("lists messages the SMTP fake captured, newest first, for admins only", async () => {
    await ctx.deps.mailer.send({ to: "a@example.test", subject: "first", text: "1", kind: "test", idempotencyKey: "mb-1" });
    await ctx.mailbox.waitFor((m) => m.subject === "first");
    await new Promise((r) => setTimeout(r, 20));
    await ctx.deps.mailer.send({ to: "b@example.test", subject: "second", text: "2", kind: "test", idempotencyKey: "mb-2" });
    await ctx.mailbox.waitFor((m) => m.subject === "second");
    const res = await request(ctx.app).get("/api/dev/mailbox").set(as(token));
    expect(res.status).toBe(200);
    expect(res.body.messages.map((m: { subject: string }) => m.subject).slice(0, 2)).toEqual(["second", "first"]);
    const clinician = await ctx.tokenFor(await ctx.seedUser({ role: "clinician" }));
    expect((await request(ctx.app).get("/api/dev/mailbox").set(as(clinician))).status).toBe(403);
  });

  it("does not exist when no SMTP fake mailbox is configured", async () => {
    const prod = await createTestContext({ env: { DEV_MAILBOX_DIR: "", NODE_ENV: "production" } });
    try {
      const t = await prod.tokenFor(await prod.seedUser({ role: "admin" }));
      expect((await request(prod.app).get("/api/dev/mailbox").set(as(t))).status).toBe(404);
    } finally {
      await prod.close();
    }
  });
});
