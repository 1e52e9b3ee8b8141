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
    expect(resolveMetricKey("walkingSpeedMPerS")).toBeNull();
  });
});
