import { quantileOfMasked } from "../orientation/quantile";

/** Salarian et al. 2004 parameters as used by an open-source re-implementation (docs/methods.md#shank-gyroscope-events). */
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
 * strides; the IC/FC thresholds scale by the same factor (common practice,
 * docs/methods.md#slow-and-impaired-gait).
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
  // Every sample's tests are evaluated, masked or not, and only then combined: a walk starts with a
  // stretch outside the mask, and a loop that skipped those samples was compiled before it had
  // read or compared a single value, then compiled again when it first did. The mask product is
  // positive exactly when all three samples are masked.
  for (let i = 1; i < n - 1; i++) {
    const v = x[i]!;
    const inside = mask[i - 1]! * mask[i]! * mask[i + 1]! > 0;
    const above = v > threshold;
    const rising = v > x[i - 1]!;
    const notFalling = v >= x[i + 1]!;
    if (inside && above && rising && notFalling) candidates.push(i);
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
 * forward and the stance takes that back as the tibia advances over the planted foot (see
 * docs/methods.md#shank-kinematics-over-a-stride). So between the mid-swings of consecutive
 * strides there is a whole stance of backward rotation (∫ max(−ω, 0) dt), about as much as the
 * forward rotation between them. Two mid-swing candidates without that stance between them are one
 * swing (a hesitant limb's second forward push, or a rebound early in stance, which at very slow
 * cadence lie more than the 0.5 s peak distance from the swing peak): only the taller is kept. Two
 * tests, each with this fraction (half: common practice, stride gaps sit near 1, one-swing gaps near
 * 0): backward rotation below the fraction of the forward rotation between the two candidates, or
 * below the fraction of the median backward rotation of the gaps the first test left (the typical
 * stance).
 */
export const SAME_SWING_BACKWARD_ROTATION_FRACTION = 0.5;

/**
 * Drops mid-swing candidates that share a swing with a taller neighbour (see the constant above).
 * Rotation is integrated on `omegaDegS`; "taller" is read on `heightDegS` (the smoothed copy the
 * peaks were found on, where a brief impact spike cannot outgrow the swing). Candidates with a
 * sample outside `mask` between them (a pause or a gap) are never joined.
 */
export function mergeSwingsWithoutStance(
  peaks: number[],
  heightDegS: ArrayLike<number>,
  omegaDegS: ArrayLike<number>,
  mask: Uint8Array,
  sampleRateHz: number,
): number[] {
  // The three passes below mostly ask for the same pairs (the stances are the gaps the first pass
  // kept, and the second merge walks them again), so each pair's rotation is integrated once.
  // Kept by the pair's end sample, with its start (a pair is asked for again with the same start).
  const known = new Map<number, { from: number; r: { backwardDeg: number; forwardDeg: number } | null }>();
  const rotation = (a: number, b: number): { backwardDeg: number; forwardDeg: number } | null => {
    const hit = known.get(b);
    if (hit !== undefined && hit.from === a) return hit.r;
    const r = rotationBetween(omegaDegS, mask, a, b, sampleRateHz);
    known.set(b, { from: a, r });
    return r;
  };
  const merge = (candidates: number[], sameSwing: (r: { backwardDeg: number; forwardDeg: number }) => boolean): number[] => {
    if (candidates.length < 2) return candidates;
    const kept: number[] = [candidates[0]!];
    for (let k = 1; k < candidates.length; k++) {
      const p = candidates[k]!;
      const last = kept[kept.length - 1]!;
      const r = rotation(last, p);
      if (r !== null && sameSwing(r)) {
        if (heightDegS[p]! > heightDegS[last]!) kept[kept.length - 1] = p;
      } else kept.push(p);
    }
    return kept;
  };
  const f = SAME_SWING_BACKWARD_ROTATION_FRACTION;
  const local = merge(peaks, (r) => r.backwardDeg < f * r.forwardDeg);
  const stances = local
    .slice(1)
    .map((p, k) => rotation(local[k]!, p))
    .filter((r): r is { backwardDeg: number; forwardDeg: number } => r !== null)
    .map((r) => r.backwardDeg)
    .sort((a, b) => a - b);
  if (stances.length === 0) return local;
  const h = stances.length >> 1;
  const typicalDeg = stances.length % 2 ? stances[h]! : (stances[h - 1]! + stances[h]!) / 2;
  return merge(local, (r) => r.backwardDeg < f * typicalDeg);
}

/** Backward (∫ max(−ω, 0)) and forward (∫ max(ω, 0)) rotation over samples [a, b), degrees; null when a sample there is outside the mask. */
function rotationBetween(omegaDegS: ArrayLike<number>, mask: Uint8Array, a: number, b: number, sampleRateHz: number): { backwardDeg: number; forwardDeg: number } | null {
  let backward = 0;
  let forward = 0;
  for (let i = a; i < b; i++) {
    if (!mask[i]) return null;
    const v = omegaDegS[i]!;
    if (v < 0) backward -= v;
    else forward += v;
  }
  return { backwardDeg: backward / sampleRateHz, forwardDeg: forward / sampleRateHz };
}
