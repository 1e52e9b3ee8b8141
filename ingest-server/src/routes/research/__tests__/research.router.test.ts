import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type SeededUser, type TestContext } from "../../../testing/harness";
import { insertDoneSession, seedDevices } from "../../../testing/session-fixtures";

let ctx: TestContext;
let researcher: SeededUser;
let clinician: SeededUser;
let admin: SeededUser;
let patientUser: SeededUser;
const tokens: Record<string, string> = {};
const identifiers: string[] = [];
const as = (u: SeededUser) => ({ Authorization: `Bearer ${tokens[u.id]}` });

/**
 * Cohort: six consenting stroke patients born 1962 (enrolled 2026 → age 64, band 60-64), three
 * consenting Parkinson's patients aged 72 (band 70-74: below k = 5, must be suppressed), one
 * 93-year-old (90+, suppressed) and two stroke 60-64 patients WITHOUT consent (never exported).
 */
beforeAll(async () => {
  ctx = await createTestContext();
  researcher = await ctx.seedUser({ role: "researcher" });
  clinician = await ctx.seedUser({ role: "clinician" });
  admin = await ctx.seedUser({ role: "admin" });
  patientUser = await ctx.seedUser({ role: "patient" });
  for (const u of [researcher, clinician, admin, patientUser]) tokens[u.id] = await ctx.tokenFor(u);
  const groups = [
    { n: 6, condition: "stroke" as const, birthYear: 1962, consent: true },
    { n: 3, condition: "parkinsons" as const, birthYear: 1954, consent: true },
    { n: 1, condition: "other" as const, birthYear: 1933, consent: true },
    { n: 2, condition: "stroke" as const, birthYear: 1962, consent: false },
  ];
  let i = 0;
  for (const g of groups) {
    for (let k = 0; k < g.n; k++, i++) {
      const name = `Cohort Person ${i}`;
      const researchId = `CLINIC-R-${1000 + i}`;
      const id = await ctx.seedPatient({ displayName: name, researchId, condition: g.condition, birthYear: g.birthYear, enrolledOn: "2026-03-02", researchConsent: g.consent });
      const serials = await seedDevices(ctx, id, `RS${i}`, { placements: ["left_shank"] });
      identifiers.push(id, name, researchId, ...Object.values(serials));
      for (const week of [0, 4]) {
        const at = new Date(Date.UTC(2026, 2, 3 + 7 * week, 10, 30)).toISOString();
        const sid = await insertDoneSession(
          ctx,
          id,
          at,
          { cadenceStepsPerMin: 100 + i, strideTimeCvPct: 2 + i / 10, armLegLeftArmRightLegMeanRelativePhaseDeg: -12.5 },
          // A hostile stored string must come out of the CSV escaped.
          { algorithmVersion: i === 0 && week === 0 ? '=HYPERLINK("http://x")' : "1.0.0" },
        );
        identifiers.push(sid);
      }
    }
  }
});

afterAll(async () => {
  await ctx?.close();
});

function assertNoIdentifiers(text: string) {
  for (const id of identifiers) expect(text, `leaked ${id}`).not.toContain(id);
  expect(text).not.toMatch(/\d{4}-\d{2}-\d{2}/); // no calendar dates (45 CFR 164.514(b)(2)(i)(C))
  expect(text).not.toMatch(/@example\.test/);
}

