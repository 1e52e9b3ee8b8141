import type { SagittalPlaneSignals } from "./sagittal-plane";

/** Fewer mid-stance windows than this give no fit; common practice. */
export const MIN_FIT_WINDOWS = 10;
/** Largest accepted jackknife standard error of the fitted distance (m): about a strap's width; common practice. */
export const MAX_FIT_STANDARD_ERROR_M = 0.02;
/**
 * Largest accepted angle (deg) between the fitted ankle-to-sensor direction and the mean mid-stance
 * accelerometer reading (≈ up, since the stance shank is near vertical): a fit pointing elsewhere has
 * put the pivot beside or above the sensor, which a shank cannot do; common practice.
 */
export const MAX_FIT_AXIS_ANGLE_DEG = 45;

export interface AnkleToSensorFit {
  /** Fitted distance from the pivot (ankle) to the sensor (m); null when not computable at all. */
  distanceM: number | null;
  /** Jackknife (leave one window out) standard error of distanceM (m). */
  standardErrorM: number | null;
  /** Angle (deg) between the fitted pivot-to-sensor direction and the mean mid-stance reading. */
  axisAngleDeg: number | null;
  /**
   * The normal matrix's eigenvalue (m⁻²·(m/s)²·s², summed over windows): how much the rotation excited
   * the fit. The matrix is always a multiple of the identity (each window's regressor is a turned and
   * scaled copy of ρ), so the two offset components are equally well determined and the conditioning
   * question is only how large this is against the noise, which the standard error answers.
   */
  excitation: number | null;
  /** Windows that entered the fit. */
  windowCount: number;
  /** True when every safeguard passed and distanceM is within the bounds. */
  accepted: boolean;
  /** Why the fit was not accepted; null when accepted. */
  reason: string | null;
}

/**
 * Least-squares distance r from a fixed pivot to the sensor, from windows in which the segment turns
 * about that pivot in the sagittal plane (a stance shank about the ankle while the foot is flat;
 * Li et al. 2010, J Biomech 43:1640, model the stance shank that way). Rigid-body kinematics: the
 * sensor's velocity is ω × ρ, ρ = the pivot-to-sensor vector, constant in the sensor frame. Within a
 * window, with the frame held at its first sample and Δθ(t) = ∫ω (gyro), the accelerometer turned into
 * that frame, R(Δθ)·f, integrates to
 *
 *   ∫ R(Δθ)·f dt = G·τ + ω(t)·R(Δθ(t))·ρ⊥ − ω(0)·ρ⊥,   τ = time since the window's start,
 *
 * where G is the gravity reading in that frame (unknown, one per window: the shank's absolute angle is
 * not known) and ρ⊥ = ρ turned by +90°. Differentiated this is the familiar a = α × ρ − ω²ρ + g, but
 * the integrated form needs no derivative of the gyro (noise in a differentiated regressor would bias
 * r towards zero) and keeps the pivot's zero velocity at the window's start as a constraint. It is
 * linear in G (per window, eliminated by projection) and ρ = (p, q) (shared), so r = |ρ| comes from
 * one 2×2 solve; leaving G free per window (magnitude too) means an accelerometer scale or offset
 * error cannot pose as the centripetal term, at the price of using only the change of the rotation
 * within each window. The pivot's direction is fitted too, so the sensor's mounting angle does not
 * matter. Safeguards (constants above): enough windows, a non-singular normal matrix and a small
 * jackknife standard error (together: enough rotation in mid-stance for the noise present), the pivot
 * below the sensor, and r inside [minM, maxM].
 *
 * `windows` are inclusive sample-index ranges [start, end] with every sample valid.
 */
