import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type TestContext } from "../../../testing/harness";

let ctx: TestContext;
let admin: string;
const others: Record<string, string> = {};
beforeAll(async () => {
  ctx = await createTestContext();
  admin = await ctx.tokenFor(await ctx.seedUser({ role: "admin" }));
  for (const role of ["patient", "clinician", "researcher"] as const) others[role] = await ctx.tokenFor(await ctx.seedUser({ role }));
});
afterAll(() => ctx?.close());

const as = (token: string) => ({ Authorization: `Bearer ${token}` });

describe("/api/devices", () => {
  it("admin registers a sensor and lists it with the contract fields", async () => {
    const created = await request(ctx.app).post("/api/devices").set(as(admin)).send({ serial: "LAB-IMU-0101", kind: "imu6", firmware: "2.4.1" });
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({ serial: "LAB-IMU-0101", kind: "imu6", status: "in_stock", firmware: "2.4.1", assignment: null });
    const list = await request(ctx.app).get("/api/devices").set(as(admin));
    expect(list.status).toBe(200);
    const entry = list.body.find((d: { serial: string }) => d.serial === "LAB-IMU-0101");
    expect(Object.keys(entry).sort()).toEqual(["accRangeG", "assignment", "firmware", "gyroRangeDps", "id", "kind", "notes", "serial", "status"]);
    expect(await ctx.db("audit_events").where({ action: "device.create", resource_id: created.body.id }).first()).toBeTruthy();
  });

  it("shows the assignment in force now with patient label and placement", async () => {
    const d = await request(ctx.app).post("/api/devices").set(as(admin)).send({ serial: "LAB-IMU-0102", kind: "imu9", firmware: "2.4.1" });
    const patientId = await ctx.seedPatient({ displayName: "Mira Olsen" });
    await request(ctx.app).post(`/api/devices/${d.body.id}/assignments`).set(as(admin)).send({ patientId, placement: "left_shank", from: "2026-01-01T00:00:00Z" });
    const one = await request(ctx.app).get(`/api/devices/${d.body.id}`).set(as(admin));
    expect(one.body.status).toBe("assigned");
    expect(one.body.assignment).toEqual({ id: expect.any(String), patientId, patientLabel: "Mira Olsen", placement: "left_shank", from: "2026-01-01T00:00:00.000Z", to: null });
    const filtered = await request(ctx.app).get(`/api/devices?patientId=${patientId}`).set(as(admin));
    expect(filtered.body.map((x: { serial: string }) => x.serial)).toEqual(["LAB-IMU-0102"]);
  });

  it("refuses a duplicate serial with 409 and bad input with 400", async () => {
    await request(ctx.app).post("/api/devices").set(as(admin)).send({ serial: "LAB-IMU-0103", kind: "imu6", firmware: "1.0" });
    const dup = await request(ctx.app).post("/api/devices").set(as(admin)).send({ serial: "LAB-IMU-0103", kind: "imu6", firmware: "1.0" });
    expect(dup.status).toBe(409);
    expect(dup.body.error.message).toContain("LAB-IMU-0103");
    expect((await request(ctx.app).post("/api/devices").set(as(admin)).send({ serial: "x", kind: "imu6", firmware: "1" })).status).toBe(400);
    expect((await request(ctx.app).post("/api/devices").set(as(admin)).send({ serial: "LAB-OK-1", kind: "gps", firmware: "1" })).status).toBe(400);
    expect((await request(ctx.app).post("/api/devices").set(as(admin)).send({ serial: "=cmd|' /C calc'!A0", kind: "imu6", firmware: "1" })).status).toBe(400);
  });

  it("patches firmware and status, keeping in_stock/assigned consistent with assignments", async () => {
    const d = await request(ctx.app).post("/api/devices").set(as(admin)).send({ serial: "LAB-IMU-0104", kind: "imu6", firmware: "1.0" });
    const fw = await request(ctx.app).patch(`/api/devices/${d.body.id}`).set(as(admin)).send({ firmware: "1.1" });
    expect(fw.status).toBe(200);
    expect(fw.body.firmware).toBe("1.1");
    expect((await request(ctx.app).patch(`/api/devices/${d.body.id}`).set(as(admin)).send({ status: "assigned" })).status).toBe(409);
    const maint = await request(ctx.app).patch(`/api/devices/${d.body.id}`).set(as(admin)).send({ status: "maintenance" });
    expect(maint.body.status).toBe("maintenance");
    expect((await request(ctx.app).patch(`/api/devices/${d.body.id}`).set(as(admin)).send({})).status).toBe(400);
    expect((await request(ctx.app).patch(`/api/devices/00000000-0000-4000-8000-000000000000`).set(as(admin)).send({ firmware: "2" })).status).toBe(404);
    const audit = await ctx.db("audit_events").where({ action: "device.update", resource_id: d.body.id }).orderBy("id");
    expect(audit[0].details).toEqual({ changed: { firmware: { from: "1.0", to: "1.1" } } });
  });

  it("is admin-only: other roles get 403, no token 401", async () => {
    for (const role of ["patient", "clinician", "researcher"]) {
      expect((await request(ctx.app).get("/api/devices").set(as(others[role]!))).status).toBe(403);
      expect((await request(ctx.app).post("/api/devices").set(as(others[role]!)).send({ serial: "LAB-NO-1", kind: "imu6", firmware: "1" })).status).toBe(403);
    }
    expect((await request(ctx.app).get("/api/devices")).status).toBe(401);
  });
});
