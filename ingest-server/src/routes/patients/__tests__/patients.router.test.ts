import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { seedAccessCast, type AccessCast } from "../../../testing/access-cast";
import { expectRevalidatedAnswer } from "../../../testing/cached-answer";
import { createTestContext, type SeededUser, type TestContext } from "../../../testing/harness";
import { insertDoneSession } from "../../../testing/session-fixtures";

let ctx: TestContext;
let cast: AccessCast;
const sessionIds: string[] = [];

const as = (u: SeededUser) => ({ Authorization: `Bearer ${cast.tokens[u.id]}` });

beforeAll(async () => {
  ctx = await createTestContext();
  cast = await seedAccessCast(ctx, { patient: { displayName: "Ilse Varnhagen", condition: "stroke", birthYear: 1961, enrolledOn: "2026-09-07" } });
  // Eight weekly sessions with cadence rising 92 → 106 steps/min.
  for (let w = 0; w < 8; w++) {
    const day = new Date(Date.UTC(2026, 8, 8 + 7 * w, 9)).toISOString();
    sessionIds.push(
      await insertDoneSession(ctx, cast.patient.patientId!, day, { cadenceStepsPerMin: 92 + 2 * w, strideTimeCvPct: 3.2 - 0.1 * w, phaseCoordinationIndexPct: 6 }),
    );
  }
});

afterAll(async () => {
  await ctx?.close();
});

describe("GET /api/patients", () => {
  it("clinician: own caseload only, with summary columns", async () => {
    const res = await request(ctx.app).get("/api/patients").set(as(cast.clinician));
    expect(res.status).toBe(200);
    expect(res.body.items.map((p: { id: string }) => p.id)).toEqual([cast.patient.patientId]);
    const [row] = res.body.items;
    expect(row).toMatchObject({ displayName: "Ilse Varnhagen", condition: "stroke", sessionsCount: 8 });
    expect(row.latest).toMatchObject({ sessionId: sessionIds[7], cadenceStepsPerMin: 106 });
    expect(row.lastRecordedAt).toBe(new Date(Date.UTC(2026, 8, 57, 9)).toISOString());
    expect(row.adherencePct === null || (row.adherencePct >= 0 && row.adherencePct <= 100)).toBe(true);
    // Cadence 106 vs a 92/94/96 baseline (mean 94, SD 2): beyond MDC95 = 2.77·SD ≈ 5.5 (Weir 2005) → improved;
    // PCI stays at 6 % → no flag. The same rule as the trend page.
    expect(row.flags).toContainEqual(
      expect.objectContaining({ metricKey: "cadenceStepsPerMin", flag: "improved", kind: "improved", label: "Cadence better than baseline" }),
    );
    expect(row.flags.map((f: { metricKey: string }) => f.metricKey)).not.toContain("phaseCoordinationIndexPct");
  });

  it("admin: every patient, identity columns only (no condition, no metrics)", async () => {
    const res = await request(ctx.app).get("/api/patients").set(as(cast.admin));
    expect(res.status).toBe(200);
    expect(res.body.items.map((p: { id: string }) => p.id).sort()).toEqual([cast.patient.patientId, cast.otherPatient.patientId].sort());
    for (const item of res.body.items) {
      expect(Object.keys(item).sort()).toEqual(["displayName", "enrolledOn", "id", "researchConsent", "researchId"]);
    }
  });

  it("patients and researchers are refused", async () => {
    expect((await request(ctx.app).get("/api/patients").set(as(cast.patient))).status).toBe(403);
    expect((await request(ctx.app).get("/api/patients").set(as(cast.researcher))).status).toBe(403);
  });
});

