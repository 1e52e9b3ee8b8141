/** A segment's motion in its sagittal plane, sample by sample, in a plane basis fixed to the sensor. */
export interface SagittalPlaneSignals {
  /** Specific force (m/s², gravity included) along the plane's first and second basis vectors. */
  acc1MS2: Float64Array;
  acc2MS2: Float64Array;
  /** Angular velocity about the sagittal axis (deg/s), positive when the distal end swings forward. */
  omegaDegS: Float64Array;
}

/**
 * Projects a sensor's accelerometer and gyroscope onto the plane perpendicular to `axis` (the signed
 * sagittal axis: positive rotation about it moves the segment's lower end forward). The basis
 * (e1, e2) is orthonormal with e1 × e2 = axis, so a positive rotation turns e1 towards e2 and the
 * 2-D rotation algebra in `integrateSagittalStride` holds. Mediolateral acceleration is dropped: the
 * methods integrate in the sagittal plane only (Li et al. 2010; Sabatini et al. 2005).
 */
export function sagittalPlaneSignals(
  accX: ArrayLike<number>,
  accY: ArrayLike<number>,
  accZ: ArrayLike<number>,
  gyroX: ArrayLike<number>,
  gyroY: ArrayLike<number>,
  gyroZ: ArrayLike<number>,
  axis: readonly [number, number, number],
): SagittalPlaneSignals {
  const norm = Math.hypot(axis[0], axis[1], axis[2]);
  if (!(norm > 0)) throw new RangeError("sagittalPlaneSignals: axis must be a non-zero vector");
  const n = [axis[0] / norm, axis[1] / norm, axis[2] / norm] as const;
  // e1: the sensor axis least aligned with n, made perpendicular to n (Gram–Schmidt).
  const abs = n.map(Math.abs);
  const pick = abs[0]! <= abs[1]! && abs[0]! <= abs[2]! ? 0 : abs[1]! <= abs[2]! ? 1 : 2;
  const u = [0, 0, 0];
  u[pick] = 1;
  const dot = u[0]! * n[0] + u[1]! * n[1] + u[2]! * n[2];
  let e1 = [u[0]! - dot * n[0], u[1]! - dot * n[1], u[2]! - dot * n[2]];
  const l1 = Math.hypot(e1[0]!, e1[1]!, e1[2]!);
  e1 = e1.map((v) => v / l1);
  // e2 = n × e1, so that e1 × e2 = n.
  const e2 = [n[1] * e1[2]! - n[2] * e1[1]!, n[2] * e1[0]! - n[0] * e1[2]!, n[0] * e1[1]! - n[1] * e1[0]!];
  const len = accX.length;
  const acc1MS2 = new Float64Array(len);
  const acc2MS2 = new Float64Array(len);
  const omegaDegS = new Float64Array(len);
  for (let i = 0; i < len; i++) {
    const ax = accX[i]!;
    const ay = accY[i]!;
    const az = accZ[i]!;
    acc1MS2[i] = ax * e1[0]! + ay * e1[1]! + az * e1[2]!;
    acc2MS2[i] = ax * e2[0]! + ay * e2[1]! + az * e2[2]!;
    omegaDegS[i] = gyroX[i]! * n[0] + gyroY[i]! * n[1] + gyroZ[i]! * n[2];
  }
  return { acc1MS2, acc2MS2, omegaDegS };
}
