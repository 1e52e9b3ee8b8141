import { assertPositiveFinite } from "../check";
import { RATIO_SNAP_TOLERANCE } from "./frequency-ratio";
import { welchPsd } from "./welch-psd";

/** The arm's rhythm is searched between these multiples of the stride frequency. */
export const ARM_SEARCH_LOW = 0.4;
export const ARM_SEARCH_HIGH = 2.6;
/** Peak of the rate spectrum (angle PSD × f²) over its band median below this: no rhythm (common practice). */
export const MIN_PEAK_TO_MEDIAN = 5;
/**
 * A peak at 2 × the stride frequency counts as 2:1 only when the angle's amplitude at 1 × is at most
 * this fraction of its amplitude at 2 × (power ratio ≤ 0.25). Common practice: a 1:1 swing whose
 * angle carries a 2nd harmonic of up to 100 % of the fundamental still reads 1:1, and only a swing
 * whose stride-frequency part is at most half its step-frequency part reads 2:1.
 */
export const MAX_ONE_X_AMPLITUDE_FOR_TWO_TO_ONE = 0.5;

export interface ArmRhythm {
  /** 1, 2, or the measured arm-cycles-per-stride value when neither holds. */
  frequencyRatio: number;
  /** Why the ratio is not 1 or 2, when it is not. */
  mode: "1:1" | "2:1" | "mixed" | "other";
  /** Dominant angle-spectrum peak over the stride frequency (refined), for reports. */
  peakRatio: number;
  /** √(P(1×)/P(2×)) of the angle spectrum: the stride-frequency over the step-frequency amplitude. */
  oneOverTwoAmplitude: number;
  peakToMedian: number;
}

/**
 * Frequency ratio of an arm to its paired leg from the arm's sagittal ANGLE spectrum (Welch over
 * steady samples). On the angle, harmonic k keeps its true amplitude; on ω it would be weighted by
 * k, its power by k², so a 1:1 swing with a modest 2nd harmonic could outweigh the fundamental.
 *
 * Rule (thresholds above and in signal/docs/arm-leg-coordination.md):
 * 1. a rhythm must stand out: the largest value of the rate spectrum (angle PSD × f², flat for
 *    sensor noise) in 0.4–2.6 × f_stride must be ≥ 5 × its band median; the angle spectrum's
 *    largest peak in that band, refined by a parabola, is the arm's frequency;
 * 2. peak within 15 % of 1 × → 1;
 * 3. peak within 15 % of 2 × → 2 only if the 1 × amplitude (band power within ±15 % of 1 ×) is at
 *    most half the 2 × amplitude (band power within ±15 % of 2 ×); else the swing mixes both rhythms
 *    and the ratio reported is the power-weighted mean of 1 and 2 (between 1.5 and 1.8), flagged "mixed";
 * 4. anywhere else → the measured peak ratio (an arm that is not locked to the legs).
 * Returns null when no Welch segment qualifies or no rhythm stands out.
 */
export function armRhythm(
  armAngleDeg: ArrayLike<number>,
  sampleRateHz: number,
  strideFrequencyHz: number,
  mask: ArrayLike<number>,
): ArmRhythm | null {
  assertPositiveFinite(sampleRateHz, "sampleRateHz");
  assertPositiveFinite(strideFrequencyHz, "strideFrequencyHz");
  for (const strides of [16, 8]) {
    for (const minMaskFraction of [1, 0.5]) {
      const wanted = Math.ceil((strides / strideFrequencyHz) * sampleRateHz);
      let segmentLength = 2;
      while (segmentLength < wanted) segmentLength *= 2;
      const welch = welchPsd(armAngleDeg, sampleRateHz, { segmentLength, mask, minMaskFraction });
      if (welch.segmentCount === 0) continue;
      const f = welch.frequenciesHz;
      const psd = welch.psd;
      // Presence is judged on the rate spectrum (angle PSD × (2πf)², white for sensor noise, which
      // integrates to a 1/f² angle spectrum that would make any low bin look like a peak).
      let best = -1;
      let bestRate = -1;
      const rates: number[] = [];
      for (let k = 1; k < psd.length - 1; k++) {
        if (f[k]! < ARM_SEARCH_LOW * strideFrequencyHz || f[k]! > ARM_SEARCH_HIGH * strideFrequencyHz) continue;
        const rate = psd[k]! * f[k]! * f[k]!;
        rates.push(rate);
        if (best < 0 || psd[k]! > psd[best]!) best = k;
        if (bestRate < 0 || rate > psd[bestRate]! * f[bestRate]! * f[bestRate]!) bestRate = k;
      }
      if (best < 0) return null;
      rates.sort((x, y) => x - y);
      const median = rates[rates.length >> 1]!;
      const peakToMedian = median > 0 ? (psd[bestRate]! * f[bestRate]! * f[bestRate]!) / median : Number.POSITIVE_INFINITY;
      if (peakToMedian < MIN_PEAK_TO_MEDIAN) return null;
      // Quadratic interpolation of the angle-spectrum peak (common practice).
      const a = psd[best - 1]!;
      const b = psd[best]!;
      const c = psd[best + 1]!;
      const denom = a - 2 * b + c;
      const offset = denom < 0 ? Math.max(-0.5, Math.min(0.5, (0.5 * (a - c)) / denom)) : 0;
      const peakHz = f[best]! + (offset * sampleRateHz) / segmentLength;
      const bandPower = (centre: number): number => {
        let p = 0;
        for (let k = 1; k < psd.length; k++) {
          if (Math.abs(f[k]! / strideFrequencyHz - centre) <= RATIO_SNAP_TOLERANCE * centre) p += psd[k]!;
        }
        return p;
      };
      const p1 = bandPower(1);
      const p2 = bandPower(2);
      const oneOverTwo = p2 > 0 ? Math.sqrt(p1 / p2) : Number.POSITIVE_INFINITY;
      const peakRatio = peakHz / strideFrequencyHz;
      const base = { peakRatio, oneOverTwoAmplitude: oneOverTwo, peakToMedian };
      if (Math.abs(peakRatio - 1) <= RATIO_SNAP_TOLERANCE) return { frequencyRatio: 1, mode: "1:1", ...base };
      if (Math.abs(peakRatio - 2) <= 2 * RATIO_SNAP_TOLERANCE) {
        if (oneOverTwo <= MAX_ONE_X_AMPLITUDE_FOR_TWO_TO_ONE) return { frequencyRatio: 2, mode: "2:1", ...base };
        return { frequencyRatio: (p1 + 2 * p2) / (p1 + p2), mode: "mixed", ...base };
      }
      return { frequencyRatio: peakRatio, mode: "other", ...base };
    }
  }
  return null;
}
