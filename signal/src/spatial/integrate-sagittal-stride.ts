import { STANDARD_GRAVITY_M_S2 } from "../io/read-sensor-csv";
import type { SagittalPlaneSignals } from "./sagittal-plane";

/** A vector in the world sagittal plane: forward (direction of travel) and up components. */
export interface PlaneVector {
  forward: number;
  up: number;
}

/** What is known about the sensor at a reset instant. */
export interface ResetState {
  velocity: PlaneVector;
  /** The accelerometer's expected world reading there (gravity for a sensor at rest). */
  specificForce: PlaneVector;
}

export const AT_REST: ResetState = { velocity: { forward: 0, up: 0 }, specificForce: { forward: 0, up: STANDARD_GRAVITY_M_S2 } };

export interface SagittalStride {
  /** Length of the sensor's displacement in the sagittal plane between the two resets (m). */
  strideLengthM: number;
  /** Its forward and upward components (m); the rise is ≈ 0 on level ground. */
  forwardM: number;
  riseM: number;
  /** Orientation disagreement at the second reset between the integrated gyro and the accelerometer (deg). */
  angleDriftDeg: number;
}

const wrapPi = (a: number) => a - 2 * Math.PI * Math.round(a / (2 * Math.PI));

/** Angle of the mean in-plane accelerometer reading over `halfSamples` either side of `centre`. */
function readingAngleRad(p: SagittalPlaneSignals, centre: number, halfSamples: number): number {
  let g1 = 0;
  let g2 = 0;
  const lo = Math.max(0, centre - halfSamples);
  const hi = Math.min(p.acc1MS2.length - 1, centre + halfSamples);
  for (let i = lo; i <= hi; i++) {
    g1 += p.acc1MS2[i]!;
    g2 += p.acc2MS2[i]!;
  }
  return Math.atan2(g2, g1);
}

/**
 * Sagittal-plane strapdown integration between two reset instants (sample indices i0 < i1) at which
 * the sensor's state is known — at rest for a foot in mid-stance (Mariani et al. 2010; Rampp et al.
 * 2015), the pendulum state about the ankle for a shank (Li et al. 2010; shank-pendulum.ts).
 *
 * 1. Orientation: at each reset the in-plane angle is the one that turns the accelerometer's mean
 *    reading into the expected world reading; in between the gyro is integrated, and the difference
 *    between integrated and expected angle at i1 is removed linearly (gyro bias, out-of-plane rotation).
 * 2. Acceleration is rotated to the world plane and gravity subtracted.
 * 3. Velocity starts at the first reset's; its end value is forced to the second's by removing the
 *    difference linearly in time (Mariani et al. 2010), which also cancels a constant acceleration
 *    bias such as gravity leaking through a small constant tilt error.
 * 4. Position is the trapezoidal integral of the corrected velocity. After step 3 a constant tilt
 *    error only rotates the displacement, so its length (returned as the stride length) is insensitive
 *    to it; on level ground length and forward component agree.
 *
 * Forward is where a positive sagittal rotation moves the segment's lower end (up × axis), so no
 * heading or sign convention beyond the signed sagittal axis is needed.
 */
export function integrateSagittalStride(
  plane: SagittalPlaneSignals,
  sampleRateHz: number,
  i0: number,
  i1: number,
  start: ResetState,
  end: ResetState,
  resetHalfWindowSamples: number,
): SagittalStride {
  if (!(sampleRateHz > 0)) throw new RangeError("integrateSagittalStride: sampleRateHz must be positive");
  if (!Number.isInteger(i0) || !Number.isInteger(i1) || i0 < 0 || i1 >= plane.acc1MS2.length || i1 <= i0) {
    throw new RangeError(`integrateSagittalStride: need 0 ≤ i0 < i1 < ${plane.acc1MS2.length}, got ${i0}, ${i1}`);
  }
  const dt = 1 / sampleRateHz;
  const m = i1 - i0;
  const deg = Math.PI / 180;
  const expected = (s: ResetState) => Math.atan2(s.specificForce.up, s.specificForce.forward);
  const theta = new Float64Array(m + 1);
  theta[0] = expected(start) - readingAngleRad(plane, i0, resetHalfWindowSamples);
  for (let k = 1; k <= m; k++) {
    theta[k] = theta[k - 1]! + 0.5 * (plane.omegaDegS[i0 + k - 1]! + plane.omegaDegS[i0 + k]!) * deg * dt;
  }
  const drift = wrapPi(expected(end) - readingAngleRad(plane, i1, resetHalfWindowSamples) - theta[m]!);
  for (let k = 1; k <= m; k++) theta[k]! += (drift * k) / m;

  const vx = new Float64Array(m + 1);
  const vy = new Float64Array(m + 1);
  vx[0] = start.velocity.forward;
  vy[0] = start.velocity.up;
  let prevAx = 0;
  let prevAy = 0;
  for (let k = 0; k <= m; k++) {
    const c = Math.cos(theta[k]!);
    const s = Math.sin(theta[k]!);
    const a1 = plane.acc1MS2[i0 + k]!;
    const a2 = plane.acc2MS2[i0 + k]!;
    const ax = c * a1 - s * a2;
    const ay = s * a1 + c * a2 - STANDARD_GRAVITY_M_S2;
    if (k > 0) {
      vx[k] = vx[k - 1]! + 0.5 * (prevAx + ax) * dt;
      vy[k] = vy[k - 1]! + 0.5 * (prevAy + ay) * dt;
    }
    prevAx = ax;
    prevAy = ay;
  }
  const ex = vx[m]! - end.velocity.forward;
  const ey = vy[m]! - end.velocity.up;
  let px = 0;
  let py = 0;
  for (let k = 1; k <= m; k++) {
    px += 0.5 * (vx[k - 1]! - (ex * (k - 1)) / m + vx[k]! - (ex * k) / m) * dt;
    py += 0.5 * (vy[k - 1]! - (ey * (k - 1)) / m + vy[k]! - (ey * k) / m) * dt;
  }
  return { strideLengthM: Math.hypot(px, py), forwardM: px, riseM: py, angleDriftDeg: drift / deg };
}
