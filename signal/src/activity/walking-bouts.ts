import type { Bout } from "../types";

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
  const sum = new Float64Array(length + 1);
  const cnt = new Float64Array(length + 1);
  for (const g of legGyro) {
    for (let i = 0; i < length; i++) {
      const ok = g.valid[i] === 1;
      sum[i + 1] = sum[i]! + (ok ? Math.hypot(g.x[i]!, g.y[i]!, g.z[i]!) : 0);
      cnt[i + 1] = cnt[i]! + (ok ? 1 : 0);
    }
    for (let i = 0; i < length; i++) {
      if (!g.valid[i]) continue;
      const lo = Math.max(0, i - half);
      const hi = Math.min(length, i + half + 1);
      const c = cnt[hi]! - cnt[lo]!;
      if (c > 0 && (sum[hi]! - sum[lo]!) / c > WALKING_MEAN_GYRO_DEG_S) mask[i] = 1;
    }
  }
  return mask;
}

/** Runs of 1 in a mask as bouts, merging short pauses and dropping short bouts. */
export function maskToBouts(
  mask: Uint8Array,
  sampleRateHz: number,
  mergeGapS = BOUT_MERGE_GAP_S,
  minDurationS = BOUT_MIN_DURATION_S,
): Bout[] {
  const runs: Bout[] = [];
  let i = 0;
  const n = mask.length;
  while (i < n) {
    if (!mask[i]) {
      i++;
      continue;
    }
    let j = i;
    while (j < n && mask[j]) j++;
    const startS = i / sampleRateHz;
    const endS = (j - 1) / sampleRateHz;
    const prev = runs[runs.length - 1];
    if (prev && startS - prev.endS < mergeGapS) prev.endS = endS;
    else runs.push({ startS, endS });
    i = j;
  }
  return runs.filter((b) => b.endS - b.startS >= minDurationS);
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
