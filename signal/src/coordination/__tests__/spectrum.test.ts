import { describe, expect, it } from "vitest";
import { dominantFrequency } from "../dominant-frequency";
import { frequencyRatio } from "../frequency-ratio";
import { relativePhase, wrapPi } from "../relative-phase";
import { welchPsd } from "../welch-psd";
import { scipyReference } from "./scipy-reference";

describe("welchPsd(x, sampleRateHz, options)", () => {
  // Source: scipy.signal.welch(x, fs=25, window="hann", nperseg=512, noverlap=256), SciPy 1.17.
  for (const ref of scipyReference.welch) {
    it(`matches scipy.signal.welch for the ${ref.name} signal (relative 1e-10 of the peak)`, () => {
      const w = welchPsd(ref.x, ref.fs, { segmentLength: ref.nperseg });
      expect(w.psd.length).toBe(ref.psd.length);
      const peak = Math.max(...ref.psd);
      ref.psd.forEach((p, k) => {
        expect(Math.abs(w.psd[k]! - p) / peak).toBeLessThan(1e-10);
        expect(w.frequenciesHz[k]).toBeCloseTo(ref.f[k]!, 12);
      });
    });
  }

  it("skips segments outside the mask", () => {
    const x = Float64Array.from({ length: 4096 }, (_, i) => Math.sin(i / 3));
    const mask = new Uint8Array(4096).fill(1, 0, 1024);
    expect(welchPsd(x, 10, { segmentLength: 256, mask }).segmentCount).toBe(7);
    expect(welchPsd(x, 10, { segmentLength: 256 }).segmentCount).toBe(31);
  });

  it("rejects a segment length that is not a power of two", () => {
    expect(() => welchPsd(new Float64Array(1000), 10, { segmentLength: 300 })).toThrow(RangeError);
  });
});

describe("dominantFrequency(x, sampleRateHz, options)", () => {
  // Source: scipy.signal.welch argmax (0.879 → bin 0.8789 Hz, 1.758 → bin 1.7578 Hz),
  // docs/methods.md#spectra.
  it("finds SciPy's peak bin and refines it towards the true tone", () => {
    const [leg, arm] = scipyReference.welch;
    const dl = dominantFrequency(leg!.x, leg!.fs, { minHz: 0.3, maxHz: 4, segmentS: 512 / 25 })!;
    const da = dominantFrequency(arm!.x, arm!.fs, { minHz: 0.3, maxHz: 4, segmentS: 512 / 25 })!;
    expect(dl.peakBinHz).toBe(leg!.peakHz);
    expect(da.peakBinHz).toBe(arm!.peakHz);
    expect(Math.abs(dl.frequencyHz - 0.879)).toBeLessThan(0.01);
    expect(Math.abs(da.frequencyHz - 1.758)).toBeLessThan(0.01);
    expect(dl.peakToMedian).toBeGreaterThan(100);
  });

  it("returns null when the signal is shorter than one segment", () => {
    expect(dominantFrequency(new Float64Array(100), 25, { minHz: 0.3, maxHz: 4 })).toBeNull();
  });
});

describe("frequencyRatio(armHz, strideHz)", () => {
  // Source: docs/methods.md#spectra (SciPy welch) — Welch peaks 0.879 / 1.758 Hz → arm:leg ratio
  // 2.0.
  it("gives 2 for the Welch peaks 0.879 / 1.758 Hz", () => {
    expect(frequencyRatio(1.758, 0.879)).toBe(2);
  });

  // Source: issue 3 — "1 or 2 when within 15 % of it, else the measured value".
  it("snaps within 15 % and reports the measured value outside", () => {
    expect(frequencyRatio(1.14, 1)).toBe(1);
    expect(frequencyRatio(0.86, 1)).toBe(1);
    expect(frequencyRatio(1.72, 1)).toBe(2);
    expect(frequencyRatio(2.3, 1)).toBe(2);
    expect(frequencyRatio(1.4, 1)).toBeCloseTo(1.4, 12);
    expect(frequencyRatio(0.5, 1)).toBeCloseTo(0.5, 12);
    expect(frequencyRatio(2.4, 1)).toBeCloseTo(2.4, 12);
  });
});

describe("relativePhase(armPhaseRad, legPhaseRad, n) and wrapPi", () => {
  it("wraps into (−π, π]", () => {
    expect(wrapPi(Math.PI)).toBeCloseTo(Math.PI, 15);
    expect(wrapPi(-Math.PI)).toBeCloseTo(Math.PI, 15);
    expect(wrapPi(3 * Math.PI + 0.5)).toBeCloseTo(-Math.PI + 0.5, 12);
    expect(wrapPi(-0.25)).toBe(-0.25);
  });

  it("computes φ_arm − 2·φ_leg for 2:1 locking", () => {
    const psi = relativePhase([0.5, 3], [0.1, 2], 2);
    expect(psi[0]).toBeCloseTo(0.3, 12);
    expect(psi[1]).toBeCloseTo(wrapPi(-1), 12);
  });

  it("rejects a non-integer order", () => {
    expect(() => relativePhase([0], [0], 1.5)).toThrow(RangeError);
  });
});
