import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type SeededUser, type TestContext } from "../../../testing/harness";
import { insertDoneSession } from "../../../testing/session-fixtures";

let ctx: TestContext;
let clinician: SeededUser;
let otherClinician: SeededUser;
let patient: SeededUser;
let admin: SeededUser;
const tokens: Record<string, string> = {};
const as = (u: SeededUser) => ({ Authorization: `Bearer ${tokens[u.id]}` });
const sessionIds: string[] = [];

beforeAll(async () => {
  ctx = await createTestContext();
  clinician = await ctx.seedUser({ role: "clinician" });
  otherClinician = await ctx.seedUser({ role: "clinician" });
  patient = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id], patient: { condition: "stroke", birthYear: 1962, enrolledOn: "2026-09-07" } });
  admin = await ctx.seedUser({ role: "admin" });
  for (const u of [clinician, otherClinician, patient, admin]) tokens[u.id] = await ctx.tokenFor(u);
  for (let w = 0; w < 3; w++) {
    const day = new Date(Date.UTC(2026, 8, 8 + 7 * w, 9)).toISOString();
    sessionIds.push(
      await insertDoneSession(ctx, patient.patientId!, day, { cadenceStepsPerMin: 90 + w, walkingSpeedMPerS: 0.6 + 0.1 * w, strideLengthM: 0.8 + 0.05 * w }, {
        units: { cadenceStepsPerMin: "/min", walkingSpeedMPerS: "m/s", strideLengthM: "m" },
      }),
    );
  }
  // The count behind each value as the worker stores it (session_metrics.n).
  await ctx.db("session_metrics").whereIn("session_id", sessionIds).update({ n: 24 });
});

afterAll(async () => {
  await ctx?.close();
});

const patch = (u: SeededUser, body: unknown, id = patient.patientId!) => request(ctx.app).patch(`/api/patients/${id}`).set(as(u)).send(body as object);

describe("PATCH /api/patients/:id (height)", () => {
  it.each([
    ["below 100 cm", { heightCm: 99.9 }],
    ["above 230 cm", { heightCm: 231 }],
    ["not a number", { heightCm: "tall" }],
    ["a numeric string", { heightCm: "172" }],
    ["missing", {}],
    ["with an unknown field", { heightCm: 170, weightKg: 70 }],
  ])("refuses a height %s with 422 and a clear message, storing nothing", async (_label, body) => {
    const res = await patch(clinician, body);
    expect(res.status, JSON.stringify(res.body)).toBe(422);
    expect(res.body.error.code).toBe("invalid_patient_field");
    expect(res.body.error.message).toMatch(/heightCm|unknown field/);
    const row = await ctx.db("patients").where({ id: patient.patientId }).first("height_cm");
    expect(row.height_cm).toBeNull();
  });

  it("stores a good value, answers the patient with it, and audits the edit without the value", async () => {
    const res = await patch(clinician, { heightCm: 172.5 });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ id: patient.patientId, heightCm: 172.5 });
    expect((await request(ctx.app).get(`/api/patients/${patient.patientId}`).set(as(clinician))).body.heightCm).toBe(172.5);
    const event = await ctx.db("audit_events").where({ action: "patient.update", patient_id: patient.patientId }).orderBy("id", "desc").first();
    expect(event).toMatchObject({ actor_id: clinician.id, resource_id: patient.patientId });
    expect(event.details).toEqual({ fields: ["heightCm"] });
  });

  it("accepts the range's edges (100 and 230 cm) and null to clear", async () => {
    expect((await patch(clinician, { heightCm: 100 })).body.heightCm).toBe(100);
    expect((await patch(clinician, { heightCm: 230 })).body.heightCm).toBe(230);
    expect((await patch(clinician, { heightCm: null })).body.heightCm).toBeNull();
    expect((await patch(clinician, { heightCm: 168 })).status).toBe(200);
  });

  it("another clinician gets 404, the patient and an admin 403; the stored height stays", async () => {
    expect((await patch(otherClinician, { heightCm: 150 })).status).toBe(404);
    expect((await patch(patient, { heightCm: 150 })).status).toBe(403);
    expect((await patch(admin, { heightCm: 150 })).status).toBe(403);
    expect((await ctx.db("patients").where({ id: patient.patientId }).first("height_cm")).height_cm).toBe(168);
  });
});

describe("walking speed and stride length reach the summaries and the trend", () => {
  it("the caseload row carries the latest walking speed", async () => {
    const res = await request(ctx.app).get("/api/patients").set(as(clinician));
    expect(res.status).toBe(200);
    expect(res.body.items[0].latest.walkingSpeedMPerS).toBeCloseTo(0.8, 9);
  });

  it("the session list carries walking speed and stride length", async () => {
    const res = await request(ctx.app).get(`/api/patients/${patient.patientId}/sessions`).set(as(patient));
    expect(res.status).toBe(200);
    const newest = res.body.items[0];
    expect(newest.walkingSpeedMPerS).toBeCloseTo(0.8, 9);
    expect(newest.strideLengthM).toBeCloseTo(0.9, 9);
    expect(newest.walkingAid).toBeNull();
  });

  it("trend points carry the count behind each value, the metric says what it counts, and each point its session's walking aid", async () => {
    await ctx.db("walk_sessions").where({ id: sessionIds[2] }).update({ walking_aid: "cane", updated_at: ctx.db.fn.now() });
    const res = await request(ctx.app).get(`/api/patients/${patient.patientId}/trends`).set(as(clinician));
    expect(res.status).toBe(200);
    const speed = res.body.metrics.find((m: { key: string }) => m.key === "walkingSpeedMPerS");
    expect(speed).toMatchObject({ unit: "m/s", label: "Walking speed", countNoun: "strides" });
    expect(speed.points.map((p: { n: number }) => p.n)).toEqual([24, 24, 24]);
    expect(speed.points.map((p: { walkingAid: string | null }) => p.walkingAid)).toEqual([null, null, "cane"]);
    expect(res.body.metrics.find((m: { key: string }) => m.key === "strideLengthM")?.unit).toBe("m");
  });
});
