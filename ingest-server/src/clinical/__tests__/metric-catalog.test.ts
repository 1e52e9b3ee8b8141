import { describe, expect, it } from "vitest";
import { METRICS } from "../../metrics/metric-catalog";
import { resolveMetricKey } from "../metric-catalog";

describe("resolveMetricKey", () => {
  it("resolves every key the server stores (src/metrics/metric-catalog.ts)", () => {
    for (const m of METRICS) expect(resolveMetricKey(m.key), m.key).not.toBeNull();
  });

  it.each([
    ["stancePctLeft", "stancePct", "left", null],
    ["stancePct.right", "stancePct", "right", null],
    ["left_swing_pct", "swingPct", "left", null],
    ["stepTimeMeanSRight", "stepTimeMeanS", "right", null],
    ["strideTimeMeanS", "strideTimeMeanS", null, null],
    ["armLegLeftArmRightLegFrequencyRatio", "frequencyRatio", null, "leftArmRightLeg"],
    ["armLeg.rightArmLeftLeg.couplingStrength", "couplingStrength", null, "rightArmLeftLeg"],
  ])("%s → %s side %s pair %s", (key, base, side, pair) => {
    const r = resolveMetricKey(key);
    expect(r?.base).toBe(base);
    expect(r?.side).toBe(side);
    expect(r?.pair).toBe(pair);
  });

  it("gives the clinical direction: cadence up is better; CV, PCI, asymmetry and DS up are worse; relative phase none", () => {
    expect(resolveMetricKey("cadenceStepsPerMin")?.info.direction).toBe("higher-is-better");
    for (const k of ["strideTimeCvPct", "phaseCoordinationIndexPct", "gaitAsymmetryPct", "doubleSupportPct"]) {
      expect(resolveMetricKey(k)?.info.direction, k).toBe("higher-is-worse");
    }
    expect(resolveMetricKey("armLegLeftArmRightLegMeanRelativePhaseDeg")?.info.direction).toBeNull();
  });

  it("returns null for an unknown key", () => {
    expect(resolveMetricKey("heartRateBpm")).toBeNull();
  });

  it.each([
    ["walkingSpeedMPerS", "walkingSpeedMPerS", null, "pace", "higher-is-better"],
    ["strideLengthM", "strideLengthM", null, "pace", "higher-is-better"],
    ["swingTimeCvPctLeft", "swingTimeCvPct", "left", "variability", "higher-is-worse"],
    ["swingTimeCvPctRight", "swingTimeCvPct", "right", "variability", "higher-is-worse"],
    ["stepTimeAsymmetryPct", "stepTimeAsymmetryPct", null, "asymmetry", "higher-is-worse"],
    ["armSwingAmplitudeDegLeft", "armSwingAmplitudeDeg", "left", "arm-swing", null],
    ["armSwingAmplitudeDegRight", "armSwingAmplitudeDeg", "right", "arm-swing", null],
    ["armSwingAsymmetryPct", "armSwingAsymmetryPct", null, "arm-swing", "higher-is-worse"],
  ])("new trend key %s → %s side %s, family %s, direction %s", (key, base, side, family, direction) => {
    const r = resolveMetricKey(key);
    expect(r?.base).toBe(base);
    expect(r?.side).toBe(side);
    expect(r?.info.family).toBe(family);
    expect(r?.info.direction).toBe(direction);
  });

  it("keeps similar names apart: swing % vs swing-time CV, gait vs step vs arm-swing asymmetry", () => {
    expect(resolveMetricKey("swingPctLeft")?.base).toBe("swingPct");
    expect(resolveMetricKey("gaitAsymmetryPct")?.base).toBe("gaitAsymmetryPct");
    expect(resolveMetricKey("stepTimeMeanSLeft")?.base).toBe("stepTimeMeanS");
  });

  it("marks only the mean relative phase as an angle (circular statistics)", () => {
    expect(resolveMetricKey("armLegRightArmLeftLegMeanRelativePhaseDeg")?.info.circular).toBe(true);
    expect(resolveMetricKey("armLegRightArmLeftLegCircularSdDeg")?.info.circular).toBeUndefined();
    expect(resolveMetricKey("armSwingAmplitudeDegLeft")?.info.circular).toBeUndefined();
  });
});