describe("POST /api/research/cohorts (preview)", () => {
  it("counts subjects per condition × age band and suppresses cells under 5", async () => {
    const res = await request(ctx.app).post("/api/research/cohorts").set(as(researcher)).send({});
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.k).toBe(5);
    expect(res.body.cells).toEqual([
      { condition: "other", ageBand: "90+", subjects: null, sessions: null, suppressed: true },
      { condition: "parkinsons", ageBand: "70-74", subjects: null, sessions: null, suppressed: true },
      { condition: "stroke", ageBand: "60-64", subjects: 6, sessions: 12, suppressed: false },
    ]);
    expect(res.body.totals).toEqual({ subjects: 6, sessions: 12, suppressedCells: 2 });
    assertNoIdentifiers(JSON.stringify(res.body));
  });

  it("applies the week window and validates bands and metric keys", async () => {
    const res = await request(ctx.app).post("/api/research/cohorts").set(as(researcher)).send({ weeksSinceEnrolment: { from: 4, to: 10 } });
    expect(res.body.cells.find((c: { condition: string }) => c.condition === "stroke").sessions).toBe(6);
    expect((await request(ctx.app).post("/api/research/cohorts").set(as(researcher)).send({ ageBands: ["60-65"] })).status).toBe(400);
    expect((await request(ctx.app).post("/api/research/cohorts").set(as(researcher)).send({ metrics: ["name"] })).status).toBe(400);
  });

  it("is for researchers only", async () => {
    for (const u of [clinician, admin, patientUser]) {
      expect((await request(ctx.app).post("/api/research/cohorts").set(as(u)).send({})).status).toBe(403);
    }
  });
});

describe("GET /api/research/cohort-metrics", () => {
  it("json: only consenting subjects of unsuppressed cells, pseudonymous ids stable across exports", async () => {
    const a = await request(ctx.app).get("/api/research/cohort-metrics?format=json").set(as(researcher));
    expect(a.status, JSON.stringify(a.body)).toBe(200);
    expect(a.body.rows).toHaveLength(12);
    expect(new Set(a.body.rows.map((r: { subjectId: string }) => r.subjectId)).size).toBe(6);
    expect(a.body.rows.every((r: { condition: string; ageBand: string }) => r.condition === "stroke" && r.ageBand === "60-64")).toBe(true);
    expect(a.body.rows.map((r: { weeksSinceEnrolment: number }) => r.weeksSinceEnrolment).sort()).toEqual([0, 0, 0, 0, 0, 0, 4, 4, 4, 4, 4, 4]);
    expect(a.body.suppressedCells).toBe(2);
    assertNoIdentifiers(JSON.stringify(a.body));
    const b = await request(ctx.app).get("/api/research/cohort-metrics?format=json").set(as(researcher));
    expect(b.body.rows.map((r: { subjectId: string }) => r.subjectId)).toEqual(a.body.rows.map((r: { subjectId: string }) => r.subjectId));
  });

  it("a filter that shrinks a cell below 5 suppresses it entirely", async () => {
    // The one consenting 90+ subject alone, even when asked for explicitly.
    const res = await request(ctx.app).get("/api/research/cohort-metrics?format=json&ageBands=90%2B").set(as(researcher));
    expect(res.body.rows).toEqual([]);
    expect(res.body.suppressedCells).toBe(1);
  });

  it("csv: text/csv with formula-injection-escaped cells (OWASP CSV Injection) and no identifiers", async () => {
    const res = await request(ctx.app).get("/api/research/cohort-metrics?format=csv&metrics=cadenceStepsPerMin,armLegLeftArmRightLegMeanRelativePhaseDeg").set(as(researcher));
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toMatch(/^text\/csv/);
    const lines = res.text.trim().split("\r\n");
    expect(lines[0]).toBe(
      "subject_id,session_ref,condition,age_band,weeks_since_enrolment,algorithm_version,cadenceStepsPerMin,cadenceStepsPerMin_n,armLegLeftArmRightLegMeanRelativePhaseDeg,armLegLeftArmRightLegMeanRelativePhaseDeg_n",
    );
    expect(lines).toHaveLength(13);
    expect(res.text).toContain(`"'=HYPERLINK(""http://x"")"`);
    expect(lines.some((l) => /,=/.test(l))).toBe(false);
    // Numbers are not text: a negative phase stays a plain negative number.
    expect(lines[1]!.endsWith(",-12.5,")).toBe(true);
    assertNoIdentifiers(res.text);
  });

  it("fhir: an R4 collection Bundle of Observations with UCUM quantities from the local code system", async () => {
    const res = await request(ctx.app).get("/api/research/cohort-metrics?format=fhir&metrics=cadenceStepsPerMin,strideTimeCvPct").set(as(researcher));
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toMatch(/^application\/fhir\+json/);
    const bundle = JSON.parse(res.text);
    expect(bundle).toMatchObject({ resourceType: "Bundle", type: "collection" });
    const observations = bundle.entry.filter((e: { resource: { resourceType: string } }) => e.resource.resourceType === "Observation");
    expect(observations).toHaveLength(12);
    const obs = observations[0].resource;
    expect(obs.status).toBe("final");
    expect(obs.subject.identifier.value).toMatch(/^sub-[0-9a-f]{24}$/);
    expect(obs.component.map((c: { valueQuantity: { system: string; code: string } }) => [c.valueQuantity.system, c.valueQuantity.code])).toEqual([
      ["http://unitsofmeasure.org", "/min"],
      ["http://unitsofmeasure.org", "%"],
    ]);
    assertNoIdentifiers(res.text);
  });

  it("every export is audited with its format and size", async () => {
    const events = await ctx.db("audit_events").where({ action: "export.cohort_metrics", actor_id: researcher.id });
    expect(events.map((e) => e.details.format).sort()).toEqual(["csv", "fhir", "json", "json", "json"]);
  });

  it("is for researchers only and validates the format", async () => {
    for (const u of [clinician, admin, patientUser]) {
      expect((await request(ctx.app).get("/api/research/cohort-metrics").set(as(u))).status).toBe(403);
    }
    expect((await request(ctx.app).get("/api/research/cohort-metrics?format=xlsx").set(as(researcher))).status).toBe(400);
  });
});

