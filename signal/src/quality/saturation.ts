/** A run of at least this many identical samples at a channel's extreme counts as flat-topped. */
export const SATURATION_MIN_RUN = 3;
/** Extremes below these are ordinary movement, not a sensor range (smallest common ranges: ±250 °/s, ±2 g). */
export const SATURATION_FLOOR_GYRO_DEG_S = 245;
export const SATURATION_FLOOR_ACC_M_S2 = 19;

/**
 * Number of samples that sit in flat-topped runs at the channel's largest |value| (the sensor's range
 * was hit and the true signal clipped). Real signals almost never repeat their exact extreme over
 * consecutive samples, a clipped one does.
 */
export function countSaturatedSamples(x: ArrayLike<number>, floor: number): number {
  const peak = peakMagnitude(x);
  if (peak < floor) return 0;
  return samplesInRunsAtLevel(x, peak * (1 - 1e-6));
}

// The two passes are small functions of their own (24 channels a session go through them), and the
// run count does the same arithmetic on every sample whether or not it is at the level (the level
// is met only at a few peaks): a loop compiled before its rarely taken branch had run was compiled
// again when it did, in every call.

/** Largest |x[i]|. */
function peakMagnitude(x: ArrayLike<number>): number {
  const n = x.length;
  let peak = 0;
  for (let i = 0; i < n; i++) peak = Math.max(peak, Math.abs(x[i]!));
  return peak;
}

/** Samples in runs of at least SATURATION_MIN_RUN consecutive |x[i]| ≥ level. */
function samplesInRunsAtLevel(x: ArrayLike<number>, level: number): number {
  const n = x.length;
  let count = 0;
  let run = 0;
  // i = n closes a run that reaches the end.
  for (let i = 0; i <= n; i++) {
    const at = i < n && Math.abs(x[i]!) >= level;
    const closes = !at && run >= SATURATION_MIN_RUN;
    count += closes ? run : 0;
    run = (run + 1) * (at ? 1 : 0);
  }
  return count;
}
