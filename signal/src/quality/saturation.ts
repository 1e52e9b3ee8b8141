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
  const n = x.length;
  let peak = 0;
  for (let i = 0; i < n; i++) peak = Math.max(peak, Math.abs(x[i]!));
  if (peak < floor) return 0;
  const level = peak * (1 - 1e-6);
  let count = 0;
  let run = 0;
  for (let i = 0; i <= n; i++) {
    if (i < n && Math.abs(x[i]!) >= level) run++;
    else {
      if (run >= SATURATION_MIN_RUN) count += run;
      run = 0;
    }
  }
  return count;
}