describe("walking speed and stride length in the research export", () => {
  it("are CSV columns and FHIR components in UCUM m/s and m", async () => {
    const sessions = await ctx.db("walk_sessions").where({ status: "done" }).select("id", "patient_id", "recorded_at");
    await ctx.db("session_metrics").insert(
      sessions.flatMap((s, i) => [
        { session_id: s.id, patient_id: s.patient_id, recorded_at: s.recorded_at, metric_key: "walkingSpeedMPerS", value: 0.7 + i / 100, unit: "m/s", n: 20 },
        { session_id: s.id, patient_id: s.patient_id, recorded_at: s.recorded_at, metric_key: "strideLengthM", value: 0.9, unit: "m", n: 20 },
      ]),
    );
    const csv = await request(ctx.app).get("/api/research/cohort-metrics?format=csv&metrics=walkingSpeedMPerS,strideLengthM").set(as(researcher));
    expect(csv.status).toBe(200);
    const lines = csv.text.trim().split("\r\n");
    expect(lines[0]!.endsWith(",walkingSpeedMPerS,walkingSpeedMPerS_n,strideLengthM,strideLengthM_n")).toBe(true);
    expect(lines).toHaveLength(13);
    // Each value is followed by the strides it rests on (session_metrics.n).
    for (const l of lines.slice(1)) expect(l).toMatch(/,0\.\d+,20,0\.9,20$/);

    const fhir = await request(ctx.app).get("/api/research/cohort-metrics?format=fhir&metrics=walkingSpeedMPerS,strideLengthM").set(as(researcher));
    expect(fhir.status).toBe(200);
    const bundle = JSON.parse(fhir.text);
    const obs = bundle.entry.find((e: { resource: { resourceType: string } }) => e.resource.resourceType === "Observation").resource;
    const codes = obs.component.map((c: { code: { coding: Array<{ code: string }> }; valueQuantity: { code: string } }) => [c.code.coding[0]!.code, c.valueQuantity.code]);
    expect(codes).toEqual([
      ["walkingSpeedMPerS", "m/s"],
      ["strideLengthM", "m"],
    ]);
    expect(obs.component[0].extension).toEqual([
      { url: "https://pendula.example/fhir/StructureDefinition/count-behind-value", valueQuantity: { value: 20, unit: "strides", system: "http://unitsofmeasure.org", code: "{strides}" } },
    ]);

    const json = await request(ctx.app).get("/api/research/cohort-metrics?format=json&metrics=walkingSpeedMPerS").set(as(researcher));
    expect(json.body.metrics).toEqual([{ key: "walkingSpeedMPerS", unit: "m/s", countNoun: "strides" }]);
    expect(json.body.rows[0].counts).toEqual({ walkingSpeedMPerS: 20 });
    assertNoIdentifiers(csv.text);
  });
});