export function fitAnkleToSensorDistance(
  plane: SagittalPlaneSignals,
  sampleRateHz: number,
  windows: ReadonlyArray<readonly [number, number]>,
  bounds: { minM: number; maxM: number },
): AnkleToSensorFit {
  if (!(sampleRateHz > 0)) throw new RangeError("fitAnkleToSensorDistance: sampleRateHz must be positive");
  const dt = 1 / sampleRateHz;
  const deg = Math.PI / 180;
  const n = plane.omegaDegS.length;
  // Per window: its 2×2 normal matrix [a11 a12; a12 a22] and right-hand side [b1 b2], after G is projected out.
  const parts: Array<[number, number, number, number, number]> = [];
  let meanF1 = 0;
  let meanF2 = 0;
  for (const [start, end] of windows) {
    if (!Number.isInteger(start) || !Number.isInteger(end) || start < 0 || end >= n || end - start < 3) continue;
    const m = end - start + 1;
    const tau = new Float64Array(m);
    const jpx = new Float64Array(m);
    const jqx = new Float64Array(m);
    const jpy = new Float64Array(m);
    const jqy = new Float64Array(m);
    const yx = new Float64Array(m);
    const yy = new Float64Array(m);
    const w0 = plane.omegaDegS[start]! * deg;
    let dTheta = 0;
    let prevWx = plane.acc1MS2[start]!;
    let prevWy = plane.acc2MS2[start]!;
    for (let k = 0; k < m; k++) {
      const i = start + k;
      const w = plane.omegaDegS[i]! * deg;
      if (k > 0) dTheta += 0.5 * (plane.omegaDegS[i - 1]! + plane.omegaDegS[i]!) * deg * dt;
      const c = Math.cos(dTheta);
      const s = Math.sin(dTheta);
      const f1 = plane.acc1MS2[i]!;
      const f2 = plane.acc2MS2[i]!;
      meanF1 += f1;
      meanF2 += f2;
      // Accelerometer in the window's first frame: world = R(Δθ)·sensor (see integrateSagittalStride).
      const wx = c * f1 - s * f2;
      const wy = s * f1 + c * f2;
      if (k > 0) {
        yx[k] = yx[k - 1]! + 0.5 * (prevWx + wx) * dt;
        yy[k] = yy[k - 1]! + 0.5 * (prevWy + wy) * dt;
      }
      prevWx = wx;
      prevWy = wy;
      tau[k] = k * dt;
      // ω·R(Δθ)·(−q, p) − ω0·(−q, p), split into its p and q coefficients.
      jpx[k] = -w * s;
      jqx[k] = -w * c + w0;
      jpy[k] = w * c - w0;
      jqy[k] = -w * s;
    }
    // Eliminate G: remove from every column its projection on τ (one G component per equation).
    let tt = 0;
    for (let k = 0; k < m; k++) tt += tau[k]! * tau[k]!;
    const project = (z: Float64Array) => {
      let tz = 0;
      for (let k = 0; k < m; k++) tz += tau[k]! * z[k]!;
      const g = tz / tt;
      for (let k = 0; k < m; k++) z[k]! -= g * tau[k]!;
    };
    for (const z of [jpx, jqx, jpy, jqy, yx, yy]) project(z);
    let a11 = 0;
    let a12 = 0;
    let a22 = 0;
    let b1 = 0;
    let b2 = 0;
    for (let k = 0; k < m; k++) {
      a11 += jpx[k]! * jpx[k]! + jpy[k]! * jpy[k]!;
      a12 += jpx[k]! * jqx[k]! + jpy[k]! * jqy[k]!;
      a22 += jqx[k]! * jqx[k]! + jqy[k]! * jqy[k]!;
      b1 += jpx[k]! * yx[k]! + jpy[k]! * yy[k]!;
      b2 += jqx[k]! * yx[k]! + jqy[k]! * yy[k]!;
    }
    parts.push([a11, a12, a22, b1, b2]);
  }

  const count = parts.length;
  const none = (reason: string): AnkleToSensorFit => ({
    distanceM: null,
    standardErrorM: null,
    axisAngleDeg: null,
    excitation: null,
    windowCount: count,
    accepted: false,
    reason,
  });
  if (count < MIN_FIT_WINDOWS) return none(`only ${count} mid-stance windows (at least ${MIN_FIT_WINDOWS} needed)`);

  const total = [0, 0, 0, 0, 0];
  for (const p of parts) for (let j = 0; j < 5; j++) total[j]! += p[j]!;
  const solve = (a11: number, a12: number, a22: number, b1: number, b2: number): [number, number] | null => {
    const det = a11 * a22 - a12 * a12;
    if (!(Math.abs(det) > 0) || !Number.isFinite(det)) return null;
    return [(a22 * b1 - a12 * b2) / det, (a11 * b2 - a12 * b1) / det];
  };
  const [t11, t12, t22, tb1, tb2] = total as [number, number, number, number, number];
  const rho = solve(t11, t12, t22, tb1, tb2);
  const excitation = (t11 + t22) / 2;
  if (!rho || !(excitation > 0)) return { ...none("the mid-stance rotation does not excite the fit (singular normal matrix)"), excitation };
  const distanceM = Math.hypot(rho[0], rho[1]);

  // Jackknife over windows: strides are the independent units (samples within a window are not).
  const loo: number[] = [];
  for (const p of parts) {
    const s = solve(t11 - p[0], t12 - p[1], t22 - p[2], tb1 - p[3], tb2 - p[4]);
    if (s) loo.push(Math.hypot(s[0], s[1]));
  }
  let standardErrorM = Number.POSITIVE_INFINITY;
  if (loo.length === count) {
    const mean = loo.reduce((a, b) => a + b, 0) / count;
    standardErrorM = Math.sqrt(((count - 1) / count) * loo.reduce((a, b) => a + (b - mean) ** 2, 0));
  }
  const cosAngle = (rho[0] * meanF1 + rho[1] * meanF2) / (distanceM * Math.hypot(meanF1, meanF2));
  const axisAngleDeg = Math.acos(Math.max(-1, Math.min(1, cosAngle))) / deg;

  const result = { distanceM, standardErrorM, axisAngleDeg, excitation, windowCount: count };
  const reject = (reason: string): AnkleToSensorFit => ({ ...result, accepted: false, reason });
  if (!(standardErrorM <= MAX_FIT_STANDARD_ERROR_M)) {
    return reject(`fitted distance too uncertain (standard error ${(standardErrorM * 100).toFixed(1)} cm > ${MAX_FIT_STANDARD_ERROR_M * 100} cm)`);
  }
  if (!(axisAngleDeg <= MAX_FIT_AXIS_ANGLE_DEG)) return reject(`fitted pivot not below the sensor (${axisAngleDeg.toFixed(0)}° off the shank's mid-stance vertical)`);
  if (!(distanceM >= bounds.minM && distanceM <= bounds.maxM)) {
    return reject(`fitted distance ${(distanceM * 100).toFixed(1)} cm outside ${(bounds.minM * 100).toFixed(0)}–${(bounds.maxM * 100).toFixed(0)} cm`);
  }
  return { ...result, accepted: true, reason: null };
}
