import { assertPositiveFinite } from "../check";

/** Relative tolerance for snapping to 1:1 or 2:1 (issue 3: "within 15 % of it"). */
export const RATIO_SNAP_TOLERANCE = 0.15;

/**
 * Arm swing cycles per stride: armHz / strideHz, reported as exactly 1 or 2 when the measured
 * value is within 15 % of that integer, else the measured value. 1:1 arm swing is typical of
 * comfortable walking and 2:1 of slow walking (Wagenaar & van Emmerik 2000, J Biomech 33:853).
 */
export function frequencyRatio(armHz: number, strideHz: number, tolerance = RATIO_SNAP_TOLERANCE): number {
  assertPositiveFinite(armHz, "armHz");
  assertPositiveFinite(strideHz, "strideHz");
  const measured = armHz / strideHz;
  for (const locked of [1, 2]) {
    if (Math.abs(measured - locked) <= tolerance * locked) return locked;
  }
  return measured;
}
