import fili, { type FiliBiquad } from "fili";
import { describe, expect, it } from "vitest";
import { bandPassAroundFundamental, zeroPhaseBandPass } from "../band-pass";
import { butterworthBandSections } from "../../filter/butterworth-band-sections";
import { scipyReference } from "./scipy-reference";

// The design itself (filter/butterworth-band-sections.ts) is checked against SciPy's butter/sosfreqz
// and the closed-form response in filter/__tests__/butterworth-band-sections.test.ts.

describe("zeroPhaseBandPass(x, sampleRateHz, lowHz, highHz)", () => {
  // Source: scipy.signal.sosfiltfilt (SciPy 1.17). Edge handling differs by design (see
  // band-pass.ts); the difference decays with a time constant of about 2 cycles of f0, so samples
  // within 16 cycles of either end are not compared, and the centre is held to a tighter bound.
  for (const ref of scipyReference.bandpass) {
    it(`matches sosfiltfilt away from the ends at ${ref.fs} Hz (1e-3, centre 1e-4; tone amplitude 1.5)`, () => {
      const y = zeroPhaseBandPass(ref.x, ref.fs, ref.lowHz, ref.highHz);
      const margin = Math.ceil((16 * ref.fs) / ref.f0);
      let err = 0;
      for (let i = margin; i < ref.y.length - margin; i++) err = Math.max(err, Math.abs(y[i]! - ref.y[i]!));
      expect(ref.y.length - 2 * margin).toBeGreaterThan(ref.fs * 10);
      expect(err).toBeLessThan(1e-3);
      const mid = Math.floor(ref.y.length / 2);
      let centre = 0;
      for (let i = mid - 2 * ref.fs; i < mid + 2 * ref.fs; i++) centre = Math.max(centre, Math.abs(y[i]! - ref.y[i]!));
      expect(centre).toBeLessThan(1e-4);
    });
  }

  it("keeps a tone at the centre in phase (zero phase) and removes DC", () => {
    const fs = 50;
    const f0 = 1.1;
    const x = Float64Array.from({ length: fs * 60 }, (_, i) => 5 + Math.cos(2 * Math.PI * f0 * (i / fs)));
    const y = bandPassAroundFundamental(x, fs, f0);
    // Peak of the output near the middle must sit on a peak of the input (cos = 1).
    const mid = Math.round((30 * fs) / 1);
    let best = mid;
    for (let i = mid - 25; i <= mid + 25; i++) if (y[i]! > y[best]!) best = i;
    const phase = (2 * Math.PI * f0 * best) / fs;
    expect(Math.cos(phase)).toBeGreaterThan(0.99);
    expect(Math.abs(y[best]! - 1)).toBeLessThan(0.02);
  });

  it("returns an empty array for empty input", () => {
    expect(zeroPhaseBandPass([], 100, 1, 2).length).toBe(0);
  });

  // The cascade is run in place with fili 2.0.3's IirFilter.filtfilt arithmetic (registers carried
  // from the forward into the backward pass); fili itself is the reference, number for number.
  it("equals fili's IirFilter.filtfilt on the same mean-removed, odd-extended input, exactly", () => {
    const fs = 12.5;
    const lowHz = 0.63;
    const highHz = 1.17;
    const n = 3000;
    const x = Float64Array.from({ length: n }, (_, i) => 3 + 20 * Math.sin(0.56 * i) + 7 * Math.cos(0.113 * i * i) + ((i * 7919) % 13) / 5);
    const y = zeroPhaseBandPass(x, fs, lowHz, highHz);
    let mean = 0;
    for (const v of x) mean += v;
    mean /= n;
    const padLen = Math.min(n - 1, Math.ceil((3 * fs) / lowHz));
    const ext: number[] = [];
    for (let i = 0; i < padLen; i++) ext.push(2 * (x[0]! - mean) - (x[padLen - i]! - mean));
    for (let i = 0; i < n; i++) ext.push(x[i]! - mean);
    for (let i = 0; i < padLen; i++) ext.push(2 * (x[n - 1]! - mean) - (x[n - 2 - i]! - mean));
    // fili's cascade form: w = k·x − a1·w₋₁ − a2·w₋₂, y = b0·w + b1·w₋₁ + b2·w₋₂; the design's gain is in b.
    const filiSections = butterworthBandSections(4, lowHz, highHz, fs).map((c): FiliBiquad => ({ k: 1, b: [c.b0, c.b1, c.b2], a: [c.a1, c.a2], a0: 1, z: [0, 0] }));
    const ref = new fili.IirFilter(filiSections).filtfilt(ext, false);
    expect(Array.from(y)).toEqual(ref.slice(padLen, padLen + n));
  });
});

describe("fili CalcCascades lowpass (why the band-pass is designed here and only run by fili)", () => {
  // Source: scipy.signal.butter(4, 5, fs=100, output="sos") + sosfreqz. fili's `order` counts biquads.
  it("fili's Butterworth low-pass, order 2 biquads, equals SciPy's butter(4, 5, fs=100) (1e-9)", () => {
    const ref = scipyReference.lowpass;
    const design = new fili.CalcCascades().lowpass({ order: 2, characteristic: "butterworth", Fs: ref.fs, Fc: ref.cutoffHz });
    const filter = new fili.IirFilter(design) as unknown as { responsePoint(p: { Fs: number; Fr: number }): { magnitude: number } };
    ref.responseHz.forEach((f, i) => {
      expect(Math.abs(filter.responsePoint({ Fs: ref.fs, Fr: f }).magnitude - ref.responseMagnitude[i]!)).toBeLessThan(1e-9);
    });
  });
});
