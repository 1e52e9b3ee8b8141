import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type SeededUser, type TestContext } from "../../testing/harness";
import { isPatientScopedPath, RefusalCoalescer, refusalRecorderFor } from "../refused-access";

describe("RefusalCoalescer (injected clock)", () => {
  it("writes the first perWindow refusals of an account, counts the rest and hands the count over once the window closes", () => {
    let t = 0;
    const c = new RefusalCoalescer({ perWindow: 3, windowMs: 1000 }, () => t);
    expect([1, 2, 3, 4, 5].map(() => c.admit("a", "clinician"))).toEqual([true, true, true, false, false]);
    expect(c.admit("b", "admin")).toBe(true); // another account has its own window
    t = 999;
    expect(c.take()).toEqual([]);
    expect(c.nextClose()).toBe(1000);
    t = 1000;
    expect(c.take()).toEqual([{ actorId: "a", actorRole: "clinician", count: 2, windowStart: 0, windowEnd: 1000 }]);
    expect(c.take()).toEqual([]);
    expect(c.admit("a", "clinician")).toBe(true);
  });

  it("a refusal after a closed window starts a new one and keeps the closed window's count", () => {
    let t = 0;
    const c = new RefusalCoalescer({ perWindow: 1, windowMs: 100 }, () => t);
    c.admit("a", "patient");
    c.admit("a", "patient");
    c.admit("a", "patient");
    t = 150;
    expect(c.admit("a", "patient")).toBe(true);
    expect(c.admit("a", "patient")).toBe(false);
    expect(c.take(true)).toEqual([
      { actorId: "a", actorRole: "patient", count: 2, windowStart: 0, windowEnd: 100 },
      { actorId: "a", actorRole: "patient", count: 1, windowStart: 150, windowEnd: 250 },
    ]);
  });

  it("keeps its memory bounded: closed windows are swept once a thousand accounts are tracked", () => {
    let t = 0;
    const c = new RefusalCoalescer({ perWindow: 1, windowMs: 10 }, () => t);
    for (let i = 0; i < 1000; i++) c.admit(`u${i}`, "clinician");
    t = 20;
    c.admit("late", "clinician");
    expect(c.size).toBe(1);
  });
});

describe("isPatientScopedPath", () => {
  it("covers patients, their sub-resources and sessions, nothing else", () => {
    for (const p of ["/api/patients", "/api/patients/:id/trends", "/api/sessions", "/api/sessions/:id/signal", "/api/consent/patients/:id"]) {
      expect(isPatientScopedPath(p)).toBe(true);
    }
    for (const p of ["/api/devices/:id", "/api/users", "/api/patientsx", "/api/audit", "/api/caseload-links"]) expect(isPatientScopedPath(p)).toBe(false);
  });
});

describe("refused requests on patient resources are audited", () => {
  let ctx: TestContext;
  let clinician: SeededUser;
  let outsider: SeededUser;
  let patient: SeededUser;
  beforeAll(async () => {
    ctx = await createTestContext();
    clinician = await ctx.seedUser({ role: "clinician" });
    outsider = await ctx.seedUser({ role: "clinician" });
    patient = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id] });
  });
  afterAll(() => ctx?.close());

  const get = async (user: SeededUser, path: string) => request(ctx.app).get(path).set("Authorization", `Bearer ${await ctx.tokenFor(user)}`);
  const refusals = (actorId: string) =>
    ctx.db("audit_events").where({ actor_id: actorId }).whereIn("action", ["access.refused", "access.refused_coalesced"]).orderBy("id").select();

  it("a 404 outside the caseload writes actor, resource, outcome and request id; the allowed read writes no refusal", async () => {
    const res = await get(outsider, `/api/patients/${patient.patientId}/trends`);
    expect(res.status).toBe(404);
    const rows = await refusals(outsider.id);
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({
      actor_role: "clinician",
      action: "access.refused",
      resource_type: "patient",
      resource_id: patient.patientId,
      patient_id: patient.patientId,
      details: { requestId: res.headers["x-request-id"], route: "GET /api/patients/:id/trends", status: 404, code: "not_found" },
    });

    expect((await get(clinician, `/api/patients/${patient.patientId}/trends`)).status).toBe(200);
    expect(await refusals(clinician.id)).toHaveLength(0);
  });

  it("a 403 outside one's scopes, an admin reaching for clinical data, a patient probing another and unknown ids are all traced", async () => {
    const researcher = await ctx.seedUser({ role: "researcher" });
    const admin = await ctx.seedUser({ role: "admin" });
    const other = await ctx.seedUser({ role: "patient" });
    const madeUp = "00000000-0000-4000-8000-00000000abcd";

    expect((await get(researcher, `/api/patients/${patient.patientId}`)).status).toBe(403);
    expect((await get(admin, `/api/patients/${patient.patientId}/notes`)).status).toBe(403);
    expect((await get(other, `/api/patients/${patient.patientId}/trends`)).status).toBe(404);
    expect((await get(outsider, `/api/sessions/${madeUp}`)).status).toBe(404);

    expect((await refusals(researcher.id))[0]).toMatchObject({ resource_id: patient.patientId, details: { status: 403, code: "forbidden" } });
    expect((await refusals(admin.id))[0]).toMatchObject({ patient_id: patient.patientId, details: { route: "GET /api/patients/:id/notes", status: 403 } });
    expect((await refusals(other.id))[0]).toMatchObject({ actor_role: "patient", patient_id: patient.patientId });
    const sessionProbe = (await refusals(outsider.id)).at(-1);
    expect(sessionProbe).toMatchObject({ resource_type: "session", resource_id: madeUp, patient_id: null });
  });

  it("signed-out callers and refusals elsewhere write nothing", async () => {
    const before = await ctx.db("audit_events").where({ action: "access.refused" }).count<{ n: string }[]>({ n: "*" });
    expect((await request(ctx.app).get(`/api/patients/${patient.patientId}/trends`)).status).toBe(401);
    expect((await get(clinician, "/api/devices")).status).toBe(403);
    expect(await ctx.db("audit_events").where({ action: "access.refused" }).count<{ n: string }[]>({ n: "*" })).toEqual(before);
  });

  it("a probing flood is coalesced: the first refusals of the window one by one, the rest as one counted row", async () => {
    const prober = await ctx.seedUser({ role: "clinician" });
    const recorder = refusalRecorderFor(ctx.deps);
    const saved = { ...recorder.coalescer.options };
    recorder.coalescer.options = { perWindow: 3, windowMs: 60_000 };
    try {
      for (let i = 0; i < 12; i++) {
        const id = `00000000-0000-4000-8000-${String(i).padStart(12, "0")}`;
        expect((await get(prober, `/api/patients/${id}`)).status).toBe(404);
      }
      expect((await refusals(prober.id)).map((r) => r.action)).toEqual(["access.refused", "access.refused", "access.refused"]);
      expect(await recorder.flush(true)).toBeGreaterThanOrEqual(1);
      const rows = await refusals(prober.id);
      expect(rows).toHaveLength(4);
      expect(rows[3]).toMatchObject({ action: "access.refused_coalesced", actor_role: "clinician", details: { count: 9, writtenIndividually: 3 } });
    } finally {
      recorder.coalescer.options = saved;
    }
  });
});
