import { createHmac } from "node:crypto";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type SeededUser, type TestContext } from "../../../testing/harness";
import { insertDoneSession, seedDevices } from "../../../testing/session-fixtures";

let ctx: TestContext;
let researcher: SeededUser;
let researcher2: SeededUser;
let clinician: SeededUser;
let admin: SeededUser;
let patientUser: SeededUser;
const tokens: Record<string, string> = {};
const identifiers: string[] = [];
const strokeIds: string[] = [];
let projectA = "";
let projectB = "";
let otherProject = "";
const as = (u: SeededUser) => ({ Authorization: `Bearer ${tokens[u.id]}` });
const csvOf = (text: string) => text.trim().split("\r\n").map((l) => l.split(","));

/**
 * Cohort: six consenting stroke patients born 1962 (enrolled 2026 → age 64, band 60-64), three
 * consenting Parkinson's patients aged 72 (band 70-74: below k = 5, must be suppressed), one
 * 93-year-old (90+, suppressed) and two stroke 60-64 patients WITHOUT consent (never exported).
 * Consent (harness: an admin record with a reason) runs from the enrolment day, 2026-03-02; the
 * last stroke patient withdraws on 2026-03-20, between their week-0 and week-4 walks.
 */
beforeAll(async () => {
  ctx = await createTestContext();
  researcher = await ctx.seedUser({ role: "researcher" });
  researcher2 = await ctx.seedUser({ role: "researcher" });
  clinician = await ctx.seedUser({ role: "clinician" });
  admin = await ctx.seedUser({ role: "admin" });
  patientUser = await ctx.seedUser({ role: "patient" });
  for (const u of [researcher, researcher2, clinician, admin, patientUser]) tokens[u.id] = await ctx.tokenFor(u);
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
      if (g.condition === "stroke" && g.consent) strokeIds.push(id);
      const serials = await seedDevices(ctx, id, `RS${i}`, { placements: ["left_shank"] });
      identifiers.push(id, name, researchId, ...Object.values(serials));
      for (const week of [0, 4]) {
        const at = new Date(Date.UTC(2026, 2, 3 + 7 * week, 10, 30)).toISOString();
        const sid = await insertDoneSession(
          ctx,
          id,
          at,
          // Full-precision values, as the analysis stores them; the export rounds them.
          { cadenceStepsPerMin: 100 + i + 0.3846, strideTimeCvPct: 2.04 + i / 10, armLegLeftArmRightLegMeanRelativePhaseDeg: -12.5 },
          // A hostile stored string must come out of the CSV escaped.
          { algorithmVersion: i === 0 && week === 0 ? '=HYPERLINK("http://x")' : "1.0.0" },
        );
        identifiers.push(sid);
      }
    }
  }
  await ctx.db("consent_events").insert({ patient_id: strokeIds[5], kind: "withdrawn", recorder_role: "patient", counts: true, at: "2026-03-20T09:00:00Z" });
  const make = async (u: SeededUser, name: string) => {
    const res = await request(ctx.app).post("/api/research/projects").set(as(u)).send({ name, purpose: "Recovery of cadence after stroke" });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    return res.body.id as string;
  };
  projectA = await make(researcher, "Cadence recovery study");
  projectB = await make(researcher, "Coordination substudy");
  otherProject = await make(researcher2, "Someone else's study");
});

afterAll(async () => {
  await ctx?.close();
});

function assertNoIdentifiers(text: string) {
  for (const id of identifiers) expect(text, `leaked ${id}`).not.toContain(id);
  expect(text).not.toMatch(/\d{4}-\d{2}-\d{2}/); // no calendar dates (45 CFR 164.514(b)(2)(i)(C))
  expect(text).not.toMatch(/@example\.test/);
}

const exportJson = (project: string, extra = "") => request(ctx.app).get(`/api/research/cohort-metrics?format=json&projectId=${project}${extra}`).set(as(researcher));

