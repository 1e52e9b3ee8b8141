import { describe, expect, it } from "vitest";
import fixtures from "./fixtures/reliability-fixtures.json";
import { classifyChange, computeBaseline, flagMetricChanges, orderSeries, slopeFlag } from "../change-flags";
import { MDC95_FACTOR } from "../reliability";
import { weekly } from "./helpers";

// Baseline cadence [92.0, 95.5, 90.25]: mean 92.5833, SD 2.67317 (numpy, fixture) → MDC95 7.4096.
const cadenceMdc = fixtures.sd.cadence.sd * MDC95_FACTOR;

describe("flagMetricChanges: session flags", () => {
  it("computes the baseline of the first 3 sessions against NumPy (mean, SD ddof 1)", () => {
    const r = flagMetricChanges("cadenceStepsPerMin", weekly([92.0, 95.5, 90.25, 100]), "stroke");
    expect(r.baseline?.mean).toBeCloseTo(fixtures.sd.cadence.mean, 12);
    expect(r.baseline?.sd).toBeCloseTo(fixtures.sd.cadence.sd, 12);
    expect(r.mdc?.value).toBeCloseTo(7.4096, 4);
    expect(r.mdc?.source).toBe("patient-baseline");
    expect(r.points.slice(0, 3).every((p) => p.baseline && p.flag === undefined)).toBe(true);
  });

  it("flags cadence above baseline + MDC as improved, below − MDC as worsened, inside as within-error", () => {
    const m = fixtures.sd.cadence.mean;
    const values = [92.0, 95.5, 90.25, m + cadenceMdc + 0.01, m - cadenceMdc - 0.01, m + cadenceMdc - 0.01, m - 1];
    const flags = flagMetricChanges("cadenceStepsPerMin", weekly(values), "stroke").points.slice(3).map((p) => p.flag);
    expect(flags).toEqual(["improved", "worsened", "within-error", "within-error"]);
  });

  it("flags a rise in stride-time CV, PCI, asymmetry and double support as worsened", () => {
    for (const key of ["strideTimeCvPct", "phaseCoordinationIndexPct", "gaitAsymmetryPct", "doubleSupportPct"]) {
      const r = flagMetricChanges(key, weekly([3.1, 2.7, 3.4, 6.0, 1.0]), "parkinsons");
      expect(r.points[3]!.flag, key).toBe("worsened");
      expect(r.points[4]!.flag, key).toBe("improved");
    }
  });

  it("gives no flag to a metric without a clinical direction (circular SD), but still a baseline and MDC", () => {
    const r = flagMetricChanges("armLegLeftArmRightLegCircularSdDeg", weekly([10, 20, 15, 170]), "stroke");
    expect(r.points[3]!.flag).toBeUndefined();
    expect(r.mdc).not.toBeNull();
    expect(r.slopeFlag).toBeNull();
  });

  it("uses the published iSCI cadence MDC% (Nair 2012: 21 % of the mean) instead of the baseline SD", () => {
    // Baseline mean 80 → MDC 16.8 steps/min; 95 is +15 (within error), 97 is +17 (improved).
    const r = flagMetricChanges("cadenceStepsPerMin", weekly([79, 80, 81, 95, 97]), "incomplete_sci");
    expect(r.mdc?.source).toBe("published");
    expect(r.mdc?.value).toBeCloseTo(16.8, 10);
    expect(r.points.slice(3).map((p) => p.flag)).toEqual(["within-error", "improved"]);
  });

  it("honours a configurable baseline length and gives no flags before the baseline is complete", () => {
    const short = flagMetricChanges("strideTimeCvPct", weekly([3.1, 2.7]), "stroke");
    expect(short.baseline).toBeNull();
    expect(short.points.every((p) => p.flag === undefined)).toBe(true);
    const five = flagMetricChanges("strideTimeCvPct", weekly([3.1, 2.7, 3.4, 2.9, 3.0, 9]), "stroke", { baselineSessions: 5 });
    expect(five.baseline?.n).toBe(5);
    expect(five.points.filter((p) => p.baseline)).toHaveLength(5);
    expect(five.points[5]!.flag).toBe("worsened");
    expect(() => computeBaseline([], 1)).toThrow(RangeError);
  });

  it("orders sessions by recordedAt, whatever the input order", () => {
    const pts = weekly([1, 2, 3]).reverse();
    expect(orderSeries(pts).map((p) => p.sessionId)).toEqual(["s1", "s2", "s3"]);
  });
});

