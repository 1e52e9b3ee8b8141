import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { CONSENT_PROPOSALS_PER_DAY } from "../../consent/consent.service";
import { createTestContext, type SeededUser, type TestContext } from "../../../testing/harness";
import { insertDoneSession } from "../../../testing/session-fixtures";

/**
 * The small-cell padding attack: one real "other, 90+" patient with research consent sits in a
 * suppressed cell. A clinician invents four more "other, 90+" patients with research consent ticked
 * and gives them walks, hoping to lift the cell to k = 5 and export the real patient's history.
 * Their ticks are proposals the patients have not confirmed, so the cell stays suppressed.
 */
let ctx: TestContext;
let researcher: SeededUser;
let clinician: SeededUser;
let projectId = "";
const tokens: Record<string, string> = {};
const as = (u: SeededUser) => ({ Authorization: `Bearer ${tokens[u.id]}` });
const WALK_AT = "2026-03-10T10:00:00.000Z";

const invite = (i: number) =>
  request(ctx.app)
    .post("/api/invitations")
    .set(as(clinician))
    .send({
      email: `padding-${i}@example.test`,
      displayName: `Invented Walker ${i}`,
      role: "patient",
      patient: { birthYear: 1930, sex: "unknown", condition: "other", enrolledOn: "2026-03-02", researchConsent: true },
    });

beforeAll(async () => {
  ctx = await createTestContext();
  researcher = await ctx.seedUser({ role: "researcher" });
  clinician = await ctx.seedUser({ role: "clinician" });
  for (const u of [researcher, clinician]) tokens[u.id] = await ctx.tokenFor(u);
  // The real patient: 96 at enrolment, consent on file (counts).
  const real = await ctx.seedPatient({ condition: "other", birthYear: 1930, enrolledOn: "2026-03-02", researchConsent: true });
  await insertDoneSession(ctx, real, WALK_AT, { cadenceStepsPerMin: 84 });
  const res = await request(ctx.app).post("/api/research/projects").set(as(researcher)).send({ name: "Oldest walkers" });
  projectId = res.body.id;
});

afterAll(async () => {
  await ctx?.close();
});

const oldestCell = async () => {
  const res = await request(ctx.app).post("/api/research/cohorts").set(as(researcher)).send({ conditions: ["other"], ageBands: ["90+"] });
  expect(res.status).toBe(200);
  return res.body;
};

describe("padding a suppressed cell with invented consenting records", () => {
  it("before: the cell of one real subject is suppressed", async () => {
    const body = await oldestCell();
    expect(body.cells).toEqual([{ condition: null, ageBand: null, label: "suppressed group (n < 5)", subjects: null, sessions: null, suppressed: true }]);
  });

  it("four invented 'other, 90+' patients with consent ticked by a clinician, each with a walk, do not lift the cell", async () => {
    for (let i = 0; i < 4; i++) {
      const res = await invite(i);
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      await insertDoneSession(ctx, res.body.patientId, WALK_AT, { cadenceStepsPerMin: 90 + i });
    }
    const body = await oldestCell();
    expect(body.totals).toEqual({ subjects: 0, sessions: 0, suppressedCells: 1 });
    const exported = await request(ctx.app).get(`/api/research/cohort-metrics?format=json&projectId=${projectId}&conditions=other&ageBands=90%2B`).set(as(researcher));
    expect(exported.status).toBe(200);
    expect(exported.body.rows).toEqual([]);
  });

  it("the clinician's ticks are stored as proposals that do not count, and are audited", async () => {
    const events = await ctx.db("consent_events").where({ recorded_by: clinician.id });
    expect(events).toHaveLength(4);
    expect(events.every((e) => e.kind === "given" && e.recorder_role === "clinician" && e.counts === false)).toBe(true);
    const patients = await ctx.db("patients").whereIn("id", events.map((e) => e.patient_id)).select("research_consent");
    expect(patients.every((p) => p.research_consent === false)).toBe(true);
    const audited = await ctx.db("audit_events").where({ action: "consent.given", actor_id: clinician.id });
    expect(audited).toHaveLength(4);
    expect(audited.every((a) => a.details.counts === false && a.details.withInvitation === true)).toBe(true);
  });

  it(`a clinician's proposals are limited to ${CONSENT_PROPOSALS_PER_DAY} in 24 hours: the next one is a 429 that stores nothing, and is audited`, async () => {
    for (let i = 4; i < CONSENT_PROPOSALS_PER_DAY; i++) expect((await invite(i)).status).toBe(201);
    const patientsBefore = Number((await ctx.db("patients").count({ n: "*" }))[0]!.n);
    const usersBefore = Number((await ctx.db("users").count({ n: "*" }))[0]!.n);
    const refused = await invite(99);
    expect(refused.status).toBe(429);
    expect(refused.body.error.code).toBe("consent_rate_limited");
    expect(Number((await ctx.db("patients").count({ n: "*" }))[0]!.n)).toBe(patientsBefore);
    expect(Number((await ctx.db("users").count({ n: "*" }))[0]!.n)).toBe(usersBefore);
    expect(await ctx.db("users").where({ email: "padding-99@example.test" }).first()).toBeUndefined();
    expect(await ctx.db("audit_events").where({ action: "consent.proposal_rate_limited", actor_id: clinician.id })).toHaveLength(1);
    // Without the tick the same clinician still enrols patients.
    const plain = await request(ctx.app)
      .post("/api/invitations")
      .set(as(clinician))
      .send({ email: "plain@example.test", displayName: "Plain Walker", role: "patient", patient: { birthYear: 1950, sex: "female", condition: "stroke", enrolledOn: "2026-03-02" } });
    expect(plain.status).toBe(201);
  });

  it("the database refuses a clinician's 'given' that claims to count", async () => {
    const [pid] = await ctx.db("patients").where({ condition: "other" }).pluck("id");
    await expect(ctx.db("consent_events").insert({ patient_id: pid, kind: "given", recorder_role: "clinician", recorded_by: clinician.id, counts: true })).rejects.toThrow(/consent_events_counts_rule/);
    // The flag is a cache of the counting events: a hand-written true does not stick.
    const invented = await ctx.db("consent_events").where({ recorded_by: clinician.id }).first("patient_id");
    await ctx.db("patients").where({ id: invented.patient_id }).update({ research_consent: true });
    expect((await ctx.db("patients").where({ id: invented.patient_id }).first("research_consent")).research_consent).toBe(false);
  });
});
