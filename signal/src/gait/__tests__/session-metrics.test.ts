import { describe, expect, it } from "vitest";
import { analyze } from "../../analyze";
import { readSensorCsv } from "../../io/read-sensor-csv";
import { synthesizeSession, type SynthOptions } from "../../synth";

// End to end on the project's synthetic sessions (signal/src/synth): the truth is the generator's
// own schedule (its stride times and gap positions), never the rules under test.

function run(options: SynthOptions) {
  const session = synthesizeSession(options);
  return { session, analysis: analyze(session.files.map((f) => readSensorCsv(f.text, f.fileName))) };
}

describe("analyze() — steady state, gaps and counts", () => {
  it("a stride across a 100 ms interpolated gap is excluded as 'gap', the gap item stays, and the exclusions are listed", () => {
    const { analysis } = run({ seed: 61, durationS: 90, gaps: [{ placement: "left_shank", startS: 40, durationS: 0.1 }] });
    expect(analysis.quality.some((q) => q.code === "gap" && q.placement === "left_shank")).toBe(true);
    const gapStrides = analysis.strides.filter((s) => s.excludedReason === "gap");
    expect(gapStrides.length).toBeGreaterThanOrEqual(1);
    for (const s of gapStrides) expect(s.icS < 40.15 && s.nextIcS > 39.95).toBe(true);
    expect(analysis.strides.filter((s) => s.steady && s.icS < 40.1 && s.nextIcS > 40)).toEqual([]);
    const item = analysis.quality.find((q) => q.code === "strides-excluded")!;
    expect(item.severity).toBe("info");
    expect(item.message).toMatch(/\d+ gap/);
  });

  it("every metric reports the strides or steps behind it, and every stride its bout", () => {
    const { analysis } = run({ seed: 62, durationS: 120 });
    const m = analysis.metrics;
    const steady = analysis.strides.filter((s) => s.steady);
    expect(m.counts.strideTimeCvPct).toBe(steady.length);
    expect(m.counts.strideTimeMeanS).toBe(steady.length);
    expect(m.counts.cadenceStepsPerMin).toBe(steady.filter((s) => typeof s.stepTimeS === "number").length);
    expect(m.counts.stancePctLeft).toBe(steady.filter((s) => s.side === "left" && s.stancePct !== null).length);
    expect(m.counts.swingTimeCvPctRight).toBe(steady.filter((s) => s.side === "right" && s.swingTimeS !== null).length);
    for (const key of ["doubleSupportPct", "phaseCoordinationIndexPct", "gaitAsymmetryPct", "stepTimeAsymmetryPct", "dfaAlpha"]) {
      expect(m.counts[key], key).toBeGreaterThan(0);
    }
    expect(m.swingTimeCvPct.left).not.toBeNull();
    expect(m.stepTimeAsymmetryPct).not.toBeNull();
    expect(analysis.strides.every((s) => typeof s.boutIndex === "number")).toBe(true);
    // Fewer than 256 consecutive strides in two minutes: α null, with the run's length in the reason.
    expect(m.dfaAlpha).toBeNull();
    expect(m.dfaAlphaReason).toMatch(new RegExp(`has ${m.counts.dfaAlpha} strides`));
  });

  it("a 40 steps/min walk (3 s strides) keeps its strides and metrics", () => {
    const { session, analysis } = run({ seed: 63, durationS: 200, strideTimeS: 3, midSwingPeakDegS: 60 });
    const truthMeanS = session.truth.strideTimesS.reduce((a, b) => a + b, 0) / session.truth.strideTimesS.length;
    expect(analysis.metrics.steadyStrideCount).toBeGreaterThan(40);
    expect(analysis.metrics.strideTimeCvPct).not.toBeNull();
    expect(Math.abs(analysis.metrics.cadenceStepsPerMin! - 120 / truthMeanS)).toBeLessThan(2);
    expect(analysis.strides.filter((s) => s.excludedReason === "out-of-range").length).toBeLessThanOrEqual(2);
  });
});
