import { quantileOfMasked } from "../orientation/quantile";

/** Salarian et al. 2004 parameters as used by an open-source re-implementation (DOMAIN.md §1.1). */
export const SALARIAN_MS_THRESHOLD_DEG_S = 50;
export const SALARIAN_MIN_PEAK_DISTANCE_S = 0.5;
export const SALARIAN_IC_THRESHOLD_DEG_S = -10;
export const SALARIAN_FC_THRESHOLD_DEG_S = -20;
export const SALARIAN_SEARCH_WINDOW_S = 1.5;
/** The mid-swing peak search runs on ω low-passed at 3 Hz (the re-implementation's choice). */
export const MS_LOW_PASS_HZ = 3;
/**
 * Signal-relative threshold: the mid-swing threshold is the smaller of Salarian's 50 °/s and this
 * fraction of the 99th percentile of walking ω, so very slow gait (peaks of 60–100 °/s) keeps its
 * strides; the IC/FC thresholds scale by the same factor (common practice, DOMAIN.md §1.4).
 */
export const MS_RELATIVE_THRESHOLD = 0.3;
export const MS_THRESHOLD_FLOOR_DEG_S = 5;

export interface Thresholds {
  midSwingDegS: number;
  initialContactDegS: number;
  finalContactDegS: number;
}

export function signalRelativeThresholds(msSignal: ArrayLike<number>, mask: Uint8Array): Thresholds {
  const p99 = quantileOfMasked(msSignal, mask, 0.99) ?? 0;
  const midSwingDegS = Math.max(MS_THRESHOLD_FLOOR_DEG_S, Math.min(SALARIAN_MS_THRESHOLD_DEG_S, MS_RELATIVE_THRESHOLD * p99));
  const scale = midSwingDegS / SALARIAN_MS_THRESHOLD_DEG_S;
  return {
    midSwingDegS,
    initialContactDegS: SALARIAN_IC_THRESHOLD_DEG_S * scale,
    finalContactDegS: SALARIAN_FC_THRESHOLD_DEG_S * scale,
  };
}

/**
 * Local maxima of `x` above `threshold` inside the mask, at least `minDistance` samples apart; taller
 * peaks win (the rule of SciPy's find_peaks `distance`). Returns sorted sample indices.
 */
export function findPeaks(x: ArrayLike<number>, mask: Uint8Array, threshold: number, minDistance: number): number[] {
  const n = x.length;
  const candidates: number[] = [];
  for (let i = 1; i < n - 1; i++) {
    if (!mask[i] || !mask[i - 1] || !mask[i + 1]) continue;
    const v = x[i]!;
    if (v > threshold && v > x[i - 1]! && v >= x[i + 1]!) candidates.push(i);
  }
  candidates.sort((a, b) => x[b]! - x[a]!);
  const taken = new Uint8Array(n);
  const kept: number[] = [];
  for (const c of candidates) {
    if (taken[c]) continue;
    kept.push(c);
    const lo = Math.max(0, c - minDistance + 1);
    const hi = Math.min(n - 1, c + minDistance - 1);
    taken.fill(1, lo, hi + 1);
  }
  return kept.sort((a, b) => a - b);
}

/** True when every sample in [a, b] is inside the mask. */
export function allMasked(mask: Uint8Array, a: number, b: number): boolean {
  for (let i = Math.max(0, a); i <= b && i < mask.length; i++) if (!mask[i]) return false;
  return true;
}

/**
 * Over one stride the shank's sagittal rotation returns to where it started: the swing rotates it
 * forward and the stance takes that back as the tibia advances over the planted foot (DOMAIN.md,
 * shank physics). Two mid-swing candidates with no stance between them — backward rotation
 * (∫ max(−ω, 0) dt over the masked samples) less than this fraction of the session's median between
 * consecutive candidates — belong to one swing (a hesitant limb's second forward bump, which at
 * very slow cadence lies more than the 0.5 s peak distance after the first): only the taller one is
 * kept. Half the typical stance rotation: common practice.
 */
export const SAME_SWING_BACKWARD_ROTATION_FRACTION = 0.5;

/**
 * Drops mid-swing candidates that share a swing with a taller neighbour (see the constant above).
 * Backward rotation is integrated on `omegaDegS`; "taller" is read on `heightDegS` (the smoothed copy
 * the peaks were found on, where a brief impact spike cannot outgrow the swing).
 */
export function mergeSwingsWithoutStance(
  peaks: number[],
  heightDegS: ArrayLike<number>,
  omegaDegS: ArrayLike<number>,
  mask: Uint8Array,
  sampleRateHz: number,
): number[] {
  if (peaks.length < 3) return peaks;
  const backwardDeg = (a: number, b: number): number | null => {
    let sum = 0;
    for (let i = a; i < b; i++) {
      if (!mask[i]) return null; // a pause or gap: different bouts, never merged
      const v = omegaDegS[i]!;
      if (v < 0) sum -= v;
    }
    return sum / sampleRateHz;
  };
  const gaps = peaks.slice(1).map((p, k) => backwardDeg(peaks[k]!, p));
  const typical = quantileOf(gaps.filter((g): g is number => g !== null), 0.5);
  if (typical === null || !(typical > 0)) return peaks;
  const limit = SAME_SWING_BACKWARD_ROTATION_FRACTION * typical;
  const kept: number[] = [peaks[0]!];
  for (let k = 1; k < peaks.length; k++) {
    const p = peaks[k]!;
    const last = kept[kept.length - 1]!;
    const back = backwardDeg(last, p);
    if (back !== null && back < limit) {
      if (heightDegS[p]! > heightDegS[last]!) kept[kept.length - 1] = p;
    } else kept.push(p);
  }
  return kept;
}

function quantileOf(values: number[], q: number): number | null {
  if (values.length === 0) return null;
  const s = [...values].sort((a, b) => a - b);
  const pos = q * (s.length - 1);
  const lo = Math.floor(pos);
  const hi = Math.min(s.length - 1, lo + 1);
  return s[lo]! + (pos - lo) * (s[hi]! - s[lo]!);
}
