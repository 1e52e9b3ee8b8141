import { describe, expect, it } from "vitest";
import type { Metrics } from "@pendula/signal";
import { workedExampleMetrics } from "@pendula/signal/fixtures/worked-example-walk";
import { METRIC_KEYS, metricDefinition } from "../../contracts/metric-catalog";
import { metricRows } from "../analysis-metric-rows";

// The worked-example walk measured on the shanks alone and without the patient's height: no PCI,
// speed, stride length or arm swing, and one arm–leg frequency ratio that came out non-finite.
const walk = workedExampleMetrics();
const metrics: Metrics = {
  ...walk,
  phaseCoordinationIndexPct: null,
  walkingSpeedMPerS: null,
  strideLengthM: null,
  walkingSpeedReason: "no height",
  armSwing: null,
  armSwingReason: "no wrist sensor",
  counts: {},
  armLeg: { ...walk.armLeg, rightArmLeftLeg: { ...walk.armLeg.rightArmLeftLeg, frequencyRatio: Number.NaN } },
};

describe("metricRows(metrics)", () => {
  // Values from docs/methods.md#worked-examples (stride 1.10 s / stance 0.66 s / step 0.55 s
  // example; CV and GA examples).
  it("flattens per-side and arm–leg values with UCUM units and drops null / non-finite values", () => {
    const rows = Object.fromEntries(metricRows(metrics).map((r) => [r.key, r]));
    expect(rows.cadenceStepsPerMin).toEqual({ key: "cadenceStepsPerMin", value: 109.0909, unit: "/min", n: null });
    expect(rows.stancePctLeft).toEqual({ key: "stancePctLeft", value: 60, unit: "%", n: null });
    expect(rows.stepTimeMeanSRight?.unit).toBe("s");
    expect(rows.armLegLeftArmRightLegMeanRelativePhaseDeg).toEqual({ key: "armLegLeftArmRightLegMeanRelativePhaseDeg", value: -20, unit: "deg", n: null });
    expect(rows.armLegRightArmLeftLegCouplingStrength?.unit).toBe("1");
    expect(rows.phaseCoordinationIndexPct).toBeUndefined();
    expect(rows.dfaAlpha).toBeUndefined();
    expect(rows.armLegRightArmLeftLegFrequencyRatio).toBeUndefined();
  });

  it("carries the count behind each value as n, and null where the analysis gave none", () => {
    const rows = Object.fromEntries(metricRows({ ...metrics, counts: { cadenceStepsPerMin: 40, strideTimeCvPct: 38 } }).map((r) => [r.key, r]));
    expect(rows.cadenceStepsPerMin?.n).toBe(40);
    expect(rows.strideTimeCvPct?.n).toBe(38);
    expect(rows.doubleSupportPct?.n).toBeNull();
  });

  it("finds a per-side count under the flattened key, the dotted side, or the whole field", () => {
    const withSwing: Metrics = { ...metrics, swingTimeCvPct: { left: 3.1, right: 4.2 } };
    const flat = Object.fromEntries(metricRows({ ...withSwing, counts: { swingTimeCvPctLeft: 20, "swingTimeCvPct.right": 19 } }).map((r) => [r.key, r.n]));
    expect(flat).toMatchObject({ swingTimeCvPctLeft: 20, swingTimeCvPctRight: 19 });
    const whole = Object.fromEntries(metricRows({ ...withSwing, counts: { swingTimeCvPct: 39 } }).map((r) => [r.key, r.n]));
    expect(whole).toMatchObject({ swingTimeCvPctLeft: 39, swingTimeCvPctRight: 39 });
  });

  it("ignores a count that is not a whole number ≥ 0 rather than storing it", () => {
    const rows = Object.fromEntries(metricRows({ ...metrics, counts: { cadenceStepsPerMin: 12.5, strideTimeCvPct: -1 } }).map((r) => [r.key, r.n]));
    expect(rows).toMatchObject({ cadenceStepsPerMin: null, strideTimeCvPct: null });
  });

  it("stores walking speed (m/s), stride length (m), swing-time CV, step-time asymmetry and arm swing under the shared keys", () => {
    // The whole walk, with wrist sensors and height. Speed = stride length / stride time: 1.21 m /
    // 1.1 s = 1.10 m/s (kinematic identity, the check value's stride time).
    const full: Metrics = { ...walk, counts: { walkingSpeedMPerS: 36, strideLengthM: 36, stepTimeAsymmetryPct: 72, armSwing: 30 } };
    const rows = Object.fromEntries(metricRows(full).map((r) => [r.key, r]));
    expect(rows.walkingSpeedMPerS).toMatchObject({ key: "walkingSpeedMPerS", unit: "m/s", n: 36 });
    expect(rows.walkingSpeedMPerS?.value).toBeCloseTo(1.1, 12);
    expect(rows.strideLengthM).toEqual({ key: "strideLengthM", value: 1.21, unit: "m", n: 36 });
    expect(rows.swingTimeCvPctLeft).toMatchObject({ value: 3.1, unit: "%" });
    expect(rows.swingTimeCvPctRight).toMatchObject({ value: 3.9, unit: "%" });
    expect(rows.stepTimeAsymmetryPct).toEqual({ key: "stepTimeAsymmetryPct", value: 2.5, unit: "%", n: 72 });
    expect(rows.armSwingAmplitudeDegLeft).toEqual({ key: "armSwingAmplitudeDegLeft", value: 31.46, unit: "deg", n: 30 });
    expect(rows.armSwingAmplitudeDegRight).toMatchObject({ value: 12, unit: "deg", n: 30 });
    expect(rows.armSwingAsymmetryPct).toMatchObject({ value: 89.6, unit: "%" });
    expect(metricDefinition("stepTimeAsymmetryPct")?.countNoun).toBe("steps");
  });

  it("writes no arm swing row when the analysis has no arm swing (no wrist sensor)", () => {
    const keys = metricRows(metrics).map((r) => r.key);
    expect(keys.filter((k) => k.startsWith("armSwing"))).toEqual([]);
    expect(keys).not.toContain("walkingSpeedMPerS");
  });

  it("has unique keys", () => {
    expect(new Set(METRIC_KEYS).size).toBe(METRIC_KEYS.length);
  });
});