describe("GET /api/patients/:id and /sessions", () => {
  it("the patient, their clinician and an admin (identity only) may read; others get 404 or 403", async () => {
    const get = (u: SeededUser) => request(ctx.app).get(`/api/patients/${cast.patient.patientId}`).set(as(u));
    expect((await get(cast.patient)).body).toMatchObject({ id: cast.patient.patientId, condition: "stroke" });
    expect((await get(cast.clinician)).status).toBe(200);
    const adminView = await get(cast.admin);
    expect(adminView.status).toBe(200);
    expect(adminView.body.condition).toBeUndefined();
    expect((await get(cast.otherClinician)).status).toBe(404);
    expect((await get(cast.otherPatient)).status).toBe(404);
    expect((await get(cast.researcher)).status).toBe(403);
    // A refused read is not logged as a read (the audit row is written in the same statement as
    // the access check, only when access holds).
    const refused = await ctx.db("audit_events").where({ action: "patient.read_trends" }).whereIn("actor_id", [cast.otherPatient.id, cast.otherClinician.id]);
    expect(refused).toEqual([]);
  });

  it("lists sessions newest first with paging", async () => {
    const res = await request(ctx.app).get(`/api/patients/${cast.patient.patientId}/sessions?limit=3`).set(as(cast.clinician));
    expect(res.status).toBe(200);
    expect(res.body.total).toBe(8);
    expect(res.body.items.map((s: { id: string }) => s.id)).toEqual([sessionIds[7], sessionIds[6], sessionIds[5]]);
    expect(res.body.items[0].cadenceStepsPerMin).toBe(106);
    expect((await request(ctx.app).get(`/api/patients/${cast.patient.patientId}/sessions`).set(as(cast.admin))).status).toBe(403);
    expect((await request(ctx.app).get(`/api/patients/${cast.patient.patientId}/sessions`).set(as(cast.otherClinician))).status).toBe(404);
  });

  it("a malformed id is a 400, not a 500", async () => {
    expect((await request(ctx.app).get("/api/patients/not-a-uuid").set(as(cast.clinician))).status).toBe(400);
  });
});

