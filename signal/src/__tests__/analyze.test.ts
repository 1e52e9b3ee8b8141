import { describe, expect, it } from "vitest";
import { analyze } from "../analyze";
import { readSensorCsv } from "../io/read-sensor-csv";
import { synthesizeSession, type SynthOptions } from "../synth";
import { SignalInputError } from "../types";

// Truth comes from the project's own synthetic gait generator (signal/src/synth): its event times.

function run(options: SynthOptions) {
  const session = synthesizeSession(options);
  const recordings = session.files.map((f) => readSensorCsv(f.text, f.fileName));
  return { session, analysis: analyze(recordings) };
}

/** Fraction of truth events (outside turns) matched by a detected event within ±tol s, and the median |error|. */
function match(detected: number[], truth: number[], tol = 0.06) {
  const errs: number[] = [];
  for (const t of truth) {
    let best = Infinity;
    for (const d of detected) best = Math.min(best, Math.abs(d - t));
    if (best <= tol) errs.push(best);
  }
  errs.sort((a, b) => a - b);
  return { recall: errs.length / truth.length, medianS: errs[errs.length >> 1] ?? Infinity };
}

describe("analyze(recordings) on synthetic sessions", () => {
  it("recovers shank ICs and FCs, cadence and stride time of a steady walk (misaligned 20°, jitter, rad/s)", () => {
    const { session, analysis } = run({ seed: 3, durationS: 90, sampleRateHz: 128, misalignmentDeg: 20, timestampJitterS: 0.002, gyroUnits: "rad/s" });
    for (const side of ["left", "right"] as const) {
      const ic = match(analysis.events[side].initialContacts, session.truth[side].ic);
      const fc = match(analysis.events[side].finalContacts, session.truth[side].fc);
      expect(ic.recall, `${side} IC`).toBeGreaterThan(0.95);
      expect(fc.recall, `${side} FC`).toBeGreaterThan(0.95);
      expect(ic.medianS).toBeLessThan(0.03);
    }
    const truthStride = session.truth.strideTimesS.reduce((a, b) => a + b, 0) / session.truth.strideTimesS.length;
    expect(analysis.metrics.strideTimeMeanS!).toBeCloseTo(truthStride, 1);
    expect(Math.abs(analysis.metrics.cadenceStepsPerMin! - 120 / truthStride)).toBeLessThan(3);
    expect(analysis.metrics.steadyStrideCount).toBeGreaterThan(30);
    expect(analysis.quality.some((q) => q.code === "inverted-sensor")).toBe(false);
    expect(analysis.algorithm.version).toMatch(/^\d+\.\d+\.\d+$/);
  });

  it("detects and corrects an upside-down shank and reports it", () => {
    const { session, analysis } = run({ seed: 4, durationS: 60, invertedPlacement: "right_shank" });
    expect(analysis.quality.filter((q) => q.code === "inverted-sensor").map((q) => q.placement)).toEqual(["right_shank"]);
    expect(match(analysis.events.right.initialContacts, session.truth.right.ic).recall).toBeGreaterThan(0.95);
  });

  it("keeps slow gait (stride 1.9 s, low swing peaks) thanks to signal-relative thresholds", () => {
    const { session, analysis } = run({ seed: 5, durationS: 120, strideTimeS: 1.9, midSwingPeakDegS: 70 });
    expect(match(analysis.events.left.initialContacts, session.truth.left.ic, 0.1).recall).toBeGreaterThan(0.9);
    expect(analysis.metrics.steadyStrideCount).toBeGreaterThan(20);
  });

  it("reports short gaps, invalidates long ones and puts no stride across them", () => {
    const { analysis } = run({
      seed: 6,
      durationS: 80,
      gaps: [
        { placement: "left_shank", startS: 20, durationS: 0.1 },
        { placement: "left_shank", startS: 40, durationS: 1.5 },
      ],
    });
    expect(analysis.quality.some((q) => q.code === "gap" && q.placement === "left_shank")).toBe(true);
    expect(analysis.invalidSpans.length).toBe(1);
    const span = analysis.invalidSpans[0]!;
    expect(span.endS - span.startS).toBeGreaterThan(1.4);
    expect(analysis.strides.filter((s) => s.steady && s.icS < span.endS && s.nextIcS > span.startS)).toEqual([]);
    expect(analysis.events.left.initialContacts.filter((t) => t > span.startS && t < span.endS)).toEqual([]);
  });

  it("flags a clock 3 % off nominal as rate-mismatch and clipped gyro as saturation", () => {
    const { analysis } = run({ seed: 7, durationS: 40, rateErrorPct: 3, gyroRangeDegS: 250 });
    expect(analysis.quality.some((q) => q.code === "rate-mismatch")).toBe(true);
    expect(analysis.quality.some((q) => q.code === "saturation")).toBe(true);
  });

  it("finds turns and excludes strides near them", () => {
    const { analysis } = run({ seed: 8, durationS: 90, turns: [{ startS: 40, durationS: 2.5, angleDeg: 180 }] });
    expect(analysis.turns.some((t) => t.startS < 42.5 && t.endS > 40)).toBe(true);
    expect(analysis.strides.some((s) => s.excludedReason === "turn")).toBe(true);
  });

  it("reports no-walking for a standing-only session and missing-placement for unplaced files", () => {
    const session = synthesizeSession({ seed: 9, durationS: 30, standing: [{ startS: 0, durationS: 30 }], writePlacement: false });
    const recs = session.files.map((f) => readSensorCsv(f.text, f.fileName));
    const a = analyze(recs);
    expect(a.quality.some((q) => q.code === "missing-placement")).toBe(true);
    expect(a.quality.some((q) => q.code === "no-walking")).toBe(true);
    expect(a.metrics.cadenceStepsPerMin).toBeNull();
  });

  it("rejects an empty list and two files claiming one placement", () => {
    expect(() => analyze([])).toThrow(SignalInputError);
    const session = synthesizeSession({ seed: 10, durationS: 20 });
    const rec = readSensorCsv(session.files[0]!.text, "a.csv");
    expect(() => analyze([rec, { ...rec, fileName: "b.csv" }])).toThrow(/also given by a\.csv/);
  });
});
