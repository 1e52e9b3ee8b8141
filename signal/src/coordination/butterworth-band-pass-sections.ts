import { assertCutoffBelowNyquist, assertInteger, assertPositiveFinite } from "../check";

/**
 * One biquad in fili's cascade form: y = b0·w + b1·w₋₁ + b2·w₋₂ with w = k·x − a1·w₋₁ − a2·w₋₂.
 * The same object shape `fili.IirFilter` consumes.
 */
export interface BandPassSection {
  k: number;
  b: [number, number, number];
  a: [number, number];
  a0: number;
  z: [number, number];
}

interface Complex {
  re: number;
  im: number;
}

/**
 * Digital Butterworth band-pass of prototype order N (2N poles, N sections), designed exactly as
 * SciPy's `butter(N, [lowHz, highHz], btype="bandpass", fs=sampleRateHz, output="sos")`: analog
 * prototype poles, pre-warped edges, low-pass→band-pass transform, bilinear transform (SciPy
 * `buttap`, `lp2bp_zpk`, `bilinear_zpk`). fili's own `bandpass` cascade is a chain of resonators
 * at one centre frequency, not a Butterworth band-pass, so only the filtering is left to fili.
 * Each section holds one conjugate pole pair and the zeros at z = ±1; the gain is shared equally.
 * The section order differs from SciPy's `zpk2sos`, which changes results only at rounding level.
 */
export function butterworthBandPassSections(
  order: number,
  lowHz: number,
  highHz: number,
  sampleRateHz: number,
): BandPassSection[] {
  assertInteger(order, "order", 1, 12);
  assertPositiveFinite(sampleRateHz, "sampleRateHz");
  assertPositiveFinite(lowHz, "lowHz");
  assertCutoffBelowNyquist(highHz, sampleRateHz, "highHz");
  if (!(lowHz < highHz)) throw new RangeError(`lowHz (${lowHz}) must be below highHz (${highHz})`);

  // SciPy works on Wn = f/(fs/2) with an internal fs of 2: warped = 4·tan(π·Wn/2) = 4·tan(π f/fs).
  const fsInternal = 2;
  const w1 = 2 * fsInternal * Math.tan((Math.PI * lowHz) / sampleRateHz);
  const w2 = 2 * fsInternal * Math.tan((Math.PI * highHz) / sampleRateHz);
  const bw = w2 - w1;
  const w0sq = w1 * w2;

  const analogPoles: Complex[] = [];
  for (let m = -order + 1; m <= order - 1; m += 2) {
    // buttap: p = −exp(iπm/(2N))
    const theta = (Math.PI * m) / (2 * order);
    const p = { re: -Math.cos(theta), im: -Math.sin(theta) };
    const ps = { re: (p.re * bw) / 2, im: (p.im * bw) / 2 };
    // p_bp = ps ± sqrt(ps² − w0²)
    const root = csqrt({ re: ps.re * ps.re - ps.im * ps.im - w0sq, im: 2 * ps.re * ps.im });
    analogPoles.push({ re: ps.re + root.re, im: ps.im + root.im });
    analogPoles.push({ re: ps.re - root.re, im: ps.im - root.im });
  }

  const fs2 = 2 * fsInternal;
  const digitalPoles = analogPoles.map((p) => cdiv({ re: fs2 + p.re, im: p.im }, { re: fs2 - p.re, im: -p.im }));
  // Gain: k = bw^N · Π(fs2 − z)/Π(fs2 − p) with N analog zeros at 0; Π over conjugate pairs is real.
  let logGain = order * Math.log(bw) + order * Math.log(fs2);
  for (const p of analogPoles) logGain -= Math.log(Math.hypot(fs2 - p.re, -p.im));
  const sectionGain = Math.exp(logGain / order);

  const upper = digitalPoles.filter((p) => p.im > 1e-15).sort((a, b) => a.re - b.re);
  const real = digitalPoles.filter((p) => Math.abs(p.im) <= 1e-15).sort((a, b) => a.re - b.re);
  if (upper.length * 2 + real.length !== 2 * order || real.length % 2 !== 0) {
    throw new RangeError("band-pass pole set is not closed under conjugation");
  }
  const sections: BandPassSection[] = upper.map((p) => ({
    k: sectionGain,
    b: [1, 0, -1],
    a: [-2 * p.re, p.re * p.re + p.im * p.im],
    a0: 1,
    z: [0, 0],
  }));
  for (let i = 0; i < real.length; i += 2) {
    const p = real[i]!;
    const q = real[i + 1]!;
    sections.push({ k: sectionGain, b: [1, 0, -1], a: [-(p.re + q.re), p.re * q.re], a0: 1, z: [0, 0] });
  }
  return sections;
}

/** |H(e^{iω})| of a cascade at frequency fHz, for checks against SciPy's `sosfreqz`. */
export function bandPassMagnitude(sections: readonly BandPassSection[], frequencyHz: number, sampleRateHz: number): number {
  const w = (2 * Math.PI * frequencyHz) / sampleRateHz;
  const z1 = { re: Math.cos(w), im: -Math.sin(w) };
  const z2 = { re: Math.cos(2 * w), im: -Math.sin(2 * w) };
  let mag = 1;
  for (const s of sections) {
    const num = { re: s.b[0] + s.b[1] * z1.re + s.b[2] * z2.re, im: s.b[1] * z1.im + s.b[2] * z2.im };
    const den = { re: 1 + s.a[0] * z1.re + s.a[1] * z2.re, im: s.a[0] * z1.im + s.a[1] * z2.im };
    mag *= (s.k * Math.hypot(num.re, num.im)) / Math.hypot(den.re, den.im);
  }
  return mag;
}

function csqrt(z: Complex): Complex {
  const r = Math.hypot(z.re, z.im);
  const re = Math.sqrt((r + z.re) / 2);
  const im = Math.sqrt(Math.max(0, (r - z.re) / 2));
  return { re, im: z.im < 0 ? -im : im };
}

function cdiv(a: Complex, b: Complex): Complex {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
}