describe("mean relative phase: circular baseline, wrapped difference", () => {
  const key = "armLegLeftArmRightLegMeanRelativePhaseDeg";
  // Baseline [172, 175, 178]°: circular mean 175°, SD of wrapped deviations 3° (scipy fixture) → MDC95 8.316°.

  it("shows no change for a session at −178° against a baseline at 175° (7° apart, inside the MDC)", () => {
    const r = flagMetricChanges(key, weekly([172, 175, 178, -178]), "stroke");
    expect(r.baseline?.mean).toBeCloseTo(175, 9);
    expect(r.baseline?.sd).toBeCloseTo(3, 9);
    expect(r.mdc?.value).toBeCloseTo(3 * MDC95_FACTOR, 9);
    expect(r.points[3]!.flag).toBe("within-error");
  });

  it("flags a shift beyond the MDC as changed, in either direction across ±180°", () => {
    const r = flagMetricChanges(key, weekly([172, 175, 178, -170, 160]), "stroke");
    expect(r.points.slice(3).map((p) => p.flag)).toEqual(["changed", "changed"]); // +15°, −15°
    expect(r.slopeFlag).toBeNull(); // no line is fitted to angles
  });

  it("builds the baseline across the wrap: [178, −178, 180]° has mean 180° and SD 2°, not 206° and SD 205°", () => {
    const r = flagMetricChanges(key, weekly([178, -178, 180, -179]), "stroke");
    expect(Math.abs(r.baseline!.mean)).toBeCloseTo(180, 9);
    expect(r.baseline?.sd).toBeCloseTo(fixtures.circular[2]!.deviation_sd_ddof1, 9);
    expect(r.points[3]!.flag).toBe("within-error");
  });

  it("leaves excluded points (weak coupling) out of the baseline and the flags, but keeps them for display", () => {
    const pts = weekly([172, 40, 175, 178, -178]);
    pts[1] = { ...pts[1]!, excludedReason: "weak-coupling" };
    const r = flagMetricChanges(key, pts, "stroke");
    expect(r.points).toHaveLength(5);
    expect(r.points[1]).toMatchObject({ excludedReason: "weak-coupling" });
    expect(r.points[1]!.flag).toBeUndefined();
    expect(r.points[1]!.baseline).toBeUndefined();
    expect(r.baseline?.mean).toBeCloseTo(175, 9);
    expect(r.points.filter((p) => p.baseline).map((p) => p.sessionId)).toEqual(["s1", "s3", "s4"]);
    expect(r.points[4]!.flag).toBe("within-error");
  });
});

describe("classifyChange boundary", () => {
  it("treats a change exactly equal to the MDC as within error", () => {
    expect(classifyChange(2, 2, "higher-is-better")).toBe("within-error");
    expect(classifyChange(-2.0001, 2, "higher-is-better")).toBe("worsened");
    expect(classifyChange(5, 2, null)).toBeUndefined();
  });
});

describe("slopeFlag: OLS slope × span of the window vs MDC", () => {
  // Seven weekly values, x = −6 … 0 weeks: scipy.stats.linregress slope 1.375 /week → change over the 6-week span 8.25.
  const pts = weekly(fixtures.ols.y);

  it("computes the slope against scipy and flags change 8.25 > MDC 5 as improved for cadence", () => {
    const s = slopeFlag(pts, 5, "higher-is-better", 6)!;
    expect(s.slopePerWeek).toBeCloseTo(fixtures.ols.slope, 10);
    expect(s.spanWeeks).toBeCloseTo(6, 10);
    expect(s.changeOverWindow).toBeCloseTo(fixtures.ols.slope * 6, 10);
    expect(s.n).toBe(7);
    expect(s.flag).toBe("improved");
  });

  it("is within error when slope × span does not exceed the MDC", () => {
    expect(slopeFlag(pts, 8.26, "higher-is-better", 6)!.flag).toBe("within-error");
    expect(slopeFlag(pts, 8.24, "higher-is-better", 6)!.flag).toBe("improved");
  });

  it("reads the same rise as worsened for a higher-is-worse metric", () => {
    expect(slopeFlag(pts, 5, "higher-is-worse", 6)!.flag).toBe("worsened");
  });

  it("uses only the last K weeks: a 3-week window sees the final 4 sessions", () => {
    const s = slopeFlag(pts, 1, "higher-is-better", 3)!;
    expect(s.n).toBe(4);
    expect(s.fromSessionId).toBe("s4");
  });

  it("needs ≥ 3 sessions covering half the window", () => {
    expect(slopeFlag(weekly([1, 2]), 0.1, "higher-is-better", 6)).toBeNull();
    // Three sessions a day apart span 2 days, far under half of 6 weeks.
    expect(slopeFlag(weekly([1, 2, 3], undefined, 1), 0.1, "higher-is-better", 6)).toBeNull();
  });
});
