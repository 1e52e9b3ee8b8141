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

/**
 * Direct form II transposed, each section started at its steady state for a constant input. The
 * backward pass reverses y, runs the same forward loop and reverses back: the same operations on
 * the same values in the same order as a back-to-front loop, with one loop to compile instead of two.
 */
function filterInPlace(sections: readonly Biquad[], y: Float64Array, reverse: boolean): void {
  if (reverse) y.reverse();
  let level = y[0]!;
  for (const s of sections) {
    const gain = (s.b0 + s.b1 + s.b2) / (1 + s.a1 + s.a2);
    const z2 = (s.b2 - s.a2 * gain) * level;
    const z1 = (s.b1 - s.a1 * gain) * level + z2;
    sectionPass(s.b0, s.b1, s.b2, s.a1, s.a2, z1, z2, y);
    level *= gain;
  }
  if (reverse) y.reverse();
}

// The one single-channel loop, a small function of its own: every single-channel filter in the
// pipeline runs through it, so it is compiled once for all callers instead of being recompiled on
// the fly inside each long first call.

function sectionPass(b0: number, b1: number, b2: number, a1: number, a2: number, z1: number, z2: number, y: Float64Array): void {
  const m = y.length;
  for (let i = 0; i < m; i++) {
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

/**
 * Three zero-phase filterings over the same mask in one pass: channel c is x[c] filtered by
 * sections[c] on each run of valid samples, exactly as `lowPassZeroPhaseSegments` (same padding,
 * same initial conditions, same operations in the same order for each channel), with invalid
 * samples copied through. The three recursions are independent, so running them side by side in
 * one loop lets the processor overlap them; each result equals the single-channel one bit for bit.
 * All three cascades must have the same number of sections.
 *
 * `into`, when given, receives the results (three arrays of the channels' length, none of them an
 * input; every sample is written) and is returned: a caller done with an earlier result can lend
 * its arrays rather than have three more 30-minute arrays allocated and paged in.
 */
export function zeroPhaseSegments3(
  x: readonly [ArrayLike<number>, ArrayLike<number>, ArrayLike<number>],
  sections: readonly [readonly Biquad[], readonly Biquad[], readonly Biquad[]],
  valid: Uint8Array,
  into?: [Float64Array, Float64Array, Float64Array],
): [Float64Array, Float64Array, Float64Array] {
  const count = sections[0].length;
  if (sections[1].length !== count || sections[2].length !== count) throw new RangeError("zeroPhaseSegments3: the three cascades differ in length");
  const n = x[0].length;
  if (x[1].length !== n || x[2].length !== n) throw new RangeError("zeroPhaseSegments3: the three channels differ in length");
  if (into && (into.some((o) => o.length !== n || x.includes(o)) || new Set(into).size !== 3)) {
    throw new RangeError("zeroPhaseSegments3: the output arrays must be three distinct arrays of the channels' length, none of them an input");
  }
  const out: [Float64Array, Float64Array, Float64Array] = into ?? [new Float64Array(n), new Float64Array(n), new Float64Array(n)];
  let longest = 0;
  for (let i = 0; i < n; ) {
    const j = runEnd(valid, i);
    if (!valid[i]) for (let c = 0; c < 3; c++) copyInto(out[c]!, i, x[c]!, i, j);
    else longest = Math.max(longest, j - i);
    i = j;
  }
  if (longest === 0) return out;
  const size = longest + 2 * padLength(sections[0], longest);
  const scratch: [Float64Array, Float64Array, Float64Array] = [new Float64Array(size), new Float64Array(size), new Float64Array(size)];
  for (let i = 0; i < n; ) {
    const j = runEnd(valid, i);
    if (valid[i]) sosFiltFiltRange3(sections, x, i, j, scratch, out);
    i = j;
  }
  return out;
}

/**
 * `sosFiltFilt` of three equally long channels through one cascade each, run side by side as in
 * `zeroPhaseSegments3`: each result equals `sosFiltFilt(sections[c], x[c])` bit for bit.
 */
export function sosFiltFilt3(
  sections: readonly [readonly Biquad[], readonly Biquad[], readonly Biquad[]],
  x: readonly [ArrayLike<number>, ArrayLike<number>, ArrayLike<number>],
): [Float64Array, Float64Array, Float64Array] {
  const count = sections[0].length;
  if (sections[1].length !== count || sections[2].length !== count) throw new RangeError("sosFiltFilt3: the three cascades differ in length");
  const n = x[0].length;
  if (x[1].length !== n || x[2].length !== n) throw new RangeError("sosFiltFilt3: the three channels differ in length");
  const out: [Float64Array, Float64Array, Float64Array] = [new Float64Array(n), new Float64Array(n), new Float64Array(n)];
  if (n === 0) return out;
  const size = n + 2 * padLength(sections[0], n);
  sosFiltFiltRange3(sections, x, 0, n, [new Float64Array(size), new Float64Array(size), new Float64Array(size)], out);
  return out;
}

function sosFiltFiltRange3(
  sections: readonly [readonly Biquad[], readonly Biquad[], readonly Biquad[]],
  x: readonly [ArrayLike<number>, ArrayLike<number>, ArrayLike<number>],
  from: number,
  to: number,
  scratch: [Float64Array, Float64Array, Float64Array],
  out: [Float64Array, Float64Array, Float64Array],
): void {
  const n = to - from;
  if (n === 1) {
    for (let c = 0; c < 3; c++) out[c]![from] = x[c]![from]!;
    return;
  }
  const padLen = padLength(sections[0], n);
  const m = n + 2 * padLen;
  const ext = [scratch[0].subarray(0, m), scratch[1].subarray(0, m), scratch[2].subarray(0, m)] as const;
  for (let c = 0; c < 3; c++) {
    const e = ext[c]!;
    const xc = x[c]!;
    const x0 = xc[from]!;
    const xn = xc[to - 1]!;
    for (let i = 0; i < padLen; i++) e[i] = 2 * x0 - xc[from + padLen - i]!;
    copyInto(e, padLen, xc, from, to);
    for (let i = 0; i < padLen; i++) e[padLen + n + i] = 2 * xn - xc[to - 2 - i]!;
  }
  filterInPlace3(sections, ext[0], ext[1], ext[2], false);
  filterInPlace3(sections, ext[0], ext[1], ext[2], true);
  for (let c = 0; c < 3; c++) out[c]!.set(ext[c]!.subarray(padLen, padLen + n), from);
}

/**
 * `filterInPlace` of three channels, section by section, each with its own cascade and state (the
 * backward pass reversed around the forward loop in the same way).
 */
function filterInPlace3(
  sections: readonly [readonly Biquad[], readonly Biquad[], readonly Biquad[]],
  y0: Float64Array,
  y1: Float64Array,
  y2: Float64Array,
  reverse: boolean,
): void {
  if (reverse) {
    y0.reverse();
    y1.reverse();
    y2.reverse();
  }
  const level = [y0[0]!, y1[0]!, y2[0]!];
  // Per channel c: coefficients b0 b1 b2 a1 a2 at 5c…5c + 4, initial state z1 z2 at 15 + 2c, 16 + 2c.
  const state = new Float64Array(21);
  for (let k = 0; k < sections[0].length; k++) {
    for (let c = 0; c < 3; c++) {
      const b = sections[c]![k]!;
      const gain = (b.b0 + b.b1 + b.b2) / (1 + b.a1 + b.a2);
      const z2 = (b.b2 - b.a2 * gain) * level[c]!;
      state[5 * c] = b.b0;
      state[5 * c + 1] = b.b1;
      state[5 * c + 2] = b.b2;
      state[5 * c + 3] = b.a1;
      state[5 * c + 4] = b.a2;
      state[15 + 2 * c] = (b.b1 - b.a1 * gain) * level[c]! + z2;
      state[16 + 2 * c] = z2;
      level[c] = level[c]! * gain;
    }
    sectionPass3(state, y0, y1, y2);
  }
  if (reverse) {
    y0.reverse();
    y1.reverse();
    y2.reverse();
  }
}

/**
 * One section of each of the three cascades over the whole of y0, y1, y2, in place. The one
 * three-channel loop, a small function of its own: every three-channel filter in the pipeline runs
 * through it, so it is compiled once for all callers. Coefficients come as numbers in `state` (see
 * filterInPlace3), not as section objects: sections from the two designs (low/high-pass and
 * band-pass) are objects of different shapes, and reading them in the loop made the compiled loop
 * start over whenever the other kind came along.
 */
function sectionPass3(state: Float64Array, y0: Float64Array, y1: Float64Array, y2: Float64Array): void {
  const pb0 = state[0]!, pb1 = state[1]!, pb2 = state[2]!, pa1 = state[3]!, pa2 = state[4]!;
  const qb0 = state[5]!, qb1 = state[6]!, qb2 = state[7]!, qa1 = state[8]!, qa2 = state[9]!;
  const rb0 = state[10]!, rb1 = state[11]!, rb2 = state[12]!, ra1 = state[13]!, ra2 = state[14]!;
  let p1 = state[15]!, p2 = state[16]!, q1 = state[17]!, q2 = state[18]!, r1 = state[19]!, r2 = state[20]!;
  const m = y0.length;
  for (let i = 0; i < m; i++) {
    const u = y0[i]!;
    const v = y1[i]!;
    const w = y2[i]!;
    const yu = pb0 * u + p1;
    const yv = qb0 * v + q1;
    const yw = rb0 * w + r1;
    p1 = pb1 * u - pa1 * yu + p2;
    q1 = qb1 * v - qa1 * yv + q2;
    r1 = rb1 * w - ra1 * yw + r2;
    p2 = pb2 * u - pa2 * yu;
    q2 = qb2 * v - qa2 * yv;
    r2 = rb2 * w - ra2 * yw;
    y0[i] = yu;
    y1[i] = yv;
    y2[i] = yw;
  }
}
