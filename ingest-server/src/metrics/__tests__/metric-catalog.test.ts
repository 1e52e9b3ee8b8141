import { describe, expect, it } from "vitest";
import type { Metrics } from "@pendula/signal";
import { METRIC_KEYS, metricRows } from "../metric-catalog";

const coupling = { frequencyRatio: 1, meanRelativePhaseDeg: -20, couplingStrength: 0.8, circularSdDeg: 30 };
const metrics: Metrics = {
  steadyStrideCount: 40,
  cadenceStepsPerMin: 109.0909,
  strideTimeMeanS: 1.1,
  strideTimeCvPct: 1.2856,
  stepTimeMeanS: { left: 0.55, right: 0.55 },
  stancePct: { left: 60, right: 60 },
  swingPct: { left: 40, right: 40 },
  doubleSupportPct: 20,
  phaseCoordinationIndexPct: null,
  gaitAsymmetryPct: 10.0083,
  dfaAlpha: null,
  dfaAlphaReason: "fewer than 256 strides",
  walkingSpeedMPerS: null,
  strideLengthM: null,
  walkingSpeedReason: "no height",
  swingTimeCvPct: { left: null, right: null },
  stepTimeAsymmetryPct: null,
  armSwing: null,
  armSwingReason: "no wrist sensor",
  counts: {},
  armLeg: { leftArmRightLeg: coupling, rightArmLeftLeg: { ...coupling, frequencyRatio: Number.NaN } },
};

describe("metricRows(metrics)", () => {
  // Values from DOMAIN.md "Check values" (stride 1.10 s / stance 0.66 s / step 0.55 s example; CV and GA examples).
  it("flattens per-side and arm–leg values with UCUM units and drops null / non-finite values", () => {
    const rows = Object.fromEntries(metricRows(metrics).map((r) => [r.key, r]));
    expect(rows.cadenceStepsPerMin).toEqual({ key: "cadenceStepsPerMin", value: 109.0909, unit: "/min" });
    expect(rows.stancePctLeft).toEqual({ key: "stancePctLeft", value: 60, unit: "%" });
    expect(rows.stepTimeMeanSRight?.unit).toBe("s");
    expect(rows.armLegLeftArmRightLegMeanRelativePhaseDeg).toEqual({ key: "armLegLeftArmRightLegMeanRelativePhaseDeg", value: -20, unit: "deg" });
    expect(rows.armLegRightArmLeftLegCouplingStrength?.unit).toBe("1");
    expect(rows.phaseCoordinationIndexPct).toBeUndefined();
    expect(rows.dfaAlpha).toBeUndefined();
    expect(rows.armLegRightArmLeftLegFrequencyRatio).toBeUndefined();
  });

  it("has unique keys", () => {
    expect(new Set(METRIC_KEYS).size).toBe(METRIC_KEYS.length);
  });
});
