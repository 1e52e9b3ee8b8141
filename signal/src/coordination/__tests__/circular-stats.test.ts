import { describe, expect, it } from "vitest";
import { circularStats } from "../circular-stats";
import { wrapPi } from "../relative-phase";
import { scipyReference } from "./scipy-reference";

const rad = (d: number) => (d * Math.PI) / 180;

describe("circularStats(anglesRad, mask?)", () => {
  // Source: SciPy 1.17 check values (docs/methods.md#worked-examples): R 0.9482926, mean 6.0532°,
  // circular SD 0.3258594 rad, circular variance 0.051707 — tolerance 1e-6.
  it("reproduces the [10, 20, 30, 340, 350]° example", () => {
    const s = circularStats([10, 20, 30, 340, 350].map(rad))!;
    expect(s.n).toBe(5);
    expect(s.resultantLength).toBeCloseTo(0.9482926, 6);
    expect((s.meanRad * 180) / Math.PI).toBeCloseTo(6.0532, 4);
    expect(s.sdRad).toBeCloseTo(0.3258594, 6);
    expect(s.variance).toBeCloseTo(0.051707, 6);
  });

  // Source: scipy.stats.circmean / circstd / circvar (SciPy 1.17) via generate_fixtures.py.
  scipyReference.circular.forEach((ref, i) => {
    it(`matches scipy.stats circmean/circstd/circvar for reference set ${i} (tolerance 1e-12)`, () => {
      const s = circularStats(ref.anglesRad)!;
      expect(Math.abs(wrapPi(s.meanRad - ref.circmean))).toBeLessThan(1e-12);
      expect(s.sdRad).toBeCloseTo(ref.circstd, 12);
      expect(s.variance).toBeCloseTo(ref.circvar, 12);
    });
  });

  it("counts only masked samples and skips NaN", () => {
    const s = circularStats([rad(10), rad(200), Number.NaN, rad(20)], Uint8Array.of(1, 0, 1, 1))!;
    expect(s.n).toBe(2);
    expect((s.meanRad * 180) / Math.PI).toBeCloseTo(15, 10);
  });

  it("returns null for no angles and R ≈ 0 with a large SD for evenly spread angles", () => {
    expect(circularStats([])).toBeNull();
    const s = circularStats([0, Math.PI / 2, Math.PI, -Math.PI / 2])!;
    expect(s.resultantLength).toBeLessThan(1e-15);
    expect(s.sdRad).toBeGreaterThan(8);
  });

  it("throws RangeError when the mask length differs", () => {
    expect(() => circularStats([0, 1], Uint8Array.of(1))).toThrow(RangeError);
  });
});
