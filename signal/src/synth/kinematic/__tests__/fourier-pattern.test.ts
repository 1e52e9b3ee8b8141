import { describe, expect, it } from "vitest";
import { periodicCurve } from "../fourier-pattern";
import { NORMATIVE_KNEE_DEG, NORMATIVE_PCT } from "../leg-pattern";

describe("periodicCurve(pct, values, harmonics)", () => {
  const pct = Array.from({ length: 20 }, (_, i) => 5 * i);
  const sine = pct.map((p) => 10 * Math.sin((2 * Math.PI * p) / 100) + 3);

  it("reproduces a sampled sinusoid: mean, amplitude and phase of its first harmonic", () => {
    const c = periodicCurve(pct, sine);
    expect(c.harmonic(0).re).toBeCloseTo(3, 9);
    // The linear interpolant of 20 samples keeps sinc²(1/20) of a first-harmonic amplitude (Fourier series of a
    // piecewise-linear interpolant): 10·sinc²(0.05) = 9.918.
    const h = c.harmonic(1);
    const sinc = Math.sin(Math.PI / 20) / (Math.PI / 20);
    // The fit integrates by the 720-point rectangle rule, exact to ≈ 1e-5 relative on this kinked interpolant.
    expect(Math.hypot(h.re, h.im)).toBeCloseTo(10 * sinc * sinc, 3);
    // 10 sin(2πq) = 10 cos(2πq − 90°).
    expect((Math.atan2(h.im, h.re) * 180) / Math.PI).toBeCloseTo(-90, 6);
  });

  it("is periodic and its slope is the derivative of its value", () => {
    const c = periodicCurve(NORMATIVE_PCT, NORMATIVE_KNEE_DEG);
    for (let q = 0; q < 1; q += 0.037) {
      expect(c.value(q + 1)).toBeCloseTo(c.value(q), 9);
      expect(c.value(q - 2)).toBeCloseTo(c.value(q), 9);
      const numeric = (c.value(q + 1e-5) - c.value(q - 1e-5)) / 2e-5;
      expect(c.slope(q)).toBeCloseTo(numeric, 1);
    }
  });

  it("stays within 3° of the normative knee table at its points (10 harmonics round only the corners)", () => {
    const c = periodicCurve(NORMATIVE_PCT, NORMATIVE_KNEE_DEG);
    NORMATIVE_PCT.forEach((p, i) => expect(Math.abs(c.value(p / 100) - NORMATIVE_KNEE_DEG[i]!)).toBeLessThan(3));
  });

  it("refuses tables of unequal length or fewer than 3 points", () => {
    expect(() => periodicCurve([0, 50], [1, 2])).toThrow(RangeError);
    expect(() => periodicCurve([0, 50, 70], [1, 2])).toThrow(RangeError);
  });
});
