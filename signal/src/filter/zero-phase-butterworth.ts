import { butterworthBandSections } from "./butterworth-band-sections";
import { type Biquad, butterworthSections } from "./butterworth-sections";

/**
 * Forward–backward filtering of a cascade of biquads, equivalent to SciPy's `sosfiltfilt` with its
 * defaults: odd extension of padlen = 3·(2·sections + 1) samples at each end and steady-state
 * initial conditions (`sosfilt_zi`) scaled by the first sample of each pass. Zero phase, squared
 * magnitude (a Butterworth of order N becomes −6.02 dB at the cut-off). Input must be finite;
 * callers filter each valid segment separately.
 */
export function sosFiltFilt(sections: readonly Biquad[], x: ArrayLike<number>): Float64Array {
  const n = x.length;
  const out = new Float64Array(n);
  if (n === 0) return out;
  sosFiltFiltRange(sections, x, 0, n, new Float64Array(n + 2 * padLength(sections, n)), out);
  return out;
}

function padLength(sections: readonly Biquad[], n: number): number {
  return Math.max(0, Math.min(3 * (2 * sections.length + 1), n - 1));
}

/**
 * sosFiltFilt of x[from, to) written to out[from, to), with `scratch` (≥ to − from + 2·padLength
 * samples) as the work buffer: the same arithmetic as sosFiltFilt, without allocating.
 */
function sosFiltFiltRange(
  sections: readonly Biquad[],
  x: ArrayLike<number>,
  from: number,
  to: number,
  scratch: Float64Array,
  out: Float64Array,
): void {
  const n = to - from;
  if (n === 1) {
    out[from] = x[from]!;
    return;
  }
  const padLen = padLength(sections, n);
  const m = n + 2 * padLen;
  const ext = scratch.subarray(0, m);
  const x0 = x[from]!;
  const xn = x[to - 1]!;
  for (let i = 0; i < padLen; i++) ext[i] = 2 * x0 - x[from + padLen - i]!;
  copyInto(ext, padLen, x, from, to);
  for (let i = 0; i < padLen; i++) ext[padLen + n + i] = 2 * xn - x[to - 2 - i]!;

  filterInPlace(sections, ext, false);
  filterInPlace(sections, ext, true);
  out.set(ext.subarray(padLen, padLen + n), from);
}

/**
 * dst[at…] = src[from, to). Typed sources go through the native `set` (Float32 → Float64 is exact,
 * so the values are the same); an element loop over `ArrayLike` sees several array kinds across the
 * pipeline and its indexed load becomes the slow generic one on every 30-minute channel.
 */
function copyInto(dst: Float64Array, at: number, src: ArrayLike<number>, from: number, to: number): void {
  if (src instanceof Float64Array || src instanceof Float32Array) dst.set(src.subarray(from, to), at);
  else for (let i = from; i < to; i++) dst[at + i - from] = src[i]!;
}

/** Direct form II transposed, each section started at its steady state for a constant input. */
function filterInPlace(sections: readonly Biquad[], y: Float64Array, reverse: boolean): void {
  const m = y.length;
  let level = reverse ? y[m - 1]! : y[0]!;
  for (const s of sections) {
    const gain = (s.b0 + s.b1 + s.b2) / (1 + s.a1 + s.a2);
    const z2 = (s.b2 - s.a2 * gain) * level;
    const z1 = (s.b1 - s.a1 * gain) * level + z2;
    if (!reverse) sectionForward(s.b0, s.b1, s.b2, s.a1, s.a2, z1, z2, y);
    else sectionBackward(s.b0, s.b1, s.b2, s.a1, s.a2, z1, z2, y);
    level *= gain;
  }
}

// One loop per direction, each its own small function: every filter in the pipeline runs through
// these two, so they are compiled once for all callers instead of being recompiled on the fly (and
// dropped again when the other direction's branch is first reached) inside each long first call.

function sectionForward(b0: number, b1: number, b2: number, a1: number, a2: number, z1: number, z2: number, y: Float64Array): void {
  const m = y.length;
  for (let i = 0; i < m; i++) {
    const xi = y[i]!;
    const yi = b0 * xi + z1;
    z1 = b1 * xi - a1 * yi + z2;
    z2 = b2 * xi - a2 * yi;
    y[i] = yi;
  }
}

function sectionBackward(b0: number, b1: number, b2: number, a1: number, a2: number, z1: number, z2: number, y: Float64Array): void {
  for (let i = y.length - 1; i >= 0; i--) {
    const xi = y[i]!;
    const yi = b0 * xi + z1;
    z1 = b1 * xi - a1 * yi + z2;
    z2 = b2 * xi - a2 * yi;
    y[i] = yi;
  }
}

/** Zero-phase Butterworth low-pass (order N per pass, even). */
export function lowPassZeroPhase(
  x: ArrayLike<number>,
  sampleRateHz: number,
  cutoffHz: number,
  order = 4,
): Float64Array {
  return sosFiltFilt(butterworthSections("lowpass", order, cutoffHz, sampleRateHz), x);
}

/**
 * Zero-phase Butterworth band-pass: `order` per edge (2·order poles, SciPy's `butter(order, [lo, hi],
 * "band")` convention), applied forward and backward, so the pass-band edges are at −6.02 dB.
 */
export function bandPassZeroPhase(
  x: ArrayLike<number>,
  sampleRateHz: number,
  lowHz: number,
  highHz: number,
  order = 2,
): Float64Array {
  return sosFiltFilt(butterworthBandSections(order, lowHz, highHz, sampleRateHz), x);
}

/**
 * Low-pass of a signal with invalid stretches: each run of valid samples (mask 1) is filtered on
 * its own; invalid samples are copied through unchanged (callers ignore them).
 */
export function lowPassZeroPhaseSegments(
  x: ArrayLike<number>,
  valid: Uint8Array,
  sampleRateHz: number,
  cutoffHz: number,
  order = 4,
): Float64Array {
  const sections = butterworthSections("lowpass", order, cutoffHz, sampleRateHz);
  const n = x.length;
  const out = new Float64Array(n);
  // One work buffer sized for the longest run serves every run. The runs are found by runEnd (a
  // small function of its own, so this one holds no long sample loop to be compiled in the middle of).
  let longest = 0;
  for (let i = 0; i < n; ) {
    const j = runEnd(valid, i);
    if (!valid[i]) copyInto(out, i, x, i, j);
    else longest = Math.max(longest, j - i);
    i = j;
  }
  if (longest === 0) return out;
  const scratch = new Float64Array(longest + 2 * padLength(sections, longest));
  for (let i = 0; i < n; ) {
    const j = runEnd(valid, i);
    if (valid[i]) sosFiltFiltRange(sections, x, i, j, scratch, out);
    i = j;
  }
  return out;
}

/** End (exclusive) of the run of equal mask values (valid vs not) that starts at i. */
function runEnd(valid: Uint8Array, i: number): number {
  const on = valid[i] ? 1 : 0;
  let j = i + 1;
  while (j < valid.length && (valid[j] ? 1 : 0) === on) j++;
  return j;
}
