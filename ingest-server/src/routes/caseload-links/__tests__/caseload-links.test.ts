import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type SeededUser, type TestContext } from "../../../testing/harness";

let ctx: TestContext;
let admin: SeededUser;
let clinician: SeededUser;
let adminToken: string;
beforeAll(async () => {
  ctx = await createTestContext();
  admin = await ctx.seedUser({ role: "admin" });
  clinician = await ctx.seedUser({ role: "clinician", displayName: "Ilse Marrowby" });
  adminToken = await ctx.tokenFor(admin);
});
afterAll(() => ctx?.close());

const as = (t: string) => ({ Authorization: `Bearer ${t}` });
const link = (token: string, body: object) => request(ctx.app).post("/api/caseload-links").set(as(token)).send(body);
const end = (token: string, id: string, body: object) => request(ctx.app).delete(`/api/caseload-links/${id}`).set(as(token)).send(body);
const trends = async (user: SeededUser, patientId: string) =>
  (await request(ctx.app).get(`/api/patients/${patientId}/trends`).set(as(await ctx.tokenFor(user)))).status;
const auditOf = (resourceId: string) => ctx.db("audit_events").where({ resource_id: resourceId }).orderBy("id").select("action", "actor_id", "details");

describe("caseload links", () => {
  it("admin links a clinician to a patient with a reason: access starts, the change is audited, a second link is 409", async () => {
    const patientId = await ctx.seedPatient({ displayName: "Orla Penhaligon" });
    expect(await trends(clinician, patientId)).toBe(404);

    const res = await link(adminToken, { clinicianId: clinician.id, patientId, reason: "covering the Tuesday clinic" });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      clinicianId: clinician.id,
      clinicianName: "Ilse Marrowby",
      patientId,
      patientName: "Orla Penhaligon",
      active: true,
      createdBy: admin.id,
      reason: "covering the Tuesday clinic",
      endedAt: null,
    });
    expect(await trends(clinician, patientId)).toBe(200);
    expect(await auditOf(res.body.id)).toEqual([
      { action: "caseload_link.create", actor_id: admin.id, details: { clinicianId: clinician.id, reason: "covering the Tuesday clinic" } },
    ]);

    const again = await link(adminToken, { clinicianId: clinician.id, patientId, reason: "second time" });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe("link_exists");
    expect(await ctx.db("caseload_links").where({ clinician_id: clinician.id, patient_id: patientId }).count<{ n: string }[]>({ n: "*" })).toEqual([{ n: "1" }]);
  });

  it("ending a link stops access at once and keeps it as history with who, when and why; ending it twice is 409", async () => {
    const patientId = await ctx.seedPatient();
    const { body: created } = await link(adminToken, { clinicianId: clinician.id, patientId, reason: "joined the stroke pathway" });
    expect(await trends(clinician, patientId)).toBe(200);

    const ended = await end(adminToken, created.id, { reason: "discharged to community team" });
    expect(ended.status).toBe(200);
    expect(ended.body).toMatchObject({ id: created.id, active: false, endedBy: admin.id, endReason: "discharged to community team" });
    expect(Date.parse(ended.body.endedAt)).toBeGreaterThanOrEqual(Date.parse(created.createdAt));
    expect(await trends(clinician, patientId)).toBe(404);
    expect(await ctx.db("caseload").where({ clinician_id: clinician.id, patient_id: patientId }).first()).toBeUndefined();

    const twice = await end(adminToken, created.id, { reason: "again" });
    expect(twice.status).toBe(409);
    expect(twice.body.error.code).toBe("link_ended");
    expect((await auditOf(created.id)).map((e) => e.action)).toEqual(["caseload_link.create", "caseload_link.end"]);

    const history = await request(ctx.app).get(`/api/caseload-links?patientId=${patientId}&state=all`).set(as(adminToken));
    expect(history.body.items).toHaveLength(1);
    expect(history.body.items[0]).toMatchObject({ active: false, reason: "joined the stroke pathway", endReason: "discharged to community team" });
    const activeOnly = await request(ctx.app).get(`/api/caseload-links?patientId=${patientId}`).set(as(adminToken));
    expect(activeOnly.body.total).toBe(0);
    const unknown = await request(ctx.app).get("/api/caseload-links?patientId=00000000-0000-4000-8000-0000000000ff&state=all").set(as(adminToken));
    expect([unknown.status, unknown.body.total]).toEqual([200, 0]);
    expect((await request(ctx.app).get("/api/caseload-links?state=current").set(as(adminToken))).status).toBe(400);

    // A new link after the end is a new row; the old one stays.
    expect((await link(adminToken, { clinicianId: clinician.id, patientId, reason: "re-referred" })).status).toBe(201);
    expect(await ctx.db("caseload_links").where({ patient_id: patientId }).count<{ n: string }[]>({ n: "*" })).toEqual([{ n: "2" }]);
  });

  it("refuses links to anything but a clinician and a patient (422), bad bodies (400) and unknown links (404), storing nothing", async () => {
    const patientId = await ctx.seedPatient();
    const researcher = await ctx.seedUser({ role: "researcher" });
    const disabled = await ctx.seedUser({ role: "clinician", status: "disabled" });
    const before = await ctx.db("caseload_links").count<{ n: string }[]>({ n: "*" });

    const cases: [object, number, string][] = [
      [{ clinicianId: researcher.id, patientId, reason: "wrong role" }, 422, "not_a_clinician"],
      [{ clinicianId: admin.id, patientId, reason: "wrong role" }, 422, "not_a_clinician"],
      [{ clinicianId: "00000000-0000-4000-8000-000000000000", patientId, reason: "nobody" }, 422, "not_a_clinician"],
      [{ clinicianId: disabled.id, patientId, reason: "disabled" }, 422, "clinician_disabled"],
      [{ clinicianId: clinician.id, patientId: clinician.id, reason: "a user is not a patient" }, 422, "not_a_patient"],
      [{ clinicianId: clinician.id, patientId }, 400, "invalid_request"],
      [{ clinicianId: clinician.id, patientId, reason: "  " }, 400, "invalid_request"],
      [{ clinicianId: clinician.id, patientId, reason: "x".repeat(501) }, 400, "invalid_request"],
      [{ clinicianId: clinician.id, patientId, reason: "ok reason", since: "2020-01-01" }, 400, "invalid_request"],
      [{ clinicianId: "not-a-uuid", patientId, reason: "ok reason" }, 400, "invalid_request"],
    ];
    for (const [body, status, code] of cases) {
      const res = await link(adminToken, body);
      expect({ body, status: res.status, code: res.body.error?.code }).toEqual({ body, status, code });
      expect(typeof res.body.error.message).toBe("string");
    }
    expect(await ctx.db("caseload_links").count<{ n: string }[]>({ n: "*" })).toEqual(before);

    const unknown = await end(adminToken, "00000000-0000-4000-8000-000000000000", { reason: "nothing" });
    expect(unknown.status).toBe(404);
    expect((await end(adminToken, "00000000-0000-4000-8000-000000000000", {})).status).toBe(400);
  });

  it("only admins create or end links; a clinician lists only their own; a patient reads their care team in plain terms", async () => {
    const other = await ctx.seedUser({ role: "clinician", displayName: "Petra Quillfeather" });
    const patient = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id] });
    const { body: created } = await link(adminToken, { clinicianId: other.id, patientId: patient.patientId!, reason: "second opinion on arm swing" });
    const clinicianToken = await ctx.tokenFor(clinician);
    const patientToken = await ctx.tokenFor(patient);

    expect((await link(clinicianToken, { clinicianId: clinician.id, patientId: await ctx.seedPatient(), reason: "self-service" })).status).toBe(403);
    expect((await end(clinicianToken, created.id, { reason: "not mine" })).status).toBe(403);
    expect((await link(patientToken, { clinicianId: clinician.id, patientId: patient.patientId, reason: "x y z" })).status).toBe(403);

    const own = await request(ctx.app).get("/api/caseload-links?state=all").set(as(clinicianToken));
    expect(own.status).toBe(200);
    expect(own.body.items.length).toBeGreaterThan(0);
    expect(own.body.items.every((l: { clinicianId: string }) => l.clinicianId === clinician.id)).toBe(true);
    expect((await request(ctx.app).get(`/api/caseload-links?clinicianId=${other.id}`).set(as(clinicianToken))).status).toBe(403);

    const byClinician = await request(ctx.app).get(`/api/caseload-links?clinicianId=${other.id}`).set(as(adminToken));
    expect(byClinician.body.items.map((l: { id: string }) => l.id)).toEqual([created.id]);

    const team = await request(ctx.app).get("/api/caseload-links/care-team").set(as(patientToken));
    expect(team.status).toBe(200);
    expect(team.body.map((m: { clinicianName: string }) => m.clinicianName).sort()).toEqual(["Petra Quillfeather", clinician.displayName].sort());
    expect(team.body.every((m: object) => Object.keys(m).sort().join() === "active,clinicianName,since,until")).toBe(true);
    expect((await request(ctx.app).get("/api/caseload-links/care-team").set(as(clinicianToken))).status).toBe(403);
    expect((await request(ctx.app).get("/api/caseload-links")).status).toBe(401);
  });

  it("links written outside the service (seeding, fixtures) still appear in the history", async () => {
    const patient = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id] });
    const rows = await ctx.db("caseload_links").where({ patient_id: patient.patientId }).select("clinician_id", "created_by", "ended_at");
    expect(rows).toEqual([{ clinician_id: clinician.id, created_by: null, ended_at: null }]);
    await ctx.db("caseload").where({ patient_id: patient.patientId }).delete();
    const [after] = await ctx.db("caseload_links").where({ patient_id: patient.patientId }).select("ended_at");
    expect(after.ended_at).toBeInstanceOf(Date);
  });
});

