import FFT from "fft.js";
import { assertInteger, assertPositiveFinite } from "../check";

export interface WelchOptions {
  /** Samples per segment; a power of two (fft.js is radix-2/4 only). */
  segmentLength: number;
  /** Samples shared by consecutive segments; default half a segment (SciPy's default). */
  overlap?: number;
  /** Optional 0/1 mask; a segment is used only if the mean of the mask over it ≥ minMaskFraction. */
  mask?: ArrayLike<number>;
  /** Default 1 (every sample of the segment must be in the mask). */
  minMaskFraction?: number;
}

export interface WelchResult {
  frequenciesHz: Float64Array;
  /** One-sided power spectral density, (input unit)²/Hz. */
  psd: Float64Array;
  segmentCount: number;
}

/**
 * Welch's averaged periodogram (Welch 1967, IEEE Trans Audio Electroacoust 15:70), computed like
 * `scipy.signal.welch(x, fs, window="hann", nperseg=L, noverlap=L/2, detrend="constant",
 * scaling="density", average="mean")`: periodic Hann window, mean removed per segment, one-sided
 * density with the interior bins doubled. With a mask, segments failing the mask are skipped
 * (SciPy has no mask; without one the results coincide). segmentCount 0 → psd all zeros.
 */
export function welchPsd(x: ArrayLike<number>, sampleRateHz: number, options: WelchOptions): WelchResult {
  const L = options.segmentLength;
  assertPositiveFinite(sampleRateHz, "sampleRateHz");
  assertInteger(L, "segmentLength", 2);
  if ((L & (L - 1)) !== 0) throw new RangeError(`segmentLength must be a power of two, got ${L}`);
  const overlap = options.overlap ?? L / 2;
  assertInteger(overlap, "overlap", 0, L - 1);
  const step = L - overlap;
  const mask = options.mask;
  if (mask && mask.length !== x.length) throw new RangeError(`mask length ${mask.length} differs from x length ${x.length}`);
  const minFraction = options.minMaskFraction ?? 1;

  const window = new Float64Array(L);
  const windowPower = hannInto(window);
  const bins = L / 2 + 1;
  const psd = new Float64Array(bins);
  const frequenciesHz = new Float64Array(bins);
  for (let k = 0; k < bins; k++) frequenciesHz[k] = (k * sampleRateHz) / L;

  // Prefix sum of the mask gives each segment's coverage in O(1).
  let maskPrefix: Float64Array | null = null;
  if (mask) {
    maskPrefix = new Float64Array(x.length + 1);
    maskPrefixInto(maskPrefix, mask);
  }

  const fft = new FFT(L);
  const segment = new Float64Array(L);
  const out = new Float64Array(2 * L);
  let count = 0;
  for (let start = 0; start + L <= x.length; start += step) {
    if (maskPrefix && (maskPrefix[start + L]! - maskPrefix[start]!) / L < minFraction) continue;
    windowedSegment(segment, x, start, window);
    fft.realTransform(out, segment);
    addPower(psd, out);
    count++;
  }
  if (count > 0) {
    const scale = 1 / (sampleRateHz * windowPower * count);
    for (let k = 0; k < bins; k++) {
      const doubled = k > 0 && k < L / 2 ? 2 : 1;
      psd[k] = psd[k]! * scale * doubled;
    }
  }
  return { frequenciesHz, psd, segmentCount: count };
}

// The per-sample loops are small functions of their own that end in a plain return, so each is
// compiled once rather than welchPsd being compiled in the middle of one and dropped after it.

/** Periodic Hann window into w; returns Σ w². */
function hannInto(w: Float64Array): number {
  const L = w.length;
  let windowPower = 0;
  for (let i = 0; i < L; i++) {
    const v = 0.5 - 0.5 * Math.cos((2 * Math.PI * i) / L);
    w[i] = v;
    windowPower += v * v;
  }
  return windowPower;
}

/** prefix[i + 1] = number of mask[0…i] equal to 1. */
function maskPrefixInto(prefix: Float64Array, mask: ArrayLike<number>): void {
  for (let i = 0; i < mask.length; i++) prefix[i + 1] = prefix[i]! + (mask[i] === 1 ? 1 : 0);
}

/** segment = (x[start…] − their mean) · window, the mean summed in index order. */
function windowedSegment(segment: Float64Array, x: ArrayLike<number>, start: number, window: Float64Array): void {
  const L = segment.length;
  let mean = 0;
  for (let i = 0; i < L; i++) mean += x[start + i]!;
  mean /= L;
  for (let i = 0; i < L; i++) segment[i] = (x[start + i]! - mean) * window[i]!;
}

/** psd[k] += |out_k|² for the one-sided bins (out interleaved). */
function addPower(psd: Float64Array, out: Float64Array): void {
  for (let k = 0; k < psd.length; k++) {
    const re = out[2 * k]!;
    const im = out[2 * k + 1]!;
    psd[k] = psd[k]! + re * re + im * im;
  }
}