describe("research projects", () => {
  it("a researcher lists only their own; an admin sees every project with its owner and no key", async () => {
    const mine = await request(ctx.app).get("/api/research/projects").set(as(researcher));
    expect(mine.status).toBe(200);
    expect(mine.body.items.map((p: { name: string }) => p.name).sort()).toEqual(["Cadence recovery study", "Coordination substudy"]);
    const all = await request(ctx.app).get("/api/research/projects").set(as(admin));
    expect(all.status).toBe(200);
    expect(all.body.items).toHaveLength(3);
    expect(all.body.items.find((p: { id: string }) => p.id === otherProject).owner.id).toBe(researcher2.id);
    expect(JSON.stringify(all.body)).not.toMatch(/salt|key/i);
  });

  it("refuses a duplicate name (409), a short or unknown field (422), and other roles (403)", async () => {
    expect((await request(ctx.app).post("/api/research/projects").set(as(researcher)).send({ name: " cadence RECOVERY study " })).status).toBe(409);
    expect((await request(ctx.app).post("/api/research/projects").set(as(researcher)).send({ name: "ab" })).status).toBe(422);
    expect((await request(ctx.app).post("/api/research/projects").set(as(researcher)).send({ name: "Valid name", ownerId: admin.id })).status).toBe(422);
    for (const u of [clinician, admin, patientUser]) expect((await request(ctx.app).post("/api/research/projects").set(as(u)).send({ name: "Not mine" })).status).toBe(403);
    expect((await request(ctx.app).get("/api/research/projects").set(as(researcher))).body.items).toHaveLength(2);
  });

  it("project creation is audited", async () => {
    const events = await ctx.db("audit_events").where({ action: "research.project_create", actor_id: researcher.id });
    expect(events).toHaveLength(2);
  });
});

