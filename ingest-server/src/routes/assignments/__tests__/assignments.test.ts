import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type TestContext } from "../../../testing/harness";

let ctx: TestContext;
let admin: string;
let clinician: string;
beforeAll(async () => {
  ctx = await createTestContext();
  admin = await ctx.tokenFor(await ctx.seedUser({ role: "admin" }));
  clinician = await ctx.tokenFor(await ctx.seedUser({ role: "clinician" }));
});
afterAll(() => ctx?.close());

const as = (token: string) => ({ Authorization: `Bearer ${token}` });
let n = 0;
const device = async () =>
  (await request(ctx.app).post("/api/devices").set(as(admin)).send({ serial: `ASG-${++n}`, kind: "imu6", firmware: "3.0" })).body as { id: string; serial: string };
const assign = (deviceId: string, body: object) => request(ctx.app).post(`/api/devices/${deviceId}/assignments`).set(as(admin)).send(body);

describe("/api/devices/:id/assignments", () => {
  it("assigns, ends and lists history newest first, writing audit events", async () => {
    const d = await device();
    const patientId = await ctx.seedPatient({ displayName: "Tomas Reyes" });
    const a = await assign(d.id, { patientId, placement: "right_wrist", from: "2026-02-01T08:00:00Z" });
    expect(a.status).toBe(201);
    expect(a.body).toMatchObject({ deviceId: d.id, patientId, patientLabel: "Tomas Reyes", placement: "right_wrist", to: null });
    const ended = await request(ctx.app).patch(`/api/devices/${d.id}/assignments/${a.body.id}`).set(as(admin)).send({ to: "2026-02-10T08:00:00Z" });
    expect(ended.status).toBe(200);
    expect(ended.body.to).toBe("2026-02-10T08:00:00.000Z");
    const b = await assign(d.id, { patientId, placement: "left_wrist", from: "2026-02-10T08:00:00Z" });
    expect(b.status).toBe(201); // touching ranges [from, to) do not overlap
    const list = await request(ctx.app).get(`/api/devices/${d.id}/assignments`).set(as(admin));
    expect(list.body.map((x: { placement: string }) => x.placement)).toEqual(["left_wrist", "right_wrist"]);
    const actions = (await ctx.db("audit_events").where({ patient_id: patientId }).orderBy("id")).map((e) => e.action);
    expect(actions).toEqual(["assignment.create", "assignment.end", "assignment.create"]);
  });

  it("refuses a device on two patients at once with a 409 naming the conflict", async () => {
    const d = await device();
    const p1 = await ctx.seedPatient({ displayName: "Ana Lindqvist" });
    const p2 = await ctx.seedPatient({ displayName: "Ben Okafor" });
    await assign(d.id, { patientId: p1, placement: "left_shank", from: "2026-03-01T00:00:00Z", to: "2026-04-01T00:00:00Z" });
    const clash = await assign(d.id, { patientId: p2, placement: "left_shank", from: "2026-03-15T00:00:00Z" });
    expect(clash.status).toBe(409);
    expect(clash.body.error.code).toBe("assignment_overlap");
    expect(clash.body.error.message).toContain(d.serial);
    expect(clash.body.error.message).toContain("Ana Lindqvist");
    expect(clash.body.error.message).toContain("left_shank");
    expect(clash.body.error.details.conflicts).toHaveLength(1);
    expect(await ctx.db("device_assignments").where({ patient_id: p2 })).toHaveLength(0);
  });

  it("refuses two devices on one placement of one patient at once", async () => {
    const d1 = await device();
    const d2 = await device();
    const p = await ctx.seedPatient({ displayName: "Cleo Marsh" });
    await assign(d1.id, { patientId: p, placement: "right_shank", from: "2026-03-01T00:00:00Z" });
    const clash = await assign(d2.id, { patientId: p, placement: "right_shank", from: "2026-05-01T00:00:00Z" });
    expect(clash.status).toBe(409);
    expect(clash.body.error.message).toContain("Cleo Marsh's right_shank already carries another device");
    // Another placement is fine.
    expect((await assign(d2.id, { patientId: p, placement: "left_shank", from: "2026-05-01T00:00:00Z" })).status).toBe(201);
  });

  it("swaps placement as end + new at the same moment", async () => {
    const d = await device();
    const p = await ctx.seedPatient();
    const a = await assign(d.id, { patientId: p, placement: "left_wrist", from: "2026-01-01T00:00:00Z" });
    const swap = await request(ctx.app)
      .post(`/api/devices/${d.id}/assignments/${a.body.id}/swap`)
      .set(as(admin))
      .send({ placement: "right_wrist", at: "2026-01-20T00:00:00Z" });
    expect(swap.status).toBe(201);
    expect(swap.body.ended).toMatchObject({ id: a.body.id, placement: "left_wrist", to: "2026-01-20T00:00:00.000Z" });
    expect(swap.body.started).toMatchObject({ placement: "right_wrist", from: "2026-01-20T00:00:00.000Z", to: null });
    const same = await request(ctx.app).post(`/api/devices/${d.id}/assignments/${swap.body.started.id}/swap`).set(as(admin)).send({ placement: "right_wrist", at: "2026-02-01T00:00:00Z" });
    expect(same.status).toBe(422);
  });

  it("a failed swap keeps the original assignment unchanged", async () => {
    const d1 = await device();
    const d2 = await device();
    const p = await ctx.seedPatient({ displayName: "Dev Pillai" });
    const a = await assign(d1.id, { patientId: p, placement: "left_wrist", from: "2026-01-01T00:00:00Z" });
    await assign(d2.id, { patientId: p, placement: "right_wrist", from: "2026-01-01T00:00:00Z" });
    const swap = await request(ctx.app).post(`/api/devices/${d1.id}/assignments/${a.body.id}/swap`).set(as(admin)).send({ placement: "right_wrist", at: "2026-02-01T00:00:00Z" });
    expect(swap.status).toBe(409);
    expect(swap.body.error.message).toContain("Dev Pillai's right_wrist");
    const row = await ctx.db("device_assignments").where({ id: a.body.id }).first();
    expect(row.valid_to).toBeNull();
  });

  it("rejects a range that ends before it starts, an unknown patient and a retired device", async () => {
    const d = await device();
    const p = await ctx.seedPatient();
    expect((await assign(d.id, { patientId: p, placement: "left_foot", from: "2026-02-01T00:00:00Z", to: "2026-01-01T00:00:00Z" })).status).toBe(400);
    expect((await assign(d.id, { patientId: "00000000-0000-4000-8000-000000000000", placement: "left_foot", from: "2026-02-01T00:00:00Z" })).status).toBe(422);
    expect((await assign(d.id, { patientId: p, placement: "nose", from: "2026-02-01T00:00:00Z" })).status).toBe(400);
    const a = await assign(d.id, { patientId: p, placement: "left_foot", from: "2026-02-01T00:00:00Z" });
    const early = await request(ctx.app).patch(`/api/devices/${d.id}/assignments/${a.body.id}`).set(as(admin)).send({ to: "2026-01-01T00:00:00Z" });
    expect(early.status).toBe(422);
    const retired = await device();
    await request(ctx.app).patch(`/api/devices/${retired.id}`).set(as(admin)).send({ status: "retired" });
    expect((await assign(retired.id, { patientId: p, placement: "right_foot", from: "2026-02-01T00:00:00Z" })).status).toBe(409);
    expect((await request(ctx.app).get(`/api/devices/00000000-0000-4000-8000-000000000000/assignments`).set(as(admin))).status).toBe(404);
  });

  it("is admin-only", async () => {
    const d = await device();
    expect((await request(ctx.app).get(`/api/devices/${d.id}/assignments`).set(as(clinician))).status).toBe(403);
    expect((await request(ctx.app).post(`/api/devices/${d.id}/assignments`).set(as(clinician)).send({})).status).toBe(403);
    expect((await request(ctx.app).get(`/api/devices/${d.id}/assignments`)).status).toBe(401);
  });
});
