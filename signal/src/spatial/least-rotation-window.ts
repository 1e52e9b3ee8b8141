/** Rampp et al. 2015 (IEEE TBME 62:1089): mid-stance = centre of the 100 ms of least gyroscope energy. */
export const MID_STANCE_WINDOW_S = 0.1;

/**
 * Centre sample of the `windowSamples`-long window inside [fromIndex, toIndex] with the least summed
 * squared angular rate (all three gyro axes, so out-of-plane motion counts too). Every sample of the
 * window must be valid. Returns -1 when no such window fits.
 */
export function leastRotationWindowCentre(
  gyroX: ArrayLike<number>,
  gyroY: ArrayLike<number>,
  gyroZ: ArrayLike<number>,
  valid: Uint8Array,
  fromIndex: number,
  toIndex: number,
  windowSamples: number,
): number {
  const w = Math.max(1, Math.round(windowSamples));
  const lo = Math.max(0, Math.ceil(fromIndex));
  const hi = Math.min(gyroX.length - 1, Math.floor(toIndex));
  if (hi - lo + 1 < w) return -1;
  let best = -1;
  let bestEnergy = Number.POSITIVE_INFINITY;
  let energy = 0;
  let invalid = 0;
  const e = (i: number) => gyroX[i]! * gyroX[i]! + gyroY[i]! * gyroY[i]! + gyroZ[i]! * gyroZ[i]!;
  for (let i = lo; i <= hi; i++) {
    energy += e(i);
    if (!valid[i]) invalid++;
    if (i - lo >= w) {
      energy -= e(i - w);
      if (!valid[i - w]) invalid--;
    }
    if (i - lo + 1 >= w && invalid === 0 && energy < bestEnergy) {
      bestEnergy = energy;
      best = i - w + 1 + Math.floor(w / 2);
    }
  }
  return best;
}