describe("GET /api/patients/:id/trends", () => {
  it("returns one point per session per metric, keyed by the signal metric names, with clinical annotations", async () => {
    const res = await request(ctx.app).get(`/api/patients/${cast.patient.patientId}/trends`).set(as(cast.clinician));
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const keys = res.body.metrics.map((m: { key: string }) => m.key);
    expect(keys).toEqual(["cadenceStepsPerMin", "strideTimeCvPct", "phaseCoordinationIndexPct"]);
    const cadence = res.body.metrics[0];
    expect(cadence.unit).toBe("/min");
    expect(cadence.points.map((p: { value: number }) => p.value)).toEqual([92, 94, 96, 98, 100, 102, 104, 106]);
    expect(cadence.points[0]).toMatchObject({ sessionId: sessionIds[0], recordedAt: new Date(Date.UTC(2026, 8, 8, 9)).toISOString() });
    expect(Array.isArray(cadence.bands)).toBe(true);
    expect(Array.isArray(res.body.cautions)).toBe(true);
  });

  it("filters by metric and rejects unknown keys with 400", async () => {
    const one = await request(ctx.app).get(`/api/patients/${cast.patient.patientId}/trends?metrics=strideTimeCvPct`).set(as(cast.patient));
    expect(one.body.metrics.map((m: { key: string }) => m.key)).toEqual(["strideTimeCvPct"]);
    const bad = await request(ctx.app).get(`/api/patients/${cast.patient.patientId}/trends?metrics=walkingSpeed`).set(as(cast.patient));
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/walkingSpeed/);
  });

  it("is out of reach for other patients, other clinicians, admins and researchers", async () => {
    const get = (u: SeededUser) => request(ctx.app).get(`/api/patients/${cast.patient.patientId}/trends`).set(as(u));
    expect((await get(cast.otherPatient)).status).toBe(404);
    expect((await get(cast.otherClinician)).status).toBe(404);
    expect((await get(cast.admin)).status).toBe(403);
    expect((await get(cast.researcher)).status).toBe(403);
  });

  it("a repeated read is identical, and a newly processed session shows at once (the cache follows the data)", async () => {
    const p2 = await ctx.seedUser({ role: "patient", caseloadOf: [cast.clinician.id], patient: { condition: "stroke", birthYear: 1961 } });
    for (let w = 0; w < 4; w++) {
      await insertDoneSession(ctx, p2.patientId!, new Date(Date.UTC(2026, 8, 8 + 7 * w, 9)).toISOString(), { cadenceStepsPerMin: 90 + w });
    }
    const get = () => request(ctx.app).get(`/api/patients/${p2.patientId}/trends`).set(as(cast.clinician));
    // Revalidation with the ETag answers 304 without a body while nothing changed.
    const { second, etag } = await expectRevalidatedAnswer(get);
    expect(second.body.metrics[0].points).toHaveLength(4);
    await insertDoneSession(ctx, p2.patientId!, new Date(Date.UTC(2026, 9, 6, 9)).toISOString(), { cadenceStepsPerMin: 120 });
    const third = await get().set("If-None-Match", etag);
    expect(third.status).toBe(200);
    expect(third.headers.etag).not.toBe(etag);
    expect(third.body.metrics[0].points.map((x: { value: number }) => x.value)).toEqual([90, 91, 92, 93, 120]);
    // Every read is audited, cached, revalidated or not.
    const n = await ctx.db("audit_events").where({ action: "patient.read_trends", patient_id: p2.patientId }).count<{ n: string }[]>({ n: "*" });
    expect(Number(n[0]?.n)).toBe(4);
  });

  it("a date window hides points but keeps the whole-series baseline and flags", async () => {
    const all = await request(ctx.app).get(`/api/patients/${cast.patient.patientId}/trends?metrics=cadenceStepsPerMin`).set(as(cast.clinician));
    const from = new Date(Date.UTC(2026, 8, 37, 0)).toISOString(); // the day after the 5th session
    const late = await request(ctx.app).get(`/api/patients/${cast.patient.patientId}/trends?metrics=cadenceStepsPerMin&from=${from}`).set(as(cast.clinician));
    expect(late.status).toBe(200);
    const a = all.body.metrics[0];
    const l = late.body.metrics[0];
    expect(l.points.map((x: { value: number }) => x.value)).toEqual([102, 104, 106]);
    expect(l.baseline).toEqual(a.baseline);
    expect(l.points.map((x: { flag?: string }) => x.flag)).toEqual(a.points.slice(-3).map((x: { flag?: string }) => x.flag));
  });

  it("audits the read with the reader, the patient id and the user agent", async () => {
    const before = await ctx.db("audit_events").where({ action: "patient.read_trends", patient_id: cast.patient.patientId }).count<{ n: string }[]>({ n: "*" });
    await request(ctx.app).get(`/api/patients/${cast.patient.patientId}/trends`).set(as(cast.clinician)).set("User-Agent", "ward-tablet/2.1").expect(200);
    const rows = await ctx.db("audit_events").where({ action: "patient.read_trends", patient_id: cast.patient.patientId }).orderBy("id");
    expect(rows).toHaveLength(Number(before[0]?.n) + 1);
    expect(rows.at(-1)).toMatchObject({ actor_id: cast.clinician.id, actor_role: "clinician", resource_type: "patient", resource_id: cast.patient.patientId, user_agent: "ward-tablet/2.1" });
  });
});

describe("/api/patients/:id/notes", () => {
  const path = () => `/api/patients/${cast.patient.patientId}/notes`;

  it("the clinician of the caseload writes and reads notes", async () => {
    const created = await request(ctx.app).post(path()).set(as(cast.clinician)).send({ body: "Walked without the cane today.", sessionId: sessionIds[7] });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    expect(created.body).toMatchObject({ body: "Walked without the cane today.", sessionId: sessionIds[7], authorId: cast.clinician.id });
    const list = await request(ctx.app).get(path()).set(as(cast.clinician));
    expect(list.body.items).toHaveLength(1);
  });

  it("admins, patients, researchers and other clinicians cannot read clinical free text", async () => {
    expect((await request(ctx.app).get(path()).set(as(cast.admin))).status).toBe(403);
    expect((await request(ctx.app).get(path()).set(as(cast.patient))).status).toBe(403);
    expect((await request(ctx.app).get(path()).set(as(cast.researcher))).status).toBe(403);
    expect((await request(ctx.app).get(path()).set(as(cast.otherClinician))).status).toBe(404);
    expect((await request(ctx.app).post(path()).set(as(cast.otherClinician)).send({ body: "x" })).status).toBe(404);
  });

  it("rejects an empty body and a session of another patient, storing nothing", async () => {
    const other = await insertDoneSession(ctx, cast.otherPatient.patientId!, "2026-10-01T09:00:00Z", {});
    expect((await request(ctx.app).post(path()).set(as(cast.clinician)).send({ body: "   " })).status).toBe(400);
    expect((await request(ctx.app).post(path()).set(as(cast.clinician)).send({ body: "ok", sessionId: other })).status).toBe(422);
    const n = await ctx.db("clinician_notes").count<{ n: string }[]>({ n: "*" });
    expect(Number(n[0]?.n)).toBe(1);
  });

  it("the audit event records the note without its text", async () => {
    const [event] = await ctx.db("audit_events").where({ action: "note.create" });
    expect(JSON.stringify(event.details)).not.toContain("cane");
  });
});

