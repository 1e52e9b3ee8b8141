import { describe, expect, it } from "vitest";
import { analyze, synthesizeKinematicSession } from "@pendula/signal";
import { metricRows } from "../../metrics/analysis-metric-rows";
import {
  BASE_METRICS,
  BASE_METRIC_INFO,
  METRICS,
  METRIC_CHARTS,
  METRIC_KEYS,
  STORED_METRIC_KEYS,
  formatMetricValue,
  labelWithUnit,
  isMetricKey,
  metricDefinition,
  metricsOfChart,
} from "../metric-catalog";

// UCUM case-sensitive codes (https://ucum.org/ucum, §2 and table 1): the units the catalogue may use.
const UCUM_CODES = new Set(["/min", "s", "%", "deg", "m", "m/s", "1", "{strides}"]);

describe("every key the server writes is in the catalogue", () => {
  // A kinematic-model walk with both shanks and both wrists and a known height, so the analysis
  // fills speed, arm swing and arm–leg coupling; the same pivot the worker stores.
  const session = synthesizeKinematicSession({ seed: 16, bouts: [{ durationS: 80 }] });
  const analysis = analyze(session.recordings, { heightCm: 172 });
  const rows = metricRows(analysis.metrics);

  it("pivots a real analysis to rows whose keys are all catalogue keys, with the catalogue's unit", () => {
    // The walk is long and clean enough that most metrics are present, so the check has rows to look at.
    expect(rows.length).toBeGreaterThanOrEqual(20);
    for (const r of rows) {
      expect(isMetricKey(r.key), r.key).toBe(true);
      expect(r.unit).toBe(metricDefinition(r.key)!.unit);
    }
    // Metrics the walk certainly has (four sensors and a height): each is written under its key.
    for (const k of ["cadenceStepsPerMin", "walkingSpeedMPerS", "stancePctLeft", "armSwingAmplitudeDegRight", "armLegLeftArmRightLegCouplingStrength"]) {
      expect(rows.map((r) => r.key)).toContain(k);
    }
  });

  it("reads each stored value from the analysis JSON through the entry's accessor", () => {
    const byKey = new Map(rows.map((r) => [r.key, r.value]));
    expect(byKey.get("cadenceStepsPerMin")).toBe(analysis.metrics.cadenceStepsPerMin);
    expect(byKey.get("stancePctRight")).toBe(analysis.metrics.stancePct.right);
    expect(byKey.get("armLegRightArmLeftLegFrequencyRatio")).toBe(analysis.metrics.armLeg.rightArmLeftLeg.frequencyRatio);
  });

  it("has one entry per key, in the listed order, and a unique label per key", () => {
    expect(METRICS.map((m) => m.key)).toEqual([...STORED_METRIC_KEYS]);
    expect(METRIC_KEYS).toBe(STORED_METRIC_KEYS);
    expect(new Set(METRIC_KEYS).size).toBe(METRIC_KEYS.length);
    expect(new Set(METRICS.map((m) => m.label)).size).toBe(METRICS.length);
    expect(new Set(METRICS.map((m) => m.shortLabel)).size).toBe(METRICS.length);
  });
});

