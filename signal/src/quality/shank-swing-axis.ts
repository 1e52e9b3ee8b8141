import { maskedSums3 } from "../orientation/sagittal-axis";

/**
 * A shank sensor's main rotation should be the swing about the mediolateral axis, which is at right
 * angles to the shank's long axis. When the strap is loose or rotated the gyroscope's largest
 * variance can lie about the long axis instead (the sensor twists round the leg), and events read
 * from that sensor are not trustworthy.
 *
 * Below this angle (degrees) between the principal rotation axis and the long axis the swing axis is
 * called implausible: the rotation is then closer to the long axis than to the plane at right angles
 * to it (half-way between 0° and 90°; common practice).
 */
export const SHANK_SWING_AXIS_MIN_ANGLE_DEG = 45;

export interface ShankSwingAxisCheck {
  plausible: boolean;
  /** Angle between the principal rotation axis and the shank's long axis (0–90°), null without data. */
  angleToLongAxisDeg: number | null;
}

/**
 * The long axis is taken as the mean accelerometer direction over the masked (walking) samples:
 * gravity dominates the mean and the shank swings to either side of vertical over a stride, so the
 * mean lies near its long axis (common practice). `axis` is the principal rotation axis found by
 * the orientation step (a unit vector in the sensor frame).
 */
export function shankSwingAxisCheck(
  accX: ArrayLike<number>,
  accY: ArrayLike<number>,
  accZ: ArrayLike<number>,
  axis: readonly [number, number, number],
  mask: Uint8Array,
): ShankSwingAxisCheck {
  // The masked sums through the loop the sagittal axis uses (same sums, in sample order), compiled
  // once for both.
  const [, x, y, z] = maskedSums3(accX, accY, accZ, mask);
  const norm = Math.hypot(x, y, z);
  const axisNorm = Math.hypot(axis[0], axis[1], axis[2]);
  if (!(norm > 0) || !(axisNorm > 0)) return { plausible: true, angleToLongAxisDeg: null };
  const cos = Math.abs((x * axis[0] + y * axis[1] + z * axis[2]) / (norm * axisNorm));
  const angleToLongAxisDeg = (Math.acos(Math.min(1, cos)) * 180) / Math.PI;
  return { plausible: angleToLongAxisDeg >= SHANK_SWING_AXIS_MIN_ANGLE_DEG, angleToLongAxisDeg };
}