describe("/api/patients/:id/training", () => {
  const path = () => `/api/patients/${cast.patient.patientId}/training`;

  it("the clinician logs and lists training", async () => {
    const res = await request(ctx.app).post(path()).set(as(cast.clinician)).send({ performedOn: "2026-10-12", kind: "treadmill", minutes: 30, description: "2.0 km/h" });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body).toMatchObject({ performedOn: "2026-10-12", kind: "treadmill", minutes: 30 });
    const list = await request(ctx.app).get(path()).set(as(cast.clinician));
    expect(list.body.items.map((t: { performedOn: string }) => t.performedOn)).toEqual(["2026-10-12"]);
  });

  it("validates kind, minutes and date", async () => {
    for (const body of [
      { performedOn: "2026-10-12", kind: "swimming", minutes: 30 },
      { performedOn: "2026-10-12", kind: "balance", minutes: 0 },
      { performedOn: "12/10/2026", kind: "balance", minutes: 20 },
    ]) {
      expect((await request(ctx.app).post(path()).set(as(cast.clinician)).send(body)).status).toBe(400);
    }
  });

  it("is closed to other clinicians (404), admins, patients and researchers (403)", async () => {
    expect((await request(ctx.app).get(path()).set(as(cast.otherClinician))).status).toBe(404);
    for (const u of [cast.admin, cast.patient, cast.researcher]) expect((await request(ctx.app).get(path()).set(as(u))).status).toBe(403);
  });
});

describe("OpenAPI document", () => {
  it("documents the session, patient, note, training and research endpoints from their zod contracts", async () => {
    const res = await request(ctx.app).get("/api/openapi.json");
    expect(res.status, JSON.stringify(res.body).slice(0, 500)).toBe(200);
    const paths = Object.keys(res.body.paths);
    for (const p of ["/api/sessions", "/api/sessions/{id}", "/api/sessions/{id}/signal", "/api/patients/{id}/trends", "/api/patients/{id}/notes", "/api/research/cohort-metrics"]) {
      expect(paths).toContain(p);
    }
  });
});

// Last in the file: it adds a patient to the caseload, which the counts above do not expect.
describe("GET /api/patients after new sessions", () => {
  it("a caseload re-read follows newly processed sessions (stored flags follow the data)", async () => {
    const p3 = await ctx.seedUser({ role: "patient", caseloadOf: [cast.clinician.id], patient: { condition: "stroke", birthYear: 1958 } });
    for (let w = 0; w < 4; w++) {
      await insertDoneSession(ctx, p3.patientId!, new Date(Date.UTC(2026, 8, 8 + 7 * w, 9)).toISOString(), { cadenceStepsPerMin: 100 + (w % 2) });
    }
    const flagsOf = async () => {
      const res = await request(ctx.app).get("/api/patients").set(as(cast.clinician));
      expect(res.status).toBe(200);
      return res.body.items.find((r: { id: string }) => r.id === p3.patientId).flags as Array<{ metricKey: string; flag: string }>;
    };
    const cadence = (flags: Array<{ metricKey: string; flag: string }>) => flags.filter((f) => f.metricKey === "cadenceStepsPerMin").map((f) => f.flag);
    expect(cadence(await flagsOf())).toEqual([]);
    expect(cadence(await flagsOf())).toEqual([]); // served from the stored row
    // A session far below the 100/101/100 baseline (beyond MDC95, Weir 2005) is flagged at once.
    await insertDoneSession(ctx, p3.patientId!, new Date(Date.UTC(2026, 9, 6, 9)).toISOString(), { cadenceStepsPerMin: 80 });
    expect(cadence(await flagsOf())).toEqual(["worsened"]);
  });
});
