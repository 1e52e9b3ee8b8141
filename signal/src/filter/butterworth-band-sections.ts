import { assertCutoffBelowNyquist, assertInteger, assertPositiveFinite } from "../check";
import type { Biquad } from "./butterworth-sections";

/**
 * Butterworth band-pass second-order sections (order N per edge, 2N in total, the convention of
 * SciPy's `butter(N, [lo, hi], "band")`): the one band-pass design in signal/, used for the wrist
 * swing axis (N = 2, through `sosFiltFilt3`) and the arm–leg phase (N = 4, `zeroPhaseBandPass`).
 * fili has no true Butterworth band transform (its `bandpass` is a cascade of resonators at one
 * centre frequency), so the standard analog design is done here: prototype poles
 * e^{iπ(2k+N+1)/(2N)}, low-pass → band-pass transform at the pre-warped edges, bilinear transform,
 * unit gain at the centre frequency (all of it in the first section). Each section holds one
 * conjugate pole pair (or two real poles) and the zeros at z = ±1. The section order differs from
 * SciPy's `zpk2sos`, which changes results only at rounding level. Checked against SciPy in the tests.
 */
export function butterworthBandSections(order: number, lowHz: number, highHz: number, sampleRateHz: number): Biquad[] {
  assertInteger(order, "order", 1, 8);
  assertPositiveFinite(sampleRateHz, "sampleRateHz");
  assertPositiveFinite(lowHz, "lowHz");
  assertCutoffBelowNyquist(highHz, sampleRateHz, "highHz");
  if (!(lowHz < highHz)) throw new RangeError(`lowHz (${lowHz}) must be below highHz (${highHz})`);
  const fs2 = 2 * sampleRateHz;
  const w1 = fs2 * Math.tan((Math.PI * lowHz) / sampleRateHz);
  const w2 = fs2 * Math.tan((Math.PI * highHz) / sampleRateHz);
  const bw = w2 - w1;
  const w0sq = w1 * w2;

  const zPoles: Array<[number, number]> = [];
  for (let k = 0; k < order; k++) {
    const theta = (Math.PI * (2 * k + order + 1)) / (2 * order);
    const pr = Math.cos(theta);
    const pi = Math.sin(theta);
    // s = p·bw/2 ± sqrt((p·bw/2)² − w0²)
    const hr = (pr * bw) / 2;
    const hi = (pi * bw) / 2;
    const [sr, si] = complexSqrt(hr * hr - hi * hi - w0sq, 2 * hr * hi);
    for (const [ar, ai] of [
      [hr + sr, hi + si],
      [hr - sr, hi - si],
    ] as const) {
      // z = (2fs + s) / (2fs − s)
      zPoles.push(complexDiv(fs2 + ar, ai, fs2 - ar, -ai));
    }
  }
  const upper = zPoles.filter(([, im]) => im > 1e-12);
  const real = zPoles.filter(([, im]) => Math.abs(im) <= 1e-12).map(([re]) => re).sort((a, b) => a - b);
  const sections: Biquad[] = upper.map(([re, im]) => ({ b0: 1, b1: 0, b2: -1, a1: -2 * re, a2: re * re + im * im }));
  for (let i = 0; i + 1 < real.length; i += 2) {
    sections.push({ b0: 1, b1: 0, b2: -1, a1: -(real[i]! + real[i + 1]!), a2: real[i]! * real[i + 1]! });
  }
  // Unit gain at the digital image of the analog centre frequency √(w1·w2).
  const wd = 2 * Math.atan(Math.sqrt(w0sq) / fs2);
  let gain = 1;
  for (const s of sections) gain *= biquadMagnitude(s, wd);
  const first = sections[0]!;
  sections[0] = { ...first, b0: first.b0 / gain, b1: first.b1 / gain, b2: first.b2 / gain };
  return sections;
}

function biquadMagnitude(s: Biquad, w: number): number {
  const c1 = Math.cos(w);
  const s1 = Math.sin(w);
  const c2 = Math.cos(2 * w);
  const s2 = Math.sin(2 * w);
  const nr = s.b0 + s.b1 * c1 + s.b2 * c2;
  const ni = -s.b1 * s1 - s.b2 * s2;
  const dr = 1 + s.a1 * c1 + s.a2 * c2;
  const di = -s.a1 * s1 - s.a2 * s2;
  return Math.hypot(nr, ni) / Math.hypot(dr, di);
}

function complexSqrt(re: number, im: number): [number, number] {
  const r = Math.hypot(re, im);
  const a = Math.sqrt((r + re) / 2);
  const b = Math.sqrt(Math.max(0, (r - re) / 2));
  return [a, im < 0 ? -b : b];
}

function complexDiv(ar: number, ai: number, br: number, bi: number): [number, number] {
  const d = br * br + bi * bi;
  return [(ar * br + ai * bi) / d, (ai * br - ar * bi) / d];
}
