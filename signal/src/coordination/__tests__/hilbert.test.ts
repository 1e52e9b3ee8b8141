import { describe, expect, it } from "vitest";
import { dft, inverseDft } from "../dft";
import { hilbert, hilbertPhase, hilbertPhasePair } from "../hilbert";
import { relativePhase } from "../relative-phase";
import { scipyReference } from "./scipy-reference";

function maxAbsDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i]! - b[i]!));
  return m;
}

describe("dft(real, imag)", () => {
  it("equals the O(N²) definition for prime, odd, even and power-of-two N (tolerance 1e-11)", () => {
    for (const n of [2, 3, 7, 12, 16, 31, 100]) {
      const x = Array.from({ length: n }, (_, i) => Math.sin(1.3 * i) + 0.2 * i);
      const y = Array.from({ length: n }, (_, i) => Math.cos(0.7 * i * i));
      const got = dft(x, y);
      for (let k = 0; k < n; k++) {
        let re = 0;
        let im = 0;
        for (let j = 0; j < n; j++) {
          const a = (-2 * Math.PI * k * j) / n;
          re += x[j]! * Math.cos(a) - y[j]! * Math.sin(a);
          im += x[j]! * Math.sin(a) + y[j]! * Math.cos(a);
        }
        expect(Math.abs(got.re[k]! - re)).toBeLessThan(1e-11);
        expect(Math.abs(got.im[k]! - im)).toBeLessThan(1e-11);
      }
    }
  });

  it("inverseDft(dft(x)) returns x for a non-power-of-two length", () => {
    const x = Float64Array.from({ length: 1001 }, (_, i) => Math.sin(i / 5) * (1 + i / 1000));
    const spectrum = dft(x, null);
    const back = inverseDft(spectrum.re, spectrum.im);
    expect(maxAbsDiff(back.re, x)).toBeLessThan(1e-12);
    expect(Math.max(...back.im.map(Math.abs))).toBeLessThan(1e-12);
  });
});

describe("hilbert(x)", () => {
  // Source: scipy.signal.hilbert (SciPy 1.17) via signal/fixtures/generate_fixtures.py.
  for (const ref of scipyReference.hilbert) {
    it(`matches scipy.signal.hilbert for N = ${ref.n} (tolerance 1e-11, data ~ N(0, 1))`, () => {
      const z = hilbert(ref.x);
      expect(z.re.length).toBe(ref.n);
      expect(maxAbsDiff(z.re, ref.re)).toBeLessThan(1e-11);
      expect(maxAbsDiff(z.im, ref.im)).toBeLessThan(1e-11);
    });
  }

  // Source: docs/methods.md#hilbert-transform (computed, SciPy 1.17) — hilbert(cos(2πkn/N)) =
  // e^{i2πkn/N} for whole cycles, max error < 1e-12.
  for (const n of [1000, 1024, 997]) {
    it(`turns a whole-cycle cosine into the complex exponential for N = ${n} (error < 1e-12)`, () => {
      const k = 7;
      const x = Float64Array.from({ length: n }, (_, i) => Math.cos((2 * Math.PI * k * i) / n));
      const z = hilbert(x);
      let err = 0;
      for (let i = 0; i < n; i++) {
        const a = (2 * Math.PI * k * i) / n;
        err = Math.max(err, Math.hypot(z.re[i]! - Math.cos(a), z.im[i]! - Math.sin(a)));
      }
      expect(err).toBeLessThan(1e-12);
    });
  }

  // The length the arm–leg step transforms for a 30-minute session (22 500 samples at 12.5 Hz):
  // Bluestein rounding grows slowly with size, so the bound is 5e-12 (measured ≈ 1.1e-12).
  it("keeps the whole-cycle cosine error below 5e-12 at N = 22 500", () => {
    const n = 22500;
    const k = 1234;
    const x = Float64Array.from({ length: n }, (_, i) => Math.cos((2 * Math.PI * k * i) / n));
    const z = hilbert(x);
    let err = 0;
    for (let i = 0; i < n; i++) {
      const a = (2 * Math.PI * k * i) / n;
      err = Math.max(err, Math.hypot(z.re[i]! - Math.cos(a), z.im[i]! - Math.sin(a)));
    }
    expect(err).toBeLessThan(5e-12);
  });

  // Source: docs/methods.md#hilbert-transform — two cosines 90° apart give a continuous relative
  // phase of 90.000°.
  it("gives a relative phase of 90° for two cosines a quarter cycle apart", () => {
    const n = 1200;
    const k = 12;
    const lead = Float64Array.from({ length: n }, (_, i) => Math.cos((2 * Math.PI * k * i) / n + Math.PI / 2));
    const lag = Float64Array.from({ length: n }, (_, i) => Math.cos((2 * Math.PI * k * i) / n));
    const psi = relativePhase(hilbertPhase(lead), hilbertPhase(lag), 1);
    for (const v of psi) expect((v * 180) / Math.PI).toBeCloseTo(90, 9);
  });

  it("returns empty arrays for an empty input and x itself for one sample", () => {
    expect(hilbert([]).re.length).toBe(0);
    const one = hilbert([3.5]);
    expect(one.re[0]).toBe(3.5);
    expect(one.im[0]).toBe(0);
  });
});

