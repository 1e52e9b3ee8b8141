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
  let mean = 0;
  for (let i = 0; i < n; i++) mean += x[i]!;
  mean /= n;
  if (n === 1) return Float64Array.of(0);

  const padLen = Math.min(n - 1, Math.ceil((3 * sampleRateHz) / lowHz));
  const ext = new Float64Array(n + 2 * padLen);
  const first = x[0]! - mean;
  const last = x[n - 1]! - mean;
  for (let i = 0; i < padLen; i++) ext[i] = 2 * first - (x[padLen - i]! - mean);
  for (let i = 0; i < n; i++) ext[padLen + i] = x[i]! - mean;
  for (let i = 0; i < padLen; i++) ext[padLen + n + i] = 2 * last - (x[n - 2 - i]! - mean);

  cascadeFiltFilt(sections, ext);
  return ext.slice(padLen, padLen + n);
}

/**
 * In place, the arithmetic of fili 2.0.3's `IirFilter.filtfilt` on a fresh filter (`runStage` per
 * section, same operation order, so the same numbers) for sections with fili's gain k = 1 (the
 * design puts its gain in the first section's b, and x·1 = x exactly): each biquad's registers start
 * at zero and are NOT cleared between the forward and the backward pass. fili's per-sample calls
 * through coefficient objects cost more than the filter itself on a 30-minute signal.
 */
function cascadeFiltFilt(sections: readonly Biquad[], y: Float64Array): void {
  const count = sections.length;
  const a1 = new Float64Array(count);
  const a2 = new Float64Array(count);
  const b0 = new Float64Array(count);
  const b1 = new Float64Array(count);
  const b2 = new Float64Array(count);
  for (let s = 0; s < count; s++) {
    const c = sections[s]!;
    a1[s] = c.a1;
    a2[s] = c.a2;
    b0[s] = c.b0;
    b1[s] = c.b1;
    b2[s] = c.b2;
  }
  const z0 = new Float64Array(count);
  const z1 = new Float64Array(count);
  const m = y.length;
  const stepAt = (i: number): void => {
    let out = y[i]!;
    for (let s = 0; s < count; s++) {
      const temp = out - a1[s]! * z0[s]! - a2[s]! * z1[s]!;
      out = b0[s]! * temp + b1[s]! * z0[s]! + b2[s]! * z1[s]!;
      z1[s] = z0[s]!;
      z0[s] = temp;
    }
    y[i] = out;
  };
  for (let i = 0; i < m; i++) stepAt(i);
  for (let i = m - 1; i >= 0; i--) stepAt(i);
}
