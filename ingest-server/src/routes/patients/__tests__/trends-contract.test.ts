import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { trendsResponse, type TrendMetric } from "../../../contracts";
import { createTestContext, type SeededUser, type TestContext } from "../../../testing/harness";
import { insertDoneSession } from "../../../testing/session-fixtures";

// The trends answer carries every clinical annotation at once (baseline, MDC, slope flag, bands,
// a published important change, excluded points, walking speed beside speed-dependent metrics, an
// arm–leg mode change with its pace comparison). The strict contract must accept that real answer
// and name each field: this test parses it the way the portal does.
// Invented scenario: a stroke patient of a fictional outpatient clinic, born 1960, weekly home tests.

let ctx: TestContext;
let clinician: SeededUser;
let patient: SeededUser;
let token: string;
const sessionIds: string[] = [];

const RATIO = "armLegLeftArmRightLegFrequencyRatio";
const PHASE = "armLegLeftArmRightLegMeanRelativePhaseDeg";
const COUPLING = "armLegLeftArmRightLegCouplingStrength";

beforeAll(async () => {
  ctx = await createTestContext();
  clinician = await ctx.seedUser({ role: "clinician" });
  patient = await ctx.seedUser({
    role: "patient",
    caseloadOf: [clinician.id],
    patient: { displayName: "Tamsin Orelle", condition: "stroke", birthYear: 1960, enrolledOn: "2026-09-01" },
  });
  token = await ctx.tokenFor(clinician);
  // Six weekly sessions: the arms switch from two cycles per stride to one after the third session
  // at an unchanged pace (so the switch is reported), cadence and speed rise at the last session,
  // and the coupling strength of session 2 is too weak for its phase to be compared.
  const ratio = [2, 2, 2, 1, 1, 1];
  const coupling = [0.9, 0.05, 0.9, 0.9, 0.9, 0.9];
  for (let w = 0; w < 6; w++) {
    const day = new Date(Date.UTC(2026, 8, 8 + 7 * w, 9)).toISOString();
    sessionIds.push(
      await insertDoneSession(
        ctx,
        patient.patientId!,
        day,
        {
          cadenceStepsPerMin: [90, 92, 91, 91, 92, 108][w]!,
          walkingSpeedMPerS: [0.5, 0.52, 0.51, 0.51, 0.52, 0.7][w]!,
          strideTimeCvPct: [4.1, 4.4, 4.0, 3.6, 3.4, 3.3][w]!,
          [RATIO]: ratio[w]!,
          [COUPLING]: coupling[w]!,
          [PHASE]: [20, 140, 25, 30, 28, 31][w]!,
        },
        { units: { walkingSpeedMPerS: "m/s", [PHASE]: "deg" } },
      ),
    );
  }
  // Counts behind the values (the last stride CV rests on too few strides) and a walking aid.
  await ctx.db("session_metrics").where({ patient_id: patient.patientId, metric_key: "strideTimeCvPct" }).update({ n: 40 });
  await ctx.db("session_metrics").where({ session_id: sessionIds[5], metric_key: "strideTimeCvPct" }).update({ n: 12 });
  await ctx.db("walk_sessions").where({ id: sessionIds[1] }).update({ walking_aid: "cane" });
});

afterAll(async () => {
  await ctx?.close();
});

describe("GET /api/patients/:id/trends answers within its strict contract", () => {
  it("the full answer parses with trendsResponse and carries each annotation", async () => {
    const res = await request(ctx.app).get(`/api/patients/${patient.patientId}/trends`).set("Authorization", `Bearer ${token}`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const parsed = trendsResponse.safeParse(res.body);
    expect(parsed.error?.issues ?? []).toEqual([]);
    const body = parsed.data!;
    const metric = (key: string): TrendMetric => body.metrics.find((m) => m.key === key)!;

    const cadence = metric("cadenceStepsPerMin");
    // Baseline = first three sessions 90/92/91: mean 91, sample SD 1 (common practice: n − 1).
    expect(cadence.baseline).toEqual({ mean: 91, sd: 1, n: 3 });
    expect(cadence.mdc?.source).toMatch(/published|patient-baseline/);
    expect(cadence.points.filter((p) => p.baseline)).toHaveLength(3);
    expect(cadence.slopeFlag?.fromSessionId).toMatch(/^[0-9a-f-]{36}$/);
    expect(cadence.label).toBe("Cadence (steps/min)");

    const speed = metric("walkingSpeedMPerS");
    expect(speed.importantChange?.thresholds.length).toBeGreaterThan(0);

    const cv = metric("strideTimeCvPct");
    expect(cv.speedNote).toMatch(/walking speed/i);
    expect(cv.points[0]!.walkingSpeedMPerS).toBe(0.5);
    expect(cv.points[0]!.n).toBe(40);
    expect(cv.points[5]!.excludedReason).toBe("few-strides");
    expect(cv.countNoun).toBe("strides");

    const phase = metric(PHASE);
    expect(phase.points[1]!.excludedReason).toBe("weak-coupling");
    expect(phase.points[1]!.walkingAid).toBe("cane");

    const modeChange = body.events.find((e) => e.kind === "arm-leg-mode-change");
    expect(modeChange).toMatchObject({ sessionId: sessionIds[4], metricKey: RATIO, from: 2, to: 1 });
    // Pace around the switch: the two old-mode sessions before (92, 91) and the two confirming ones (91, 92).
    expect(modeChange?.pace?.cadenceStepsPerMin).toMatchObject({ before: 91.5, after: 91.5, beyondMdc: false });
    expect(body.cautions.length).toBeGreaterThan(0);
    expect(body.metrics.some((m) => m.bands.length > 0 || m.bandNote !== null)).toBe(true);
  });

  it("the contract refuses a field it does not name, at every level", async () => {
    const res = await request(ctx.app).get(`/api/patients/${patient.patientId}/trends?metrics=cadenceStepsPerMin`).set("Authorization", `Bearer ${token}`);
    expect(trendsResponse.safeParse(res.body).success).toBe(true);
    const body = res.body as { metrics: Array<Record<string, unknown> & { points: Array<Record<string, unknown>> }> };
    const extraTop = { ...res.body, summary: "x" };
    const extraMetric = { ...res.body, metrics: [{ ...body.metrics[0], confirmed: true }] };
    const extraPoint = { ...res.body, metrics: [{ ...body.metrics[0], points: [{ ...body.metrics[0]!.points[0], note: "x" }] }] };
    for (const bad of [extraTop, extraMetric, extraPoint]) {
      const r = trendsResponse.safeParse(bad);
      expect(r.success).toBe(false);
      expect(r.error?.issues[0]?.code).toBe("unrecognized_keys");
    }
  });
});
