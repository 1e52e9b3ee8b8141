/** Summary of a set of angles (radians). */
export interface CircularSummary {
  n: number;
  /** Circular mean atan2(Σ sin θ, Σ cos θ), in (−π, π]; NaN when R is 0. */
  meanRad: number;
  /** Mean resultant length R = |mean e^{iθ}|, 0..1. */
  resultantLength: number;
  /** Circular SD √(−2 ln R), radians (SciPy `circstd`, 1.17 default); Infinity when R is 0. */
  sdRad: number;
  /** Circular variance 1 − R (SciPy `circvar`). */
  variance: number;
}

/**
 * Circular statistics of angles in radians (Mardia & Jupp 2000, §2.3; formulas in
 * docs/methods.md#circular-statistics). With a mask only samples where mask[i] = 1 count. NaN
 * angles are skipped. Returns null when no angle counts. Sums are accumulated as plain sums of
 * sin/cos; each term is bounded by 1, so cancellation error stays below 1e-12 for the lengths
 * Pendula uses.
 */
export function circularStats(anglesRad: ArrayLike<number>, mask?: ArrayLike<number>): CircularSummary | null {
  if (mask && mask.length !== anglesRad.length) {
    throw new RangeError(`mask length ${mask.length} differs from angles length ${anglesRad.length}`);
  }
  let s = 0;
  let c = 0;
  let n = 0;
  for (let i = 0; i < anglesRad.length; i++) {
    if (mask && mask[i] !== 1) continue;
    const a = anglesRad[i]!;
    if (Number.isNaN(a)) continue;
    s += Math.sin(a);
    c += Math.cos(a);
    n++;
  }
  if (n === 0) return null;
  const r = Math.min(1, Math.hypot(s, c) / n);
  return {
    n,
    meanRad: r === 0 ? Number.NaN : Math.atan2(s, c),
    resultantLength: r,
    sdRad: r === 0 ? Number.POSITIVE_INFINITY : Math.sqrt(-2 * Math.log(r)),
    variance: 1 - r,
  };
}
