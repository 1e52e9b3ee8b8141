/**
 * Monotone piecewise-cubic Hermite interpolation (Fritsch & Carlson 1980, SIAM J Numer Anal 17:238;
 * the slope rule is the one SciPy's `PchipInterpolator` uses). The model's phase clocks use it: a
 * phase through knots at the contacts stays monotone, is flat wherever two knots share a value (a
 * pause), and has a continuous rate, so segment angular velocities have no jumps at the contacts.
 * Outside the knots the first / last value is held.
 */
export interface MonotoneCubic {
  value(x: number): number;
  slope(x: number): number;
}

export function monotoneCubic(xs: readonly number[], ys: readonly number[]): MonotoneCubic {
  const n = xs.length;
  if (n < 2 || ys.length !== n) throw new RangeError(`monotoneCubic needs ≥ 2 knots of equal length, got ${n} and ${ys.length}`);
  for (let i = 1; i < n; i++) {
    if (!(xs[i]! > xs[i - 1]!)) throw new RangeError(`monotoneCubic knots must increase: x[${i}] = ${xs[i]} after ${xs[i - 1]}`);
  }
  const h = new Float64Array(n - 1);
  const delta = new Float64Array(n - 1);
  for (let i = 0; i < n - 1; i++) {
    h[i] = xs[i + 1]! - xs[i]!;
    delta[i] = (ys[i + 1]! - ys[i]!) / h[i]!;
  }
  const d = new Float64Array(n);
  for (let i = 1; i < n - 1; i++) {
    const a = delta[i - 1]!;
    const b = delta[i]!;
    if (a === 0 || b === 0 || Math.sign(a) !== Math.sign(b)) d[i] = 0;
    else {
      const w1 = 2 * h[i]! + h[i - 1]!;
      const w2 = h[i]! + 2 * h[i - 1]!;
      d[i] = (w1 + w2) / (w1 / a + w2 / b);
    }
  }
  d[0] = endSlope(h[0]!, h[1] ?? h[0]!, delta[0]!, delta[1] ?? delta[0]!);
  d[n - 1] = endSlope(h[n - 2]!, h[n - 3] ?? h[n - 2]!, delta[n - 2]!, delta[n - 3] ?? delta[n - 2]!);

  const locate = (x: number): number => {
    let lo = 0;
    let hi = n - 2;
    while (lo < hi) {
      const mid = (lo + hi + 1) >>> 1;
      if (xs[mid]! <= x) lo = mid;
      else hi = mid - 1;
    }
    return lo;
  };
  return {
    value(x) {
      if (x <= xs[0]!) return ys[0]!;
      if (x >= xs[n - 1]!) return ys[n - 1]!;
      const i = locate(x);
      const t = (x - xs[i]!) / h[i]!;
      const t2 = t * t;
      const t3 = t2 * t;
      return (
        (2 * t3 - 3 * t2 + 1) * ys[i]! + (t3 - 2 * t2 + t) * h[i]! * d[i]! + (-2 * t3 + 3 * t2) * ys[i + 1]! + (t3 - t2) * h[i]! * d[i + 1]!
      );
    },
    slope(x) {
      if (x <= xs[0]! || x >= xs[n - 1]!) return 0;
      const i = locate(x);
      const t = (x - xs[i]!) / h[i]!;
      const t2 = t * t;
      return ((6 * t2 - 6 * t) * (ys[i]! - ys[i + 1]!)) / h[i]! + (3 * t2 - 4 * t + 1) * d[i]! + (3 * t2 - 2 * t) * d[i + 1]!;
    },
  };
}

/** SciPy's one-sided three-point end slope, kept monotone. */
function endSlope(h0: number, h1: number, m0: number, m1: number): number {
  let d = ((2 * h0 + h1) * m0 - h0 * m1) / (h0 + h1);
  if (Math.sign(d) !== Math.sign(m0)) d = 0;
  else if (Math.sign(m0) !== Math.sign(m1) && Math.abs(d) > Math.abs(3 * m0)) d = 3 * m0;
  return d;
}
