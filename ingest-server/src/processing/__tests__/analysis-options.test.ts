import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import type { AnalyzeOptions, SensorRecording } from "@pendula/signal";
import { WALKING_AIDS as SIGNAL_WALKING_AIDS } from "../../../../signal/src/coordination/session-arms";
import { WALKING_AIDS } from "../../contracts/enums";
import { createTestContext, type SeededUser, type TestContext } from "../../testing/harness";
import { seedDevices, synthFor, upload } from "../../testing/session-fixtures";
import { processSession } from "../process-session";

// The worker's call into the analysis is observed, not replaced: the real analyze() still runs.
const calls: Array<AnalyzeOptions | undefined> = [];
vi.mock("@pendula/signal", async (importOriginal) => {
  const real = await importOriginal<typeof import("@pendula/signal")>();
  return {
    ...real,
    analyze: (recordings: readonly SensorRecording[], options?: AnalyzeOptions) => {
      calls.push(options);
      return real.analyze(recordings, options);
    },
  };
});

let ctx: TestContext;
let clinician: SeededUser;
let patient: SeededUser;
let token = "";
let serials: Record<string, string>;

beforeAll(async () => {
  ctx = await createTestContext();
  clinician = await ctx.seedUser({ role: "clinician" });
  patient = await ctx.seedUser({ role: "patient", caseloadOf: [clinician.id] });
  token = await ctx.tokenFor(patient);
  serials = await seedDevices(ctx, patient.patientId!, "HGT");
});

afterAll(async () => {
  await ctx?.close();
});

describe("walking aids", () => {
  it("are the same list in the schema enums (what the clinician records) and in the analysis", () => {
    expect([...WALKING_AIDS]).toEqual([...SIGNAL_WALKING_AIDS]);
  });
});

describe("processSession → analyze(recordings, options)", () => {
  it("passes no height and no aid while none is recorded", async () => {
    const res = await upload(ctx, token, synthFor(serials, { seed: 41, strideTimeS: 1.15 }).files);
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    calls.length = 0;
    expect(await processSession(ctx.deps, res.body.id)).toBe("done");
    // sagittalSignals: the chart traces are the analysis' own signals (session-traces.ts).
    expect(calls).toEqual([{ sagittalSignals: true }]);
  });

  it("passes the patient's height and the session's walking aid, and stores the count behind each metric", async () => {
    await ctx.db("patients").where({ id: patient.patientId }).update({ height_cm: 176 });
    const res = await upload(ctx, token, synthFor(serials, { seed: 42, strideTimeS: 1.2 }).files);
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    await ctx.db("walk_sessions").where({ id: res.body.id }).update({ walking_aid: "cane" });
    calls.length = 0;
    expect(await processSession(ctx.deps, res.body.id)).toBe("done");
    expect(calls).toEqual([{ heightCm: 176, walkingAid: "cane", sagittalSignals: true }]);

    const stored = await ctx.db("walk_sessions").where({ id: res.body.id }).first("analysis");
    const counts: Record<string, number> = stored.analysis.metrics.counts;
    const rows = await ctx.db("session_metrics").where({ session_id: res.body.id }).select("metric_key", "n");
    const n = Object.fromEntries(rows.map((r) => [r.metric_key, r.n]));
    // Whatever counts the analysis reported for a stored metric arrive in session_metrics.n unchanged.
    for (const [key, count] of Object.entries(counts)) if (key in n) expect(n[key], key).toBe(count);
    expect(Object.keys(counts).filter((k) => k in n).length).toBeGreaterThan(0);
  });
});
