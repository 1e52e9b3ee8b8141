import { assertPositiveFinite } from "../check";
import { welchPsd } from "./welch-psd";

export interface DominantFrequencyOptions {
  minHz: number;
  maxHz: number;
  /** Welch segment length in seconds; rounded up to a power of two of samples. Default 20 s. */
  segmentS?: number;
  mask?: ArrayLike<number>;
  minMaskFraction?: number;
}

export interface DominantFrequency {
  frequencyHz: number;
  /** Welch bin of the maximum before interpolation (for comparison with SciPy's argmax). */
  peakBinHz: number;
  /** Peak PSD over the median PSD of the search band: how clearly one rhythm dominates. */
  peakToMedian: number;
  segmentCount: number;
}

/**
 * Frequency of the largest Welch-PSD peak between minHz and maxHz, refined by a parabola through
 * the peak bin and its neighbours (quadratic peak interpolation, common practice; e.g. J. O. Smith,
 * "Spectral Audio Signal Processing", §Quadratic Interpolation of Spectral Peaks:
 * p = ½(α − γ)/(α − 2β + γ) bins).
 * Returns null when no segment qualifies or the band holds no bin.
 */
export function dominantFrequency(
  x: ArrayLike<number>,
  sampleRateHz: number,
  options: DominantFrequencyOptions,
): DominantFrequency | null {
  assertPositiveFinite(sampleRateHz, "sampleRateHz");
  const wanted = Math.max(2, Math.ceil((options.segmentS ?? 20) * sampleRateHz));
  let segmentLength = 2;
  while (segmentLength < wanted) segmentLength *= 2;
  const welch = welchPsd(x, sampleRateHz, {
    segmentLength,
    mask: options.mask,
    minMaskFraction: options.minMaskFraction,
  });
  if (welch.segmentCount === 0) return null;
  const { frequenciesHz: f, psd } = welch;
  let best = -1;
  const inBand: number[] = [];
  for (let k = 1; k < psd.length - 1; k++) {
    if (f[k]! < options.minHz || f[k]! > options.maxHz) continue;
    inBand.push(psd[k]!);
    if (best < 0 || psd[k]! > psd[best]!) best = k;
  }
  if (best < 0) return null;
  const a = psd[best - 1]!;
  const b = psd[best]!;
  const c = psd[best + 1]!;
  const denom = a - 2 * b + c;
  const offset = denom < 0 ? Math.max(-0.5, Math.min(0.5, (0.5 * (a - c)) / denom)) : 0;
  const binHz = sampleRateHz / segmentLength;
  inBand.sort((p, q) => p - q);
  const median = inBand[Math.floor(inBand.length / 2)]!;
  return {
    frequencyHz: f[best]! + offset * binHz,
    peakBinHz: f[best]!,
    peakToMedian: median > 0 ? b / median : Number.POSITIVE_INFINITY,
    segmentCount: welch.segmentCount,
  };
}