describe("typed lookup of stored keys", () => {
  it.each([
    ["stancePctLeft", "stancePct", "left", null],
    ["stepTimeMeanSRight", "stepTimeMeanS", "right", null],
    ["strideTimeMeanS", "strideTimeMeanS", null, null],
    ["armLegLeftArmRightLegFrequencyRatio", "frequencyRatio", null, "leftArmRightLeg"],
    ["armLegRightArmLeftLegCouplingStrength", "couplingStrength", null, "rightArmLeftLeg"],
  ])("%s → %s side %s pair %s", (key, base, side, pair) => {
    const d = metricDefinition(key);
    expect(d?.base).toBe(base);
    expect(d?.side).toBe(side);
    expect(d?.pair).toBe(pair);
  });

  it.each(["stancePct.left", "left_swing_pct", "armLeg.rightArmLeftLeg.couplingStrength", "leftArmRightLegCouplingStrength", "CADENCESTEPSPERMIN", "heartRateBpm", ""])(
    "does not guess at %j: only the stored spelling is a metric",
    (key) => {
      expect(metricDefinition(key)).toBeUndefined();
      expect(isMetricKey(key)).toBe(false);
    },
  );

  it("gives the clinical direction: cadence up is better; CV, PCI, asymmetry and DS up are worse; relative phase none", () => {
    expect(metricDefinition("cadenceStepsPerMin")?.direction).toBe("higher-is-better");
    for (const k of ["strideTimeCvPct", "phaseCoordinationIndexPct", "gaitAsymmetryPct", "doubleSupportPct"]) {
      expect(metricDefinition(k)?.direction, k).toBe("higher-is-worse");
    }
    expect(metricDefinition("armLegLeftArmRightLegMeanRelativePhaseDeg")?.direction).toBeNull();
  });

  it.each([
    ["walkingSpeedMPerS", "pace", "higher-is-better", "speed"],
    ["strideLengthM", "pace", "higher-is-better", "strideLength"],
    ["swingTimeCvPctLeft", "variability", "higher-is-worse", "swingVariability"],
    ["stepTimeAsymmetryPct", "asymmetry", "higher-is-worse", "stepAsymmetry"],
    ["armSwingAmplitudeDegLeft", "arm-swing", null, "armSwing"],
    ["armSwingAsymmetryPct", "arm-swing", "higher-is-worse", "armSwingAsymmetry"],
    ["stancePctRight", "phases", null, "phases"],
    ["doubleSupportPct", "phases", "higher-is-worse", "phases"],
    ["swingPctLeft", "phases", null, null],
    ["armLegRightArmLeftLegMeanRelativePhaseDeg", "arm-leg-coordination", null, null],
  ])("%s: family %s, direction %s, chart %s", (key, family, direction, chart) => {
    expect(metricDefinition(key)).toMatchObject({ family, direction, chart });
  });

  it("marks only the mean relative phase as an angle (circular statistics)", () => {
    expect(METRICS.filter((m) => m.circular).map((m) => m.key)).toEqual(["armLegLeftArmRightLegMeanRelativePhaseDeg", "armLegRightArmLeftLegMeanRelativePhaseDeg"]);
  });
});

describe("each entry is complete", () => {
  it.each(METRICS.map((m) => [m.key, m] as const))("%s", (_key, m) => {
    expect(UCUM_CODES.has(m.unit), m.unit).toBe(true);
    expect(m.label.length).toBeGreaterThan(3);
    expect(m.countKeys[0]).toBe(m.key);
    expect(Number.isInteger(m.decimals) && m.decimals >= 0 && m.decimals <= 3).toBe(true);
    expect(m.exportPrecision.step).toBeGreaterThan(0);
    expect(m.exportPrecision.why.length).toBeGreaterThan(10);
    expect(m.fhirCode).toBe(m.key);
    if (m.side) expect(m.shortLabel.endsWith(`, ${m.side}`)).toBe(true);
  });

  it("every base is used by a key, and every chart draws at least one metric", () => {
    for (const b of BASE_METRICS) expect(METRICS.some((m) => m.base === b), b).toBe(true);
    for (const c of METRIC_CHARTS) expect(metricsOfChart(c.id).length, c.id).toBeGreaterThan(0);
    expect(Object.keys(BASE_METRIC_INFO).sort()).toEqual([...BASE_METRICS].sort());
  });
});

describe("labelWithUnit", () => {
  it("adds the printed unit once, inside a trailing bracket when the label has one, and nothing for a plain number", () => {
    expect(labelWithUnit(metricDefinition("walkingSpeedMPerS")!)).toBe("Walking speed (m/s)");
    expect(labelWithUnit(metricDefinition("cadenceStepsPerMin")!)).toBe("Cadence (steps/min)");
    expect(labelWithUnit(metricDefinition("gaitAsymmetryPct")!)).toBe("Gait asymmetry (swing, %)");
    expect(labelWithUnit(metricDefinition("armSwingAmplitudeDegLeft")!)).toBe("Arm swing amplitude, left (°)");
    expect(labelWithUnit(metricDefinition("armLegLeftArmRightLegCouplingStrength")!)).toBe("Left arm–right leg coupling strength (R)");
  });
});

describe("formatMetricValue", () => {
  // Decimals are the catalogue's (common practice); the printed units follow UCUM's codes in words.
  it("prints with the entry's decimals and unit, and a dash for a missing value", () => {
    expect(formatMetricValue(metricDefinition("cadenceStepsPerMin")!, 98.44)).toBe("98.4 steps/min");
    expect(formatMetricValue(metricDefinition("walkingSpeedMPerS")!, 1.104)).toBe("1.10 m/s");
    expect(formatMetricValue(metricDefinition("armSwingAmplitudeDegLeft")!, 31.46)).toBe("31.5°");
    expect(formatMetricValue(metricDefinition("armLegLeftArmRightLegCouplingStrength")!, 0.8)).toBe("0.80");
    expect(formatMetricValue(metricDefinition("strideTimeCvPct")!, Number.NaN)).toBe("—");
    expect(formatMetricValue(metricDefinition("strideTimeCvPct")!, null)).toBe("—");
  });
});
