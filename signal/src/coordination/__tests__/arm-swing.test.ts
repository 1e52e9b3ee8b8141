import { describe, expect, it } from "vitest";
import { armSwingAmplitude, armSwingAsymmetryPct } from "../arm-swing";

describe("armSwingAsymmetryPct(left, right): symmetry angle magnitude (Zifchock et al. 2008; Lewek et al. 2010)", () => {
  // Worked by hand: arctan(30/15) = 63.4349°; |45° − 63.4349°| / 90° × 100 = 20.4833 %.
  it("30° vs 15° → 20.4833 %, either way round", () => {
    expect(armSwingAsymmetryPct(30, 15)).toBeCloseTo(20.4833, 3);
    expect(armSwingAsymmetryPct(15, 30)).toBeCloseTo(20.4833, 3);
  });
  it("equal swing → 0; one arm still → 50 (the index's maximum)", () => {
    expect(armSwingAsymmetryPct(22, 22)).toBe(0);
    expect(armSwingAsymmetryPct(0, 10)).toBeCloseTo(50, 12);
  });
  it("missing, negative, non-finite or both zero → null", () => {
    expect(armSwingAsymmetryPct(null, 10)).toBeNull();
    expect(armSwingAsymmetryPct(-1, 10)).toBeNull();
    expect(armSwingAsymmetryPct(Number.NaN, 10)).toBeNull();
    expect(armSwingAsymmetryPct(0, 0)).toBeNull();
  });
});

describe("armSwingAmplitude(ω, valid, fs, strideHz, cycles)", () => {
  const fs = 100;
  const T = 1.1;
  const n = fs * 60;
  // θ = 12° sin(2πt/T) + 4° sin(4πt/T + 1): range per cycle found numerically on the angle itself.
  const theta = (t: number) => 12 * Math.sin((2 * Math.PI * t) / T) + 4 * Math.sin((4 * Math.PI * t) / T + 1);
  const omega = Float64Array.from({ length: n }, (_, i) => (theta((i + 0.5) / fs) - theta((i - 0.5) / fs)) * fs);
  const cycles = Array.from({ length: 40 }, (_, k) => ({ startS: 5 + k * T, endS: 5 + (k + 1) * T }));
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < 11000; i++) {
    lo = Math.min(lo, theta(i * 1e-4));
    hi = Math.max(hi, theta(i * 1e-4));
  }
  it("median range of the integrated angle equals the true range within 2 %", () => {
    const r = armSwingAmplitude(omega, new Uint8Array(n).fill(1), fs, 1 / T, cycles)!;
    expect(r.cycleCount).toBe(40);
    expect(r.amplitudeDeg / (hi - lo)).toBeGreaterThan(0.98);
    expect(r.amplitudeDeg / (hi - lo)).toBeLessThan(1.02);
  });
  it("cycles touching invalid samples are skipped; under 10 cycles → null", () => {
    const valid = new Uint8Array(n).fill(1);
    valid.fill(0, Math.round(5 * fs), Math.round((5 + 31 * T) * fs));
    expect(armSwingAmplitude(omega, valid, fs, 1 / T, cycles)).toBeNull();
  });
});