describe("POST /api/research/cohorts (preview)", () => {
  it("counts subjects per condition × age band; suppressed cells carry no attributes", async () => {
    const res = await request(ctx.app).post("/api/research/cohorts").set(as(researcher)).send({});
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.k).toBe(5);
    expect(res.body.cells).toEqual([
      { condition: "stroke", ageBand: "60-64", label: "stroke, 60-64", subjects: 6, sessions: 11, suppressed: false },
      { condition: null, ageBand: null, label: "suppressed group (n < 5)", subjects: null, sessions: null, suppressed: true },
      { condition: null, ageBand: null, label: "suppressed group (n < 5)", subjects: null, sessions: null, suppressed: true },
    ]);
    expect(res.body.totals).toEqual({ subjects: 6, sessions: 11, suppressedCells: 2 });
    expect(JSON.stringify(res.body.cells)).not.toMatch(/parkinsons|other|70-74|90\+/);
    assertNoIdentifiers(JSON.stringify(res.body));
  });

  it("applies the week window to 4-week blocks and validates bands and metric keys", async () => {
    const res = await request(ctx.app).post("/api/research/cohorts").set(as(researcher)).send({ weeksSinceEnrolment: { from: 4, to: 10 } });
    expect(res.body.cells.find((c: { condition: string }) => c.condition === "stroke").sessions).toBe(5);
    // Week 5 alone holds no block start, so a narrow window cannot single out a session's exact week.
    const narrow = await request(ctx.app).post("/api/research/cohorts").set(as(researcher)).send({ weeksSinceEnrolment: { from: 5, to: 5 } });
    expect(narrow.body.cells).toEqual([]);
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
  it("json: only sessions recorded while consent was in force, in unsuppressed cells; ids stable across exports of one project", async () => {
    const a = await exportJson(projectA);
    expect(a.status, JSON.stringify(a.body)).toBe(200);
    // 6 subjects × 2 walks, less the walk recorded after one subject withdrew.
    expect(a.body.rows).toHaveLength(11);
    expect(new Set(a.body.rows.map((r: { subjectId: string }) => r.subjectId)).size).toBe(6);
    expect(a.body.rows.every((r: { condition: string; ageBand: string }) => r.condition === "stroke" && r.ageBand === "60-64")).toBe(true);
    expect(a.body.rows.map((r: { weeksSinceEnrolment: number }) => r.weeksSinceEnrolment).sort()).toEqual([0, 0, 0, 0, 0, 0, 4, 4, 4, 4, 4]);
    expect(a.body.suppressedCells).toBe(2);
    expect(a.body.project).toEqual({ id: projectA, name: "Cadence recovery study" });
    expect(a.body.studyClock).toEqual({ blockWeeks: 4, capWeeks: 52, releaseLagDays: 28 });
    assertNoIdentifiers(JSON.stringify(a.body));
    const again = await exportJson(projectA);
    expect(again.body.rows.map((r: { subjectId: string }) => r.subjectId)).toEqual(a.body.rows.map((r: { subjectId: string }) => r.subjectId));
  });

  it("two projects give unlinkable subject ids and session refs for the same patients", async () => {
    const a = (await exportJson(projectA)).body.rows as Array<{ subjectId: string; sessionRef: string }>;
    const b = (await exportJson(projectB)).body.rows as Array<{ subjectId: string; sessionRef: string }>;
    expect(b).toHaveLength(a.length);
    const idsA = new Set(a.map((r) => r.subjectId));
    const idsB = new Set(b.map((r) => r.subjectId));
    expect(idsB.size).toBe(idsA.size);
    expect([...idsA].filter((id) => idsB.has(id))).toEqual([]);
    const refsB = new Set(b.map((r) => r.sessionRef));
    expect(a.filter((r) => refsB.has(r.sessionRef))).toEqual([]);
  });

  it("subject ids are HMAC-SHA256(project key, project ‖ 0x00 ‖ patient), recomputed here with node:crypto", async () => {
    const row = await ctx.db("research_projects").where({ id: projectA }).first("key_salt");
    const key = createHmac("sha256", ctx.config.researchHmacKey).update("pendula-research-project-key").update(row.key_salt).digest();
    const expected = new Set(strokeIds.map((pid) => `sub-${createHmac("sha256", key).update(`${projectA}\u0000${pid}`).digest("hex").slice(0, 24)}`));
    const got = new Set(((await exportJson(projectA)).body.rows as Array<{ subjectId: string }>).map((r) => r.subjectId));
    expect(got).toEqual(expected);
  });

  it("a project is needed, and only its owner can export under it (others read 404)", async () => {
    expect((await request(ctx.app).get("/api/research/cohort-metrics?format=json").set(as(researcher))).status).toBe(400);
    expect((await request(ctx.app).get("/api/research/cohort-metrics?format=json&projectId=nope").set(as(researcher))).status).toBe(400);
    const foreign = await exportJson(otherProject);
    expect(foreign.status).toBe(404);
    expect(foreign.body.error.code).toBe("not_found");
  });

  it("values leave rounded to their export precision: cadence to 1 /min, stride-time CV to 0.1 %", async () => {
    const rows = (await exportJson(projectA, "&metrics=cadenceStepsPerMin,strideTimeCvPct")).body.rows as Array<{ metrics: Record<string, number> }>;
    for (const r of rows) {
      expect(Number.isInteger(r.metrics.cadenceStepsPerMin)).toBe(true);
      expect(String(r.metrics.strideTimeCvPct)).toMatch(/^\d+(\.\d)?$/);
    }
    // Stored 100.3846 … 105.3846 → 100 … 105; stored 2.04 … 2.54 → 2.0 … 2.5.
    expect(new Set(rows.map((r) => r.metrics.cadenceStepsPerMin))).toEqual(new Set([100, 101, 102, 103, 104, 105]));
    expect(new Set(rows.map((r) => r.metrics.strideTimeCvPct))).toEqual(new Set([2, 2.1, 2.2, 2.3, 2.4, 2.5]));
  });

  it("a filter that shrinks a cell below 5 suppresses it entirely", async () => {
    const res = await exportJson(projectA, "&ageBands=90%2B");
    expect(res.body.rows).toEqual([]);
    expect(res.body.suppressedCells).toBe(1);
  });

  it("csv: text/csv with formula-injection-escaped cells (OWASP CSV Injection), rounded values and no identifiers", async () => {
    const res = await request(ctx.app)
      .get(`/api/research/cohort-metrics?format=csv&projectId=${projectA}&metrics=cadenceStepsPerMin,armLegLeftArmRightLegMeanRelativePhaseDeg`)
      .set(as(researcher));
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toMatch(/^text\/csv/);
    const lines = res.text.trim().split("\r\n");
    expect(lines[0]).toBe(
      "subject_id,session_ref,condition,age_band,weeks_since_enrolment_block,algorithm_version,cadenceStepsPerMin,cadenceStepsPerMin_n,armLegLeftArmRightLegMeanRelativePhaseDeg,armLegLeftArmRightLegMeanRelativePhaseDeg_n",
    );
    expect(lines).toHaveLength(12);
    expect(res.text).toContain(`"'=HYPERLINK(""http://x"")"`);
    expect(lines.some((l) => /,=/.test(l))).toBe(false);
    // Numbers are not text: a negative phase stays a plain number, −12.5° rounded to 5° (ties away from zero).
    expect(lines[1]!.endsWith(",-15,")).toBe(true);
    assertNoIdentifiers(res.text);
  });

  it("fhir: an R4 collection Bundle of Observations with UCUM quantities, the week block as an extension", async () => {
    const res = await request(ctx.app).get(`/api/research/cohort-metrics?format=fhir&projectId=${projectA}&metrics=cadenceStepsPerMin,strideTimeCvPct`).set(as(researcher));
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toMatch(/^application\/fhir\+json/);
    const bundle = JSON.parse(res.text);
    expect(bundle).toMatchObject({ resourceType: "Bundle", type: "collection" });
    const observations = bundle.entry.filter((e: { resource: { resourceType: string } }) => e.resource.resourceType === "Observation");
    expect(observations).toHaveLength(11);
    const obs = observations[0].resource;
    expect(obs.status).toBe("final");
    expect(obs.subject.identifier.value).toMatch(/^sub-[0-9a-f]{24}$/);
    expect(obs.component.map((c: { valueQuantity: { system: string; code: string } }) => [c.valueQuantity.system, c.valueQuantity.code])).toEqual([
      ["http://unitsofmeasure.org", "/min"],
      ["http://unitsofmeasure.org", "%"],
    ]);
    expect(Number.isInteger(obs.component[0].valueQuantity.value)).toBe(true);
    expect(obs.extension.find((e: { url: string }) => e.url.endsWith("weeks-since-enrolment-block")).valueInteger).toBe(0);
    assertNoIdentifiers(res.text);
  });

  it("every export is audited with its project, format and size", async () => {
    const events = await ctx.db("audit_events").where({ action: "export.cohort_metrics", actor_id: researcher.id });
    expect(events.length).toBeGreaterThanOrEqual(8);
    expect(new Set(events.map((e) => e.details.format))).toEqual(new Set(["csv", "fhir", "json"]));
    expect(events.every((e) => e.details.projectId === projectA || e.details.projectId === projectB)).toBe(true);
  });

  it("is for researchers only and validates the format", async () => {
    for (const u of [clinician, admin, patientUser]) {
      expect((await request(ctx.app).get(`/api/research/cohort-metrics?projectId=${projectA}`).set(as(u))).status).toBe(403);
    }
    expect((await request(ctx.app).get(`/api/research/cohort-metrics?format=xlsx&projectId=${projectA}`).set(as(researcher))).status).toBe(400);
  });
});

describe("export rules", () => {
  it("lists every metric's step with its reason", async () => {
    const res = await request(ctx.app).get("/api/research/export-rules").set(as(researcher));
    expect(res.status).toBe(200);
    expect(res.body.metrics.find((m: { key: string }) => m.key === "walkingSpeedMPerS")).toMatchObject({ step: 0.05, decimals: 2, unit: "m/s" });
    expect(res.body.countStep).toBe(5);
  });
});

describe("study clock: release lag", () => {
  it("holds back walks of the last 28 days; older ones appear in their 4-week block", async () => {
    const day = 86_400_000;
    const old = new Date(Date.now() - 40 * day).toISOString();
    const recent = new Date(Date.now() - 10 * day).toISOString();
    const before = (await exportJson(projectA)).body.rows.length as number;
    for (const pid of strokeIds.slice(0, 5)) {
      await insertDoneSession(ctx, pid, old, { cadenceStepsPerMin: 110 });
      await insertDoneSession(ctx, pid, recent, { cadenceStepsPerMin: 111 });
    }
    const rows = (await exportJson(projectA, "&metrics=cadenceStepsPerMin")).body.rows as Array<{ weeksSinceEnrolment: number; metrics: Record<string, number> }>;
    expect(rows).toHaveLength(before + 5);
    expect(rows.some((r) => r.metrics.cadenceStepsPerMin === 111)).toBe(false);
    const weeks = Math.floor((Date.parse(old) - Date.parse("2026-03-02T00:00:00Z")) / (7 * day));
    const block = Math.min(52, Math.floor(weeks / 4) * 4);
    expect(rows.filter((r) => r.metrics.cadenceStepsPerMin === 110).every((r) => r.weeksSinceEnrolment === block)).toBe(true);
  });
});

describe("walking speed and stride length in the research export", () => {
  it("are CSV columns and FHIR components in UCUM m/s and m, rounded to 0.05, counts to the nearest 5", async () => {
    const sessions = await ctx.db("walk_sessions").where({ status: "done" }).select("id", "patient_id", "recorded_at");
    await ctx.db("session_metrics").insert(
      sessions.flatMap((s, i) => [
        { session_id: s.id, patient_id: s.patient_id, recorded_at: s.recorded_at, metric_key: "walkingSpeedMPerS", value: 0.7 + i / 100, unit: "m/s", n: 22 },
        { session_id: s.id, patient_id: s.patient_id, recorded_at: s.recorded_at, metric_key: "strideLengthM", value: 0.912, unit: "m", n: 22 },
      ]),
    );
    const csv = await request(ctx.app).get(`/api/research/cohort-metrics?format=csv&projectId=${projectA}&metrics=walkingSpeedMPerS,strideLengthM`).set(as(researcher));
    expect(csv.status).toBe(200);
    const table = csvOf(csv.text);
    expect(table[0]!.slice(-4)).toEqual(["walkingSpeedMPerS", "walkingSpeedMPerS_n", "strideLengthM", "strideLengthM_n"]);
    for (const cells of table.slice(1)) {
      const [speed, speedN, length, lengthN] = cells.slice(-4).map(Number);
      // Whole multiples of 0.05 m/s (Hosoi et al. 2023's MDC), 22 strides → 20.
      expect(Math.abs(speed! / 0.05 - Math.round(speed! / 0.05))).toBeLessThan(1e-9);
      expect([speedN, length, lengthN]).toEqual([20, 0.9, 20]);
    }

    const fhir = await request(ctx.app).get(`/api/research/cohort-metrics?format=fhir&projectId=${projectA}&metrics=walkingSpeedMPerS,strideLengthM`).set(as(researcher));
    expect(fhir.status).toBe(200);
    const bundle = JSON.parse(fhir.text);
    const obs = bundle.entry.find((e: { resource: { resourceType: string } }) => e.resource.resourceType === "Observation").resource;
    const codes = obs.component.map((c: { code: { coding: Array<{ code: string }> }; valueQuantity: { code: string } }) => [c.code.coding[0]!.code, c.valueQuantity.code]);
    expect(codes).toEqual([
      ["walkingSpeedMPerS", "m/s"],
      ["strideLengthM", "m"],
    ]);
    expect(obs.component[1].valueQuantity.value).toBe(0.9);
    expect(obs.component[0].extension).toEqual([
      { url: "https://pendula.example/fhir/StructureDefinition/count-behind-value", valueQuantity: { value: 20, unit: "strides", system: "http://unitsofmeasure.org", code: "{strides}" } },
    ]);

    const json = await exportJson(projectA, "&metrics=walkingSpeedMPerS");
    expect(json.body.metrics).toEqual([{ key: "walkingSpeedMPerS", unit: "m/s", countNoun: "strides", step: 0.05, countStep: 5 }]);
    expect(json.body.rows[0].counts).toEqual({ walkingSpeedMPerS: 20 });
    assertNoIdentifiers(csv.text);
  });
});
