import { describe, expect, it } from "vitest";
import { scipyReference } from "../../coordination/__tests__/scipy-reference";
import { butterworthBandSections } from "../butterworth-band-sections";
import type { Biquad } from "../butterworth-sections";

/** |H(e^{iω})| of a cascade at fHz, evaluated directly from the section coefficients (z⁻¹ = e^{−iω}). */
function magnitude(sections: readonly Biquad[], fHz: number, fs: number): number {
  const w = (2 * Math.PI * fHz) / fs;
  let m = 1;
  for (const s of sections) {
    const nr = s.b0 + s.b1 * Math.cos(w) + s.b2 * Math.cos(2 * w);
    const ni = -s.b1 * Math.sin(w) - s.b2 * Math.sin(2 * w);
    const dr = 1 + s.a1 * Math.cos(w) + s.a2 * Math.cos(2 * w);
    const di = -s.a1 * Math.sin(w) - s.a2 * Math.sin(2 * w);
    m *= Math.hypot(nr, ni) / Math.hypot(dr, di);
  }
  return m;
}

/**
 * Closed form of the digital Butterworth band-pass: the analog prototype |H(jω)|² = 1/(1 + ω^{2N}),
 * the low-pass → band-pass substitution s → (s² + Ω₀²)/(s·B) (SciPy `lp2bp` documentation), and the
 * bilinear transform with pre-warped edges Ω = 2·fs·tan(π f / fs), under which the digital response
 * at f equals the analog one at Ω(f). Ω₀² = Ω_lo·Ω_hi, B = Ω_hi − Ω_lo.
 */
function closedForm(order: number, lowHz: number, highHz: number, fHz: number, fs: number): number {
  const warp = (f: number) => 2 * fs * Math.tan((Math.PI * f) / fs);
  const lo = warp(lowHz);
  const hi = warp(highHz);
  const o = warp(fHz);
  const x = (o * o - lo * hi) / (o * (hi - lo));
  return 1 / Math.sqrt(1 + x ** (2 * order));
}

describe("butterworthBandSections(order, lowHz, highHz, sampleRateHz)", () => {
  // Source: scipy.signal.butter(4, [lo, hi], "bandpass", fs, output="sos") + sosfreqz, SciPy 1.17
  // (signal/fixtures/generate_fixtures.py): the arm–leg band, order 4, 0.7–1.3 × f0.
  for (const ref of scipyReference.bandpass) {
    it(`has SciPy's magnitude response for butter(4, [${ref.lowHz.toFixed(2)}, ${ref.highHz.toFixed(2)}], fs=${ref.fs}) (1e-9)`, () => {
      const sections = butterworthBandSections(4, ref.lowHz, ref.highHz, ref.fs);
      expect(sections).toHaveLength(4);
      ref.responseHz.forEach((f, i) => {
        expect(Math.abs(magnitude(sections, f, ref.fs) - ref.responseMagnitude[i]!)).toBeLessThan(1e-9);
      });
    });
  }
  // The wrist axis's band (order 2) is checked end to end against SciPy's sosfiltfilt in
  // zero-phase-butterworth.test.ts (signal/scripts/gen-filter-fixtures.py).

  // Closed form above; orders 1–8, narrow bands (conjugate pole pairs only) and wide bands with an
  // odd order (the prototype's real pole becomes two real poles, paired in one section).
  const cases: Array<[number, number, number, number]> = [
    [1, 0.8, 1.6, 100],
    [2, 0.5, 2.6, 100],
    [3, 0.5, 20, 100],
    [4, 0.63, 1.17, 12.5],
    [5, 2, 40, 100],
    [6, 0.9, 1.7, 200],
    [7, 0.3, 30, 100],
    [8, 1, 3, 200],
  ];
  it.each(cases)("order %i, %f–%f Hz at %f Hz: equals the closed-form Butterworth band-pass response (1e-9)", (order, lo, hi, fs) => {
    const sections = butterworthBandSections(order, lo, hi, fs);
    expect(sections).toHaveLength(order);
    for (const f of [lo / 4, lo / 1.5, lo, Math.sqrt(lo * hi), (lo + hi) / 2, hi, Math.min(hi * 1.5, fs / 2.2), fs / 2.1]) {
      expect(Math.abs(magnitude(sections, f, fs) - closedForm(order, lo, hi, f, fs))).toBeLessThan(1e-9);
    }
  });

  // Butterworth definition: |H| = 1/√2 at both edges, 1 at the (pre-warped) geometric centre.
  it("is −3.01 dB at both edges and 0 dB at the warped geometric centre (order 4, the arm–leg band)", () => {
    const fs = 200;
    const s = butterworthBandSections(4, 0.63, 1.17, fs);
    expect(magnitude(s, 0.63, fs)).toBeCloseTo(Math.SQRT1_2, 10);
    expect(magnitude(s, 1.17, fs)).toBeCloseTo(Math.SQRT1_2, 10);
    const w0 = Math.sqrt(Math.tan((Math.PI * 0.63) / fs) * Math.tan((Math.PI * 1.17) / fs));
    expect(magnitude(s, (fs / Math.PI) * Math.atan(w0), fs)).toBeCloseTo(1, 10);
  });

  it("has zeros at DC and Nyquist and stable poles (|pole| < 1 in every section)", () => {
    for (const [order, lo, hi, fs] of cases) {
      for (const s of butterworthBandSections(order, lo, hi, fs)) {
        expect([s.b0 + s.b1 + s.b2, s.b0 - s.b1 + s.b2].map(Math.abs).every((v) => v < 1e-15)).toBe(true);
        // A real biquad 1 + a1 z⁻¹ + a2 z⁻² has both poles inside the unit circle iff |a2| < 1 and |a1| < 1 + a2.
        expect(Math.abs(s.a2)).toBeLessThan(1);
        expect(Math.abs(s.a1)).toBeLessThan(1 + s.a2);
      }
    }
  });

  it("rejects edges in the wrong order or above Nyquist, bad orders and bad rates", () => {
    expect(() => butterworthBandSections(4, 2, 1, 100)).toThrow(RangeError);
    expect(() => butterworthBandSections(4, 1, 1, 100)).toThrow(RangeError);
    expect(() => butterworthBandSections(4, 1, 60, 100)).toThrow(/Nyquist/);
    expect(() => butterworthBandSections(4, 0, 2, 100)).toThrow(RangeError);
    expect(() => butterworthBandSections(0, 1, 2, 100)).toThrow(RangeError);
    expect(() => butterworthBandSections(9, 1, 2, 100)).toThrow(RangeError);
    expect(() => butterworthBandSections(2.5, 1, 2, 100)).toThrow(RangeError);
    expect(() => butterworthBandSections(4, 1, 2, Number.NaN)).toThrow(RangeError);
  });
});
