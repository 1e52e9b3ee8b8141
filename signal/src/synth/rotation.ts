import type { Prng } from "./prng";

/** Row-major 3×3 matrix. */
export type Matrix3 = [number, number, number, number, number, number, number, number, number];

export const IDENTITY: Matrix3 = [1, 0, 0, 0, 1, 0, 0, 0, 1];

/** Rotation by angleRad about a unit axis (Rodrigues' formula). */
export function axisAngle(axis: [number, number, number], angleRad: number): Matrix3 {
  const n = Math.hypot(axis[0], axis[1], axis[2]);
  const [x, y, z] = [axis[0] / n, axis[1] / n, axis[2] / n];
  const c = Math.cos(angleRad);
  const s = Math.sin(angleRad);
  const t = 1 - c;
  return [
    t * x * x + c, t * x * y - s * z, t * x * z + s * y,
    t * x * y + s * z, t * y * y + c, t * y * z - s * x,
    t * x * z - s * y, t * y * z + s * x, t * z * z + c,
  ];
}

/** Rotation by exactly angleDeg about an axis drawn uniformly on the sphere. */
export function randomRotation(angleDeg: number, prng: Prng): Matrix3 {
  const z = 2 * prng.uniform() - 1;
  const phi = 2 * Math.PI * prng.uniform();
  const r = Math.sqrt(1 - z * z);
  return axisAngle([r * Math.cos(phi), r * Math.sin(phi), z], (angleDeg * Math.PI) / 180);
}

export function multiply(a: Matrix3, b: Matrix3): Matrix3 {
  const out = new Array<number>(9).fill(0) as Matrix3;
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) {
      out[3 * i + j] = a[3 * i]! * b[j]! + a[3 * i + 1]! * b[3 + j]! + a[3 * i + 2]! * b[6 + j]!;
    }
  }
  return out;
}

/** Angle of a rotation matrix in degrees, from its trace. */
export function rotationAngleDeg(m: Matrix3): number {
  const c = Math.max(-1, Math.min(1, (m[0] + m[4] + m[8] - 1) / 2));
  return (Math.acos(c) * 180) / Math.PI;
}
