import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type SeededUser, type TestContext } from "../../../testing/harness";

let ctx: TestContext;
let patient: SeededUser;
let otherPatient: SeededUser;
let clinician: SeededUser;
let otherClinician: SeededUser;
let admin: SeededUser;
let researcher: SeededUser;
const tokens: Record<string, string> = {};
const as = (u: SeededUser) => ({ Authorization: `Bearer ${tokens[u.id]}` });
const path = (pid: string) => `/api/consent/patients/${pid}`;
const record = (u: SeededUser, pid: string, body: unknown) => request(ctx.app).post(`${path(pid)}/events`).set(as(u)).send(body as object);

beforeAll(async () => {
  ctx = await createTestContext();
  clinician = await ctx.seedUser({ role: "clinician" });
  otherClinician = await ctx.seedUser({ role: "clinician" });
  admin = await ctx.seedUser({ role: "admin" });
  researcher = await ctx.seedUser({ role: "researcher" });
  patient = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id] });
  otherPatient = await ctx.seedUser({ role: "patient", caseloadOf: [otherClinician.id] });
  for (const u of [patient, otherPatient, clinician, otherClinician, admin, researcher]) tokens[u.id] = await ctx.tokenFor(u);
});

afterAll(async () => {
  await ctx?.close();
});

describe("research consent as events", () => {
  it("starts with nothing in force and no history", async () => {
    const res = await request(ctx.app).get(path(patient.patientId!)).set(as(patient));
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ patientId: patient.patientId, inForce: false, since: null, awaitingConfirmation: false, events: [] });
  });

  it("a clinician's 'given' is a proposal awaiting the patient; it needs a reason", async () => {
    expect((await record(clinician, patient.patientId!, { kind: "given" })).status).toBe(422);
    expect((await record(clinician, patient.patientId!, { kind: "given", reason: "short" })).body.error.code).toBe("consent_reason_required");
    const res = await record(clinician, patient.patientId!, { kind: "given", reason: "agreed at the clinic visit, leaflet given" });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body).toMatchObject({ inForce: false, awaitingConfirmation: true });
    expect(res.body.events[0]).toMatchObject({ kind: "given", recorderRole: "clinician", counts: false, recordedBy: { id: clinician.id } });
    expect((await record(clinician, patient.patientId!, { kind: "given", reason: "agreed at the clinic visit, again" })).status).toBe(409);
  });

  it("the patient confirms: consent is in force from that moment, and the flag cache follows", async () => {
    const res = await record(patient, patient.patientId!, { kind: "given" });
    expect(res.status).toBe(201);
    expect(res.body.inForce).toBe(true);
    expect(res.body.awaitingConfirmation).toBe(false);
    expect(res.body.since).toBe(res.body.events[0].at);
    expect(res.body.events.map((e: { kind: string; recorderRole: string; counts: boolean }) => [e.kind, e.recorderRole, e.counts])).toEqual([
      ["given", "patient", true],
      ["given", "clinician", false],
    ]);
    expect((await ctx.db("patients").where({ id: patient.patientId }).first("research_consent")).research_consent).toBe(true);
    expect((await record(patient, patient.patientId!, { kind: "given" })).status).toBe(409);
  });

  it("the patient withdraws at any time; a second withdrawal changes nothing (409)", async () => {
    const res = await record(patient, patient.patientId!, { kind: "withdrawn" });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ inForce: false, since: null, awaitingConfirmation: false });
    expect((await ctx.db("patients").where({ id: patient.patientId }).first("research_consent")).research_consent).toBe(false);
    expect((await record(patient, patient.patientId!, { kind: "withdrawn" })).status).toBe(409);
  });

  it("an admin's record counts with a reason; a clinician's withdrawal counts too", async () => {
    expect((await record(admin, patient.patientId!, { kind: "given" })).status).toBe(422);
    const given = await record(admin, patient.patientId!, { kind: "given", reason: "signed paper consent form scanned into the record" });
    expect(given.status).toBe(201);
    expect(given.body.inForce).toBe(true);
    const withdrawn = await record(clinician, patient.patientId!, { kind: "withdrawn", reason: "patient asked by phone to stop research use" });
    expect(withdrawn.status).toBe(201);
    expect(withdrawn.body.inForce).toBe(false);
    expect(withdrawn.body.events).toHaveLength(5);
  });

  it("the clinician and the admin see the whole history; other people read 404, researchers 403", async () => {
    for (const u of [clinician, admin]) {
      const res = await request(ctx.app).get(path(patient.patientId!)).set(as(u));
      expect(res.status).toBe(200);
      expect(res.body.events).toHaveLength(5);
    }
    for (const u of [otherClinician, otherPatient]) {
      expect((await request(ctx.app).get(path(patient.patientId!)).set(as(u))).status).toBe(404);
      expect((await record(u, patient.patientId!, { kind: "given", reason: "not my patient at all" })).status).toBe(404);
    }
    expect((await request(ctx.app).get(path(patient.patientId!)).set(as(researcher))).status).toBe(403);
    expect((await request(ctx.app).get(path("not-a-uuid")).set(as(clinician))).status).toBe(400);
  });

  it("bad bodies are 422 and store nothing", async () => {
    const before = await ctx.db("consent_events").where({ patient_id: patient.patientId }).count({ n: "*" });
    for (const body of [{ kind: "maybe" }, { kind: "given", at: "2020-01-01T00:00:00Z" }, { kind: "given", reason: "x".repeat(501) }, {}]) {
      const res = await record(patient, patient.patientId!, body);
      expect(res.status, JSON.stringify(body)).toBe(422);
      expect(res.body.error.code).toBe("invalid_consent_event");
    }
    const after = await ctx.db("consent_events").where({ patient_id: patient.patientId }).count({ n: "*" });
    expect(after).toEqual(before);
  });

  it("every change is audited with who recorded it and whether it counts", async () => {
    const rows = await ctx.db("audit_events").where({ patient_id: patient.patientId }).whereIn("action", ["consent.given", "consent.withdrawn"]).orderBy("at");
    expect(rows.map((r) => [r.action, r.actor_id, r.details.counts])).toEqual([
      ["consent.given", clinician.id, false],
      ["consent.given", patient.id, true],
      ["consent.withdrawn", patient.id, true],
      ["consent.given", admin.id, true],
      ["consent.withdrawn", clinician.id, true],
    ]);
  });

  it("the history cannot be edited", async () => {
    await expect(ctx.db("consent_events").where({ patient_id: patient.patientId }).update({ kind: "given" })).rejects.toThrow(/append-only/);
  });
});