describe("an admin cannot give themselves clinical access by inviting", () => {
  it("re-inviting a patient with clinicianIds of an account the admin controls is refused and links nobody", async () => {
    // The admin makes a clinician account whose mailbox they read, then tries to attach patients to it.
    const invited = await request(ctx.app)
      .post("/api/invitations")
      .set(as(adminToken))
      .send({ email: "side.door@example.test", displayName: "Side Door", role: "clinician" });
    expect(invited.status).toBe(201);
    const puppet = { id: invited.body.userId as string, role: "clinician" as const, patientId: null };
    await ctx.db("users").where({ id: puppet.id }).update({ status: "active", password_hash: "x" });
    const puppetToken = await ctx.tokenFor(puppet);

    const active = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id] });
    const pending = await ctx.seedUser({ role: "patient", status: "invited" });
    const recordOnly = await ctx.seedPatient();

    const attempts = [
      { email: active.email, displayName: "x", role: "patient", patientId: active.patientId, clinicianIds: [puppet.id] },
      { email: active.email, displayName: "x", role: "patient", patientId: active.patientId },
      { email: pending.email, displayName: "x", role: "patient", patientId: pending.patientId, clinicianIds: [puppet.id] },
      { email: "another.address@example.test", displayName: "x", role: "patient", patientId: recordOnly, clinicianIds: [puppet.id] },
    ];
    const statuses = [];
    for (const body of attempts) {
      const res = await request(ctx.app).post("/api/invitations").set(as(adminToken)).send(body);
      statuses.push([res.status, res.body.error?.code]);
    }
    expect(statuses).toEqual([
      [422, "use_caseload_links"],
      [409, "account_active"],
      [422, "use_caseload_links"],
      [422, "use_caseload_links"],
    ]);
    for (const patientId of [active.patientId!, pending.patientId!, recordOnly]) {
      expect(await trends({ ...puppet, email: "", password: "", displayName: "" }, patientId)).toBe(404);
    }
    expect(await ctx.db("caseload").where({ clinician_id: puppet.id }).first()).toBeUndefined();
    expect(JSON.stringify((await request(ctx.app).get("/api/patients").set(as(puppetToken))).body)).not.toContain(active.patientId!);
  });
});