describe("hilbertPhasePair(x, y)", () => {
  // H is linear and real-to-real, so one transform of x + i·y must give both phases of hilbertPhase.
  for (const n of [2, 7, 12, 1001, 1024, 22500]) {
    it(`equals hilbertPhase of each signal for N = ${n} (wrapped difference < 1e-9 rad)`, () => {
      const x = Float64Array.from({ length: n }, (_, i) => 2 * Math.cos(0.31 * i) + 0.5 * Math.sin(0.05 * i * (1 + i / n)) + 0.1);
      const y = Float64Array.from({ length: n }, (_, i) => 1.5 * Math.sin(0.17 * i + 1) - 0.4 * Math.cos(0.9 * i));
      const [px, py] = hilbertPhasePair(x, y);
      const wrapped = (a: number, b: number) => Math.abs(Math.atan2(Math.sin(a - b), Math.cos(a - b)));
      const ex = hilbertPhase(x);
      const ey = hilbertPhase(y);
      let err = 0;
      for (let i = 0; i < n; i++) err = Math.max(err, wrapped(px[i]!, ex[i]!), wrapped(py[i]!, ey[i]!));
      expect(err).toBeLessThan(1e-9);
    });
  }

  it("gives the quarter-cycle relative phase of two cosines and rejects unequal lengths", () => {
    const n = 1200;
    const k = 12;
    const lead = Float64Array.from({ length: n }, (_, i) => Math.cos((2 * Math.PI * k * i) / n + Math.PI / 2));
    const lag = Float64Array.from({ length: n }, (_, i) => Math.cos((2 * Math.PI * k * i) / n));
    const [a, b] = hilbertPhasePair(lead, lag);
    for (const v of relativePhase(a, b, 1)) expect((v * 180) / Math.PI).toBeCloseTo(90, 9);
    expect(() => hilbertPhasePair([1, 2], [1])).toThrow(RangeError);
  });
});

describe("dft(real, imag) above the cached plan size", () => {
  // 2¹⁷ + 1 points need a 2¹⁹-point Bluestein plan, which is held only weakly (dft.ts): repeated
  // transforms in one job reuse it. Reuse must not change a value, and the inverse must still undo it.
  it("gives the same spectrum on repeated calls and inverseDft(dft(x)) returns x (1e-9; common practice)", { timeout: 60_000 }, () => {
    const n = (1 << 17) + 1;
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = Math.sin(0.001 * i * i) + ((i * 7919) % 101) / 101;
    const a = dft(x, null);
    const b = dft(x, null);
    let differing = 0;
    for (let k = 0; k < n; k++) if (a.re[k] !== b.re[k] || a.im[k] !== b.im[k]) differing++;
    expect(differing).toBe(0);
    const back = inverseDft(a.re, a.im);
    let worst = 0;
    for (let i = 0; i < n; i++) worst = Math.max(worst, Math.abs(back.re[i]! - x[i]!), Math.abs(back.im[i]!));
    expect(worst).toBeLessThan(1e-9);
  });
});
