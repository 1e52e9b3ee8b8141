import fili from "fili";
import { assertCutoffBelowNyquist, assertInteger, assertPositiveFinite } from "../check";

/** One second-order section, a0 = 1: H(z) = (b0 + b1 z⁻¹ + b2 z⁻²) / (1 + a1 z⁻¹ + a2 z⁻²). */
export interface Biquad {
  b0: number;
  b1: number;
  b2: number;
  a1: number;
  a2: number;
}

export type ButterworthKind = "lowpass" | "highpass";

const cascades = new fili.CalcCascades();

/**
 * Butterworth second-order sections designed by fili (bilinear transform with pre-warping, the
 * same design as SciPy's `butter`, see docs/methods.md#butterworth-and-zero-phase-filtering).
 * `order` is the filter order (even, 2–12).
 */
export function butterworthSections(
  kind: ButterworthKind,
  order: number,
  cutoffHz: number,
  sampleRateHz: number,
): Biquad[] {
  assertInteger(order, "order", 2, 12);
  if (order % 2 !== 0) throw new RangeError(`order must be even (fili builds biquads), got ${order}`);
  assertPositiveFinite(sampleRateHz, "sampleRateHz");
  assertCutoffBelowNyquist(cutoffHz, sampleRateHz, "cutoffHz");
  const design = cascades[kind]({ order: order / 2, characteristic: "butterworth", Fs: sampleRateHz, Fc: cutoffHz });
  return design.map((s) => ({
    b0: s.k * s.b[0],
    b1: s.k * s.b[1],
    b2: s.k * s.b[2],
    a1: s.a[0],
    a2: s.a[1],
  }));
}

/** Multiplies the sections out into one transfer function (b, a), for comparison with `butter`. */
export function sectionsToTransferFunction(sections: readonly Biquad[]): { b: number[]; a: number[] } {
  let b = [1];
  let a = [1];
  for (const s of sections) {
    b = polyMul(b, [s.b0, s.b1, s.b2]);
    a = polyMul(a, [1, s.a1, s.a2]);
  }
  return { b, a };
}

function polyMul(p: number[], q: number[]): number[] {
  const out = new Array<number>(p.length + q.length - 1).fill(0);
  for (let i = 0; i < p.length; i++) {
    for (let j = 0; j < q.length; j++) out[i + j]! += p[i]! * q[j]!;
  }
  return out;
}
