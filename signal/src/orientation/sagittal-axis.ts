import { EigenvalueDecomposition, Matrix } from "ml-matrix";

export interface SagittalAxis {
  /** Unit vector in the sensor frame; sign chosen so that its z component is ≥ 0 (nominal +z). */
  axis: [number, number, number];
  /** Share of the gyro variance along the axis (0..1). */
  explainedVariance: number;
  /** Angle between the axis and the nominal +z axis, degrees. */
  angleFromNominalDeg: number;
  sampleCount: number;
}

/** Fewer masked samples than this (≈ 2.5 strides at 100 Hz) give no reliable axis. */
export const MIN_AXIS_SAMPLES = 256;

/**
 * Sagittal rotation axis of a segment: the first principal component of the centred 3-axis gyro
 * over the samples where `mask` is 1 (walking). During walking the shank, foot and arm rotate mostly
 * about the mediolateral axis, so PC1 is that axis (docs/methods.md#sagittal-axis). PCA fixes the
 * axis, not its sign; the sign is taken from the nominal frame (+z to the subject's right). Returns
 * null when too few samples are available.
 */
export function sagittalAxis(
  gyroX: ArrayLike<number>,
  gyroY: ArrayLike<number>,
  gyroZ: ArrayLike<number>,
  mask: Uint8Array,
): SagittalAxis | null {
  const [count, sxx, syy, szz, sxy, sxz, syz] = maskedMoments3(gyroX, gyroY, gyroZ, mask);
  if (count < MIN_AXIS_SAMPLES) return null;
  const cov = new Matrix([
    [sxx, sxy, sxz],
    [sxy, syy, syz],
    [sxz, syz, szz],
  ]);
  const eig = new EigenvalueDecomposition(cov, { assumeSymmetric: true });
  const values = eig.realEigenvalues;
  let best = 0;
  for (let k = 1; k < 3; k++) if (values[k]! > values[best]!) best = k;
  const vectors = eig.eigenvectorMatrix;
  let ax = vectors.get(0, best);
  let ay = vectors.get(1, best);
  let az = vectors.get(2, best);
  const norm = Math.hypot(ax, ay, az) || 1;
  ax /= norm;
  ay /= norm;
  az /= norm;
  if (az < 0) {
    ax = -ax;
    ay = -ay;
    az = -az;
  }
  const total = values.reduce((s, v) => s + Math.max(0, v), 0);
  return {
    axis: [ax, ay, az],
    explainedVariance: total > 0 ? Math.max(0, values[best]!) / total : 0,
    angleFromNominalDeg: (Math.acos(Math.min(1, az)) * 180) / Math.PI,
    sampleCount: count,
  };
}

/** Angular velocity about `axis` (deg/s), times `sign` (±1). */
export function projectOnAxis(
  gyroX: ArrayLike<number>,
  gyroY: ArrayLike<number>,
  gyroZ: ArrayLike<number>,
  axis: readonly [number, number, number],
  sign = 1,
): Float64Array {
  const n = gyroX.length;
  const out = new Float64Array(n);
  const ax = axis[0] * sign;
  const ay = axis[1] * sign;
  const az = axis[2] * sign;
  for (let i = 0; i < n; i++) out[i] = gyroX[i]! * ax + gyroY[i]! * ay + gyroZ[i]! * az;
  return out;
}

/**
 * [count, sums of products about the means xx yy zz xy xz yz] over the masked samples. Each sample
 * loop is a small function of its own, compiled once for every caller rather than inside
 * sagittalAxis with the eigen-solver inlined.
 */
function maskedMoments3(
  gyroX: ArrayLike<number>,
  gyroY: ArrayLike<number>,
  gyroZ: ArrayLike<number>,
  mask: Uint8Array,
): [number, number, number, number, number, number, number] {
  const [count, sx, sy, sz] = maskedSums3(gyroX, gyroY, gyroZ, mask);
  if (count < MIN_AXIS_SAMPLES) return [count, 0, 0, 0, 0, 0, 0];
  return [count, ...maskedProducts3(gyroX, gyroY, gyroZ, mask, sx / count, sy / count, sz / count)];
}

// The two loops read and add every sample and let the mask choose between the sample and 0 (the
// same sums: a sum that starts at +0 is never −0, and adding +0 leaves any other value unchanged).
// A recording usually starts with a stretch outside the mask; a loop that skipped those samples was
// compiled while it had not yet read or added a single one, and compiled again when it first did.
// The results come back as a new array, not stored into one: the stores after the loop have not
// run either when the loop is first compiled.

/** [count, Σx, Σy, Σz] of three channels over the masked samples (summed in sample order). */
export function maskedSums3(gyroX: ArrayLike<number>, gyroY: ArrayLike<number>, gyroZ: ArrayLike<number>, mask: Uint8Array): [number, number, number, number] {
  const n = gyroX.length;
  let count = 0;
  let sx = 0;
  let sy = 0;
  let sz = 0;
  for (let i = 0; i < n; i++) {
    const on = mask[i]! > 0;
    const x = gyroX[i]!;
    const y = gyroY[i]!;
    const z = gyroZ[i]!;
    count += on ? 1 : 0;
    sx += on ? x : 0;
    sy += on ? y : 0;
    sz += on ? z : 0;
  }
  return [count, sx, sy, sz];
}

/** [Σ of xx yy zz xy xz yz] about (mx, my, mz) over the masked samples (in sample order). */
function maskedProducts3(
  gyroX: ArrayLike<number>,
  gyroY: ArrayLike<number>,
  gyroZ: ArrayLike<number>,
  mask: Uint8Array,
  mx: number,
  my: number,
  mz: number,
): [number, number, number, number, number, number] {
  const n = gyroX.length;
  let sxx = 0;
  let syy = 0;
  let szz = 0;
  let sxy = 0;
  let sxz = 0;
  let syz = 0;
  for (let i = 0; i < n; i++) {
    const on = mask[i]! > 0;
    const x = gyroX[i]! - mx;
    const y = gyroY[i]! - my;
    const z = gyroZ[i]! - mz;
    sxx += on ? x * x : 0;
    syy += on ? y * y : 0;
    szz += on ? z * z : 0;
    sxy += on ? x * y : 0;
    sxz += on ? x * z : 0;
    syz += on ? y * z : 0;
  }
  return [sxx, syy, szz, sxy, sxz, syz];
}
