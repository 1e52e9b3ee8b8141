import { describe, expect, it } from "vitest";
import { monotoneCubic } from "../monotone-cubic";
import fixture from "./fixtures/pchip-scipy.json";

// Reference: SciPy 1.17 PchipInterpolator and its derivative (script beside the fixture).

describe("monotoneCubic(xs, ys)", () => {
  const f = monotoneCubic(fixture.x, fixture.y);

  it("matches SciPy's PchipInterpolator values and slopes inside the knots (1e-12)", () => {
    fixture.at.forEach((x, i) => {
      expect(f.value(x)).toBeCloseTo(fixture.value[i]!, 12);
      // SciPy's derivative at the last knot is one-sided like ours inside; the ends are held flat here.
      if (x > fixture.x[0]! && x < fixture.x[fixture.x.length - 1]!) expect(f.slope(x)).toBeCloseTo(fixture.slope[i]!, 10);
    });
  });

  it("stays flat between equal knots (a pause) and never decreases", () => {
    for (let x = 2.3; x <= 3.5; x += 0.05) expect(f.value(x)).toBeCloseTo(1.7, 12);
    let prev = -Infinity;
    for (let x = 0; x <= 5.2; x += 0.001) {
      const v = f.value(x);
      expect(v).toBeGreaterThanOrEqual(prev - 1e-12);
      prev = v;
    }
  });

  it("holds the end values outside the knots and refuses non-increasing knots", () => {
    expect(f.value(-1)).toBe(0);
    expect(f.value(9)).toBe(3.1);
    expect(() => monotoneCubic([0, 1, 1], [0, 1, 2])).toThrow(RangeError);
    expect(() => monotoneCubic([0], [0])).toThrow(RangeError);
  });
});
