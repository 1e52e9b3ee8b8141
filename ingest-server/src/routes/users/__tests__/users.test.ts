import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type SeededUser, type TestContext } from "../../../testing/harness";

let ctx: TestContext;
let admin: SeededUser;
let adminToken: string;
beforeAll(async () => {
  ctx = await createTestContext();
  admin = await ctx.seedUser({ role: "admin", displayName: "Admin Prime" });
  adminToken = await ctx.tokenFor(admin);
});
afterAll(() => ctx?.close());

const as = (token: string) => ({ Authorization: `Bearer ${token}` });

describe("GET /api/me", () => {
  it("returns the signed-in user for every role, with patientId only for patients", async () => {
    for (const role of ["patient", "clinician", "researcher", "admin"] as const) {
      const u = await ctx.seedUser({ role });
      const res = await request(ctx.app).get("/api/me").set(as(await ctx.tokenFor(u)));
      expect(res.status).toBe(200);
      expect(res.body).toMatchObject({ id: u.id, email: u.email, role, displayName: u.displayName });
      if (role === "patient") expect(res.body.patientId).toBe(u.patientId);
      else expect(res.body).not.toHaveProperty("patientId");
    }
    expect((await request(ctx.app).get("/api/me")).status).toBe(401);
  });
});

describe("/api/users", () => {
  it("lists with filters and paging; search treats % and _ literally", async () => {
    await ctx.seedUser({ role: "researcher", email: "r.one@example.test" });
    await ctx.seedUser({ role: "researcher", email: "r.two@example.test", status: "disabled" });
    const researchers = await request(ctx.app).get("/api/users?role=researcher").set(as(adminToken));
    expect(researchers.status).toBe(200);
    expect(researchers.body.items.every((u: { role: string }) => u.role === "researcher")).toBe(true);
    expect(researchers.body.items.map((u: { email: string }) => u.email)).toEqual(expect.arrayContaining(["r.one@example.test", "r.two@example.test"]));
    expect(researchers.body.total).toBe(researchers.body.items.length);
    const disabled = await request(ctx.app).get("/api/users?role=researcher&status=disabled").set(as(adminToken));
    expect(disabled.body.items.map((u: { email: string }) => u.email)).toEqual(["r.two@example.test"]);
    const q = await request(ctx.app).get("/api/users?q=R.ONE").set(as(adminToken));
    expect(q.body.items.map((u: { email: string }) => u.email)).toEqual(["r.one@example.test"]);
    expect((await request(ctx.app).get("/api/users?q=%25").set(as(adminToken))).body.total).toBe(0);
    const paged = await request(ctx.app).get("/api/users?limit=1&offset=1").set(as(adminToken));
    expect(paged.body.items).toHaveLength(1);
    expect(paged.body).toMatchObject({ limit: 1, offset: 1 });
    expect((await request(ctx.app).get("/api/users?limit=0").set(as(adminToken))).status).toBe(400);
    expect((await request(ctx.app).get("/api/users?role=root").set(as(adminToken))).status).toBe(400);
  });

  it("changes a role, ends the user's sessions and audits the change", async () => {
    const u = await ctx.seedUser({ role: "researcher" });
    const before = await ctx.tokenFor(u);
    const res = await request(ctx.app).patch(`/api/users/${u.id}`).set(as(adminToken)).send({ role: "clinician" });
    expect(res.status).toBe(200);
    expect(res.body.role).toBe("clinician");
    expect((await request(ctx.app).get("/api/me").set(as(before))).status).toBe(401);
    const ev = await ctx.db("audit_events").where({ action: "user.update", resource_id: u.id }).first();
    expect(ev.actor_id).toBe(admin.id);
    expect(ev.details).toEqual({ changed: { role: { from: "researcher", to: "clinician" } } });
  });

  it("disables an account; its refresh sessions are revoked", async () => {
    const u = await ctx.seedUser({ role: "clinician" });
    const login = await request(ctx.app).post("/api/auth/login").send({ email: u.email, password: u.password });
    const cookie = (login.headers["set-cookie"] as unknown as string[])[0]!.split(";")[0]!;
    const res = await request(ctx.app).post(`/api/users/${u.id}/disable`).set(as(adminToken));
    expect(res.status).toBe(200);
    expect(res.body.status).toBe("disabled");
    expect((await request(ctx.app).post("/api/auth/refresh").set("Cookie", cookie)).status).toBe(401);
    expect((await request(ctx.app).post("/api/auth/login").send({ email: u.email, password: u.password })).status).toBe(401);
  });

  it("refuses patient-role moves, activating an invited account and self-lockout", async () => {
    const p = await ctx.seedUser({ role: "patient" });
    const c = await ctx.seedUser({ role: "clinician" });
    const inv = await ctx.seedUser({ role: "clinician", status: "invited" });
    expect((await request(ctx.app).patch(`/api/users/${p.id}`).set(as(adminToken)).send({ role: "clinician" })).status).toBe(422);
    expect((await request(ctx.app).patch(`/api/users/${c.id}`).set(as(adminToken)).send({ role: "patient" })).status).toBe(422);
    expect((await request(ctx.app).patch(`/api/users/${inv.id}`).set(as(adminToken)).send({ status: "active" })).status).toBe(422);
    const self = await request(ctx.app).post(`/api/users/${admin.id}/disable`).set(as(adminToken));
    expect(self.status).toBe(409);
    expect(self.body.error.code).toBe("self_lockout");
    expect((await request(ctx.app).patch(`/api/users/${c.id}`).set(as(adminToken)).send({})).status).toBe(400);
    expect((await request(ctx.app).get(`/api/users/not-a-uuid`).set(as(adminToken))).status).toBe(400);
    expect((await request(ctx.app).get(`/api/users/00000000-0000-4000-8000-000000000000`).set(as(adminToken))).status).toBe(404);
  });

  it("is admin-only", async () => {
    for (const role of ["patient", "clinician", "researcher"] as const) {
      const t = await ctx.tokenFor(await ctx.seedUser({ role }));
      expect((await request(ctx.app).get("/api/users").set(as(t))).status).toBe(403);
      expect((await request(ctx.app).patch(`/api/users/${admin.id}`).set(as(t)).send({ status: "disabled" })).status).toBe(403);
    }
    expect((await request(ctx.app).get("/api/users")).status).toBe(401);
  });
});
