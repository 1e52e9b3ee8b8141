import { butterworthBandSections } from "../filter/butterworth-band-sections";
import type { Biquad } from "../filter/butterworth-sections";

/** Band edges as multiples of the fundamental (issue 3: 0.7–1.3 × the segment's own fundamental). */
export const BAND_LOW_FACTOR = 0.7;
export const BAND_HIGH_FACTOR = 1.3;
/** Prototype order N in SciPy's sense: `butter(4, [lo, hi], "bandpass")`, 8 poles per pass. */
export const BAND_PASS_ORDER = 4;

/**
 * Zero-phase Butterworth band-pass around a fundamental: edges 0.7·f₀ and 1.3·f₀, order 4 (SciPy
 * convention; the design is `filter/butterworth-band-sections.ts`), run forward and backward as
 * fili's `IirFilter.filtfilt` does, so the magnitude is squared and the phase is zero — which the
 * Hilbert phase downstream relies on.
 *
 * Edge policy (differs from SciPy's `sosfiltfilt`, so compare away from the ends): the mean is
 * removed, the signal is extended at both ends by an odd reflection of 3 periods of the lower
 * edge (at most n − 1 samples), and both passes start from zero state. Away from the extensions
 * the result converges to `sosfiltfilt(butter(4, [lo, hi], "bandpass", output="sos"), x)`: the
 * difference decays with a time constant of about two cycles of f₀ (< 1e-3 of the tone after 16
 * cycles, see the test). Callers only use samples well inside walking bouts.
 */
export function bandPassAroundFundamental(
  x: ArrayLike<number>,
  sampleRateHz: number,
  fundamentalHz: number,
): Float64Array {
  return zeroPhaseBandPass(x, sampleRateHz, BAND_LOW_FACTOR * fundamentalHz, BAND_HIGH_FACTOR * fundamentalHz);
}

/** Zero-phase Butterworth band-pass between explicit edges; see `bandPassAroundFundamental`. */
export function zeroPhaseBandPass(
  x: ArrayLike<number>,
  sampleRateHz: number,
  lowHz: number,
  highHz: number,
  order = BAND_PASS_ORDER,
): Float64Array {
  const sections = butterworthBandSections(order, lowHz, highHz, sampleRateHz);
  const n = x.length;
  if (n === 0) return new Float64Array(0);
  const mean = sumOf(x) / n;
  if (n === 1) return Float64Array.of(0);

  const padLen = Math.min(n - 1, Math.ceil((3 * sampleRateHz) / lowHz));
  const ext = new Float64Array(n + 2 * padLen);
  const first = x[0]! - mean;
  const last = x[n - 1]! - mean;
  for (let i = 0; i < padLen; i++) ext[i] = 2 * first - (x[padLen - i]! - mean);
  centredInto(ext, padLen, x, mean);
  for (let i = 0; i < padLen; i++) ext[padLen + n + i] = 2 * last - (x[n - 2 - i]! - mean);

  cascadeFiltFilt(sections, ext);
  return ext.slice(padLen, padLen + n);
}

// The sample loops are small functions of their own that end in a plain return: called a few times
// per session, each is compiled once, instead of the caller being compiled mid-loop and dropped
// again when the code after that loop first runs.

/** x[0] + x[1] + … in index order. */
function sumOf(x: ArrayLike<number>): number {
  let sum = 0;
  for (let i = 0; i < x.length; i++) sum += x[i]!;
  return sum;
}

/** out[at + i] = x[i] − mean. */
function centredInto(out: Float64Array, at: number, x: ArrayLike<number>, mean: number): void {
  for (let i = 0; i < x.length; i++) out[at + i] = x[i]! - mean;
}

/**
 * In place, the arithmetic of fili 2.0.3's `IirFilter.filtfilt` on a fresh filter (`runStage` per
 * section, same operation order, so the same numbers) for sections with fili's gain k = 1 (the
 * design puts its gain in the first section's b, and x·1 = x exactly): each biquad's registers start
 * at zero and are NOT cleared between the forward and the backward pass. fili's per-sample calls
 * through coefficient objects cost more than the filter itself on a 30-minute signal.
 *
 * fili runs every section on one sample before the next sample; here each section runs over the
 * whole signal before the next section. Each value is the same expression of the same operands
 * either way (a section's output at sample i depends only on its input at i and its own
 * registers), so the results are equal bit for bit. The backward pass reverses the signal around
 * the same forward loop, each section starting from the registers its forward pass ended with.
 */
function cascadeFiltFilt(sections: readonly Biquad[], y: Float64Array): void {
  const count = sections.length;
  // Registers (z0, z1) of section s at 2s, 2s + 1.
  const registers = new Float64Array(2 * count);
  for (let s = 0; s < count; s++) {
    const c = sections[s]!;
    directFormTwoPass(y, c.b0, c.b1, c.b2, c.a1, c.a2, registers, 2 * s);
  }
  y.reverse();
  for (let s = 0; s < count; s++) {
    const c = sections[s]!;
    directFormTwoPass(y, c.b0, c.b1, c.b2, c.a1, c.a2, registers, 2 * s);
  }
  y.reverse();
}

/** One biquad (direct form II, fili's `runStage`) over y in place, registers read from and left in z[at], z[at + 1]. */
function directFormTwoPass(y: Float64Array, b0: number, b1: number, b2: number, a1: number, a2: number, z: Float64Array, at: number): void {
  let z0 = z[at]!;
  let z1 = z[at + 1]!;
  const m = y.length;
  for (let i = 0; i < m; i++) {
    const temp = y[i]! - a1 * z0 - a2 * z1;
    y[i] = b0 * temp + b1 * z0 + b2 * z1;
    z1 = z0;
    z0 = temp;
  }
  z[at] = z0;
  z[at + 1] = z1;
}
