import { detectInvertedFoot, detectInvertedShank } from "../orientation/detect-inverted-segment";
import { projectOnAxis, sagittalAxis } from "../orientation/sagittal-axis";

/**
 * The sagittal axis of a shank or foot sensor, signed so that a positive rotation moves the segment's
 * lower end forward (mid-swing positive): the gyro's first principal component while walking
 * (orientation/sagittal-axis.ts), negated when the inversion check finds the swing rotation negative
 * (orientation/detect-inverted-segment.ts). The same two steps the event detection uses, for a sensor
 * whose events were not needed (a foot worn together with a shank). Null when too few samples.
 */
export function signedSagittalAxis(
  gyroX: ArrayLike<number>,
  gyroY: ArrayLike<number>,
  gyroZ: ArrayLike<number>,
  walkingMask: Uint8Array,
  segment: "shank" | "foot",
): [number, number, number] | null {
  const found = sagittalAxis(gyroX, gyroY, gyroZ, walkingMask);
  if (!found) return null;
  const omega = projectOnAxis(gyroX, gyroY, gyroZ, found.axis);
  const inverted = segment === "foot" ? detectInvertedFoot(omega, walkingMask).inverted : detectInvertedShank(omega, walkingMask).inverted;
  const s = inverted ? -1 : 1;
  return [found.axis[0] * s, found.axis[1] * s, found.axis[2] * s];
}
