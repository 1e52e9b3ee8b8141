import type { Bout } from "../types";
import { hypot3 } from "./hypot3";

/** Mean |ω| of a leg segment over a 1 s window above which the leg is taken to be walking (°/s). */
export const WALKING_MEAN_GYRO_DEG_S = 15;
export const WALKING_WINDOW_S = 1;
/** Pauses shorter than this are merged into the surrounding bout (s). */
export const BOUT_MERGE_GAP_S = 1;
/** Bouts shorter than this are dropped (s): less than about two strides. */
export const BOUT_MIN_DURATION_S = 2;

/**
 * Walking vs standing from the leg sensors: a sample is "walking" when the centred 1 s moving mean of
 * the gyro magnitude of any leg sensor exceeds WALKING_MEAN_GYRO_DEG_S (common practice: standing
 * sway stays below a few °/s; even very slow gait swings the shank well above 15 °/s on average).
 * The magnitude is independent of how the sensor is mounted. Invalid samples never count as walking.
 */
export function detectWalkingMask(
  legGyro: ReadonlyArray<{ x: ArrayLike<number>; y: ArrayLike<number>; z: ArrayLike<number>; valid: Uint8Array }>,
  sampleRateHz: number,
  length: number,
): Uint8Array {
  const mask = new Uint8Array(length);
  const half = Math.max(1, Math.round((WALKING_WINDOW_S * sampleRateHz) / 2));
  // Prefix sums S[k] of |ω| and of the valid count, kept only for the current window in a ring
  // (S[hi] − S[lo], hi − lo ≤ 2·half + 1): the same sums and differences as full prefix arrays.
  const ring = 2 * half + 2;
  const sumRing = new Float64Array(ring);
  const cntRing = new Int32Array(ring);
  for (const g of legGyro) markWalking(g.x, g.y, g.z, g.valid, length, half, sumRing, cntRing, mask);
  return mask;
}

/**
 * One sensor's share of detectWalkingMask (sets mask[i] = 1 where it walks, leaves the rest), a
 * small function of its own compiled once for every sensor. The ring positions are advanced with
 * the indices instead of taken modulo the ring at every sample (four integer divisions a sample),
 * and every sample's magnitude and test are computed before the validity picks what counts (the
 * same sums: a sum that starts at +0 and adds magnitudes or +0 is unchanged by the +0s), so the loop
 * is not first compiled before it has summed or tested anything when a recording starts invalid.
 */
function markWalking(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  z: ArrayLike<number>,
  valid: Uint8Array,
  length: number,
  half: number,
  sumRing: Float64Array,
  cntRing: Int32Array,
  mask: Uint8Array,
): void {
  const ring = sumRing.length;
  let k = 0;
  let kSlot = 0;
  let loSlot = 0;
  let sum = 0;
  let cnt = 0;
  sumRing[0] = 0;
  cntRing[0] = 0;
  for (let i = 0; i < length; i++) {
    const hi = Math.min(length, i + half + 1);
    while (k < hi) {
      const on = valid[k] === 1;
      const magnitude = hypot3(x[k]!, y[k]!, z[k]!);
      sum += on ? magnitude : 0;
      cnt += on ? 1 : 0;
      k++;
      kSlot = kSlot + 1 === ring ? 0 : kSlot + 1;
      sumRing[kSlot] = sum;
      cntRing[kSlot] = cnt;
    }
    // lo = max(0, i − half): slot 0 up to i = half, then one further each sample.
    if (i > half) loSlot = loSlot + 1 === ring ? 0 : loSlot + 1;
    const c = cnt - cntRing[loSlot]!;
    const mean = (sum - sumRing[loSlot]!) / c;
    const counted = valid[i]! > 0;
    const some = c > 0;
    const busy = mean > WALKING_MEAN_GYRO_DEG_S;
    mask[i] = mask[i]! | (counted && some && busy ? 1 : 0);
  }
}

/** Runs of 1 in a mask as bouts, merging short pauses and dropping short bouts. */
export function maskToBouts(
  mask: Uint8Array,
  sampleRateHz: number,
  mergeGapS = BOUT_MERGE_GAP_S,
  minDurationS = BOUT_MIN_DURATION_S,
): Bout[] {
  const runs: Bout[] = [];
  const n = mask.length;
  let i = 0;
  while (i < n) {
    i = scanWhile(mask, i, false);
    if (i >= n) break;
    const j = scanWhile(mask, i, true);
    const startS = i / sampleRateHz;
    const endS = (j - 1) / sampleRateHz;
    const prev = runs[runs.length - 1];
    if (prev && startS - prev.endS < mergeGapS) prev.endS = endS;
    else runs.push({ startS, endS });
    i = j;
  }
  return runs.filter((b) => b.endS - b.startS >= minDurationS);
}

/**
 * First index ≥ from whose mask value is unset (`set` true) or set (`set` false); mask.length when
 * none. The scans over the samples are this small function, so maskToBouts (a few dozen runs) is not
 * compiled in the middle of one before the code for a run has run.
 */
function scanWhile(mask: Uint8Array, from: number, set: boolean): number {
  const n = mask.length;
  let i = from;
  if (set) while (i < n && mask[i]) i++;
  else while (i < n && !mask[i]) i++;
  return i;
}

/** Sample mask (1 inside any bout) for a list of bouts. */
export function boutsToMask(bouts: readonly Bout[], sampleRateHz: number, length: number): Uint8Array {
  const mask = new Uint8Array(length);
  for (const b of bouts) {
    const from = Math.max(0, Math.ceil(b.startS * sampleRateHz - 1e-9));
    const to = Math.min(length - 1, Math.floor(b.endS * sampleRateHz + 1e-9));
    if (to >= from) mask.fill(1, from, to + 1);
  }
  return mask;
}
