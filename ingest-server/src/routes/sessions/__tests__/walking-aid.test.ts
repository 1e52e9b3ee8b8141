import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type SeededUser, type TestContext } from "../../../testing/harness";
import { insertDoneSession } from "../../../testing/session-fixtures";

let ctx: TestContext;
let clinician: SeededUser;
let otherClinician: SeededUser;
let patient: SeededUser;
let admin: SeededUser;
let sessionId = "";
const tokens: Record<string, string> = {};
const as = (u: SeededUser) => ({ Authorization: `Bearer ${tokens[u.id]}` });

beforeAll(async () => {
  ctx = await createTestContext();
  clinician = await ctx.seedUser({ role: "clinician" });
  otherClinician = await ctx.seedUser({ role: "clinician" });
  patient = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id] });
  admin = await ctx.seedUser({ role: "admin" });
  for (const u of [clinician, otherClinician, patient, admin]) tokens[u.id] = await ctx.tokenFor(u);
  sessionId = await insertDoneSession(ctx, patient.patientId!, "2026-10-06T09:00:00Z", { cadenceStepsPerMin: 88 });
  await ctx.db("session_metrics").where({ session_id: sessionId }).update({ n: 31 });
});

afterAll(async () => {
  await ctx?.close();
});

const patch = (u: SeededUser, body: unknown) => request(ctx.app).patch(`/api/sessions/${sessionId}`).set(as(u)).send(body as object);
const stored = async () => (await ctx.db("walk_sessions").where({ id: sessionId }).first("walking_aid")).walking_aid;

describe("PATCH /api/sessions/:id (walking aid)", () => {
  it.each([
    ["an unknown aid", { walkingAid: "wheelchair" }],
    ["a number", { walkingAid: 3 }],
    ["a missing field", {}],
    ["an unknown field", { walkingAid: "cane", shoes: "trainers" }],
  ])("refuses %s with 422 and a clear message, storing nothing", async (_label, body) => {
    const res = await patch(clinician, body);
    expect(res.status, JSON.stringify(res.body)).toBe(422);
    expect(res.body.error.code).toBe("invalid_session_field");
    expect(res.body.error.message).toMatch(/walkingAid must be one of none, cane, crutches, rollator, other|unknown field/);
    expect(await stored()).toBeNull();
  });

  it("the caseload clinician records an aid; the session answer shows it (the cached answer follows) and the edit is audited", async () => {
    const before = await request(ctx.app).get(`/api/sessions/${sessionId}`).set(as(clinician));
    expect(before.body.walkingAid).toBeNull();
    const res = await patch(clinician, { walkingAid: "rollator" });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toEqual({ id: sessionId, walkingAid: "rollator" });
    const after = await request(ctx.app).get(`/api/sessions/${sessionId}`).set(as(clinician));
    expect(after.body.walkingAid).toBe("rollator");
    const event = await ctx.db("audit_events").where({ action: "session.update", resource_id: sessionId }).first();
    expect(event).toMatchObject({ actor_id: clinician.id, patient_id: patient.patientId });
    expect(event.details).toEqual({ walkingAid: { from: null, to: "rollator" } });
  });

  it("null clears it", async () => {
    expect((await patch(clinician, { walkingAid: null })).body.walkingAid).toBeNull();
    expect(await stored()).toBeNull();
    await patch(clinician, { walkingAid: "crutches" });
  });

  it("another clinician gets 404, the patient and an admin 403; the stored aid stays", async () => {
    expect((await patch(otherClinician, { walkingAid: "none" })).status).toBe(404);
    expect((await patch(patient, { walkingAid: "none" })).status).toBe(403);
    expect((await patch(admin, { walkingAid: "none" })).status).toBe(403);
    expect(await stored()).toBe("crutches");
  });
});

describe("GET /api/sessions/:id counts", () => {
  it("gives, per stored metric, the strides or steps its value rests on", async () => {
    const res = await request(ctx.app).get(`/api/sessions/${sessionId}`).set(as(patient));
    expect(res.status).toBe(200);
    expect(res.body.metricCounts).toEqual({ cadenceStepsPerMin: { n: 31, countNoun: "strides" } });
  });
});
