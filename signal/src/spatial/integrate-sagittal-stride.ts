import type { SagittalPlaneSignals } from "./sagittal-plane";

/** Standard acceleration of gravity (m/s²), CGPM 1901 / ISO 80000-3. */
export const STANDARD_GRAVITY_M_S2 = 9.80665;

export interface PlaneVelocity {
  /** Forward (m/s, direction of travel) and upward (m/s) components in the sagittal plane. */
  forwardMPerS: number;
  upMPerS: number;
}

export interface SagittalStride {
  /** Forward displacement of the sensor between the two reset instants (m). */
  strideLengthM: number;
  /** Upward displacement between them (m); ≈ 0 on level ground. */
  riseM: number;
  /** Orientation disagreement at the second reset between the integrated gyro and gravity (deg). */
  angleDriftDeg: number;
}

const wrapPi = (a: number) => a - 2 * Math.PI * Math.round(a / (2 * Math.PI));

/** Mean in-plane specific force over `halfSamples` either side of `centre`; its direction is "up". */
function gravityAngleRad(p: SagittalPlaneSignals, centre: number, halfSamples: number): number {
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
 * the sensor's velocity is known — zero for a foot in mid-stance (Mariani et al. 2010; Rampp et al.
 * 2015), the pendulum velocity about the ankle for a shank (Li et al. 2010).
 *
 * 1. Orientation: at each reset the accelerometer (mean over the reset window) is taken as gravity,
 *    which fixes the in-plane angle; in between the gyro is integrated, and the difference between the
 *    integrated angle and gravity's at i1 is removed linearly over the stride (gyro bias, out-of-plane
 *    rotation).
 * 2. Acceleration is rotated to the world plane (x forward, y up) and gravity subtracted.
 * 3. Velocity starts at `v0`; its end value is forced to `v1` by removing the difference linearly in
 *    time (the "de-drifting" of Mariani et al. 2010), which also cancels any constant acceleration
 *    bias, including gravity left over from a small tilt error.
 * 4. Position is the trapezoidal integral of the corrected velocity.
 *
 * Forward is where a positive sagittal rotation moves the segment's lower end (up × axis), so no
 * heading or sign convention beyond the signed sagittal axis is needed.
 */
export function integrateSagittalStride(
  plane: SagittalPlaneSignals,
  sampleRateHz: number,
  i0: number,
  i1: number,
  v0: PlaneVelocity,
  v1: PlaneVelocity,
  resetHalfWindowSamples: number,
): SagittalStride {
  if (!(sampleRateHz > 0)) throw new RangeError("integrateSagittalStride: sampleRateHz must be positive");
  if (!Number.isInteger(i0) || !Number.isInteger(i1) || i0 < 0 || i1 >= plane.acc1MS2.length || i1 <= i0) {
    throw new RangeError(`integrateSagittalStride: need 0 ≤ i0 < i1 < ${plane.acc1MS2.length}, got ${i0}, ${i1}`);
  }
  const dt = 1 / sampleRateHz;
  const m = i1 - i0;
  const deg = Math.PI / 180;
  const theta0 = Math.PI / 2 - gravityAngleRad(plane, i0, resetHalfWindowSamples);
  const theta = new Float64Array(m + 1);
  theta[0] = theta0;
  for (let k = 1; k <= m; k++) {
    theta[k] = theta[k - 1]! + 0.5 * (plane.omegaDegS[i0 + k - 1]! + plane.omegaDegS[i0 + k]!) * deg * dt;
  }
  const theta1 = Math.PI / 2 - gravityAngleRad(plane, i1, resetHalfWindowSamples);
  const drift = wrapPi(theta1 - theta[m]!);
  for (let k = 1; k <= m; k++) theta[k]! += (drift * k) / m;

  const ax = new Float64Array(m + 1);
  const ay = new Float64Array(m + 1);
  for (let k = 0; k <= m; k++) {
    const c = Math.cos(theta[k]!);
    const s = Math.sin(theta[k]!);
    const a1 = plane.acc1MS2[i0 + k]!;
    const a2 = plane.acc2MS2[i0 + k]!;
    ax[k] = c * a1 - s * a2;
    ay[k] = s * a1 + c * a2 - STANDARD_GRAVITY_M_S2;
  }
  const vx = new Float64Array(m + 1);
  const vy = new Float64Array(m + 1);
  vx[0] = v0.forwardMPerS;
  vy[0] = v0.upMPerS;
  for (let k = 1; k <= m; k++) {
    vx[k] = vx[k - 1]! + 0.5 * (ax[k - 1]! + ax[k]!) * dt;
    vy[k] = vy[k - 1]! + 0.5 * (ay[k - 1]! + ay[k]!) * dt;
  }
  const ex = vx[m]! - v1.forwardMPerS;
  const ey = vy[m]! - v1.upMPerS;
  let px = 0;
  let py = 0;
  let prevX = vx[0]!;
  let prevY = vy[0]!;
  for (let k = 1; k <= m; k++) {
    const cx = vx[k]! - (ex * k) / m;
    const cy = vy[k]! - (ey * k) / m;
    px += 0.5 * (prevX + cx) * dt;
    py += 0.5 * (prevY + cy) * dt;
    prevX = cx;
    prevY = cy;
  }
  return { strideLengthM: px, riseM: py, angleDriftDeg: drift / deg };
}
