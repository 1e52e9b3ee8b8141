import { describe, expect, it } from "vitest";
import fixtures from "./fixtures/reliability-fixtures.json";
import { circularDeviationSd, circularDifferenceDeg, circularSummary, rayleighP, wrapDeg } from "../statistics";

describe("wrapDeg and circularDifferenceDeg: angles in (−180°, 180°]", () => {
  it.each([
    [0, 0],
    [180, 180],
    [-180, 180],
    [190, -170],
    [-190, 170],
    [540, 180],
    [-353, 7],
    [359.5, -0.5],
  ])("wrap(%s) = %s", (a, w) => {
    expect(wrapDeg(a)).toBeCloseTo(w, 12);
  });

  it("175° and −178° are 7° apart, not 353°", () => {
    expect(circularDifferenceDeg(-178, 175)).toBeCloseTo(7, 12);
    expect(circularDifferenceDeg(175, -178)).toBeCloseTo(-7, 12);
  });

  it("refuses a non-finite angle", () => {
    expect(() => wrapDeg(Number.NaN)).toThrow(RangeError);
  });
});

describe("circularSummary against scipy.stats.circmean / circstd (fixture script)", () => {
  it.each(fixtures.circular)("$angles", (f) => {
    const s = circularSummary(f.angles);
    // scipy reports −180 where we report 180: compare as angles.
    expect(circularDifferenceDeg(s.meanDeg, f.mean_deg)).toBeCloseTo(0, 9);
    expect(s.resultantLength).toBeCloseTo(f.resultant_length, 12);
    expect(s.circularSdDeg).toBeCloseTo(f.circstd_deg, 9);
    expect(circularDeviationSd(f.angles)).toBeCloseTo(f.deviation_sd_ddof1, 9);
  });

  it("matches the SciPy check value (docs/methods.md#circular-statistics) [10, 20, 30, 340, 350]°: R 0.9482926, mean 6.0532°, SD 0.3258594 rad", () => {
    const s = circularSummary([10, 20, 30, 340, 350]);
    expect(s.resultantLength).toBeCloseTo(0.9482926, 6);
    expect(s.meanDeg).toBeCloseTo(6.0532, 4);
    expect((s.circularSdDeg * Math.PI) / 180).toBeCloseTo(0.3258594, 6);
  });

  it("has no mean direction for evenly spread angles", () => {
    expect(circularSummary([0, 120, 240]).meanDeg).toBeNaN();
    expect(circularDeviationSd([0, 180])).toBe(Number.POSITIVE_INFINITY);
  });
});

describe("rayleighP: Zar's approximation against a Monte Carlo of uniform phases (fixture script, 200 000 draws)", () => {
  it.each(fixtures.rayleigh)("n $n, R $r", (f) => {
    expect(rayleighP(f.r, f.n)).toBeCloseTo(f.p_zar, 12);
    // The approximation is within 0.002 of the simulated tail probability at these sizes.
    expect(Math.abs(rayleighP(f.r, f.n) - f.p_monte_carlo)).toBeLessThan(0.002);
  });

  it("is 1 for R = 0 and tiny for R near 1", () => {
    expect(rayleighP(0, 10)).toBeCloseTo(1, 6);
    expect(rayleighP(0.99, 10)).toBeLessThan(1e-3);
    expect(() => rayleighP(1.2, 10)).toThrow(RangeError);
    expect(() => rayleighP(0.5, 1)).toThrow(RangeError);
  });
});
