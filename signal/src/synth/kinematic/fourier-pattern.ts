/**
 * A smooth periodic curve of gait phase q (cycles): the first `harmonics` Fourier terms of the
 * periodic linear interpolant through tabulated points. Truncation rounds the table's corners,
 * so the curve and its derivative are smooth (no kinks at the table points).
 */
export interface PeriodicCurve {
  /** Value at phase q (any real q; period 1). */
  value(q: number): number;
  /** Derivative with respect to q (units per cycle). */
  slope(q: number): number;
  /** Complex Fourier coefficient k of the curve: value ≈ Σ |c_k| cos(2πkq + arg c_k). */
  harmonic(k: number): { re: number; im: number };
}

const FIT_POINTS = 720;

export function periodicCurve(pct: readonly number[], values: readonly number[], harmonics = 10): PeriodicCurve {
  if (pct.length !== values.length || pct.length < 3) throw new RangeError("periodicCurve needs ≥ 3 points of equal length");
  const sampled = new Float64Array(FIT_POINTS);
  for (let i = 0; i < FIT_POINTS; i++) sampled[i] = interpolatePeriodic(pct, values, (100 * i) / FIT_POINTS);
  // One-sided amplitudes a_k cos + b_k sin (k ≥ 1 doubled), a_0 the mean.
  const a = new Float64Array(harmonics + 1);
  const b = new Float64Array(harmonics + 1);
  for (let k = 0; k <= harmonics; k++) {
    let re = 0;
    let im = 0;
    for (let i = 0; i < FIT_POINTS; i++) {
      const w = (2 * Math.PI * k * i) / FIT_POINTS;
      re += sampled[i]! * Math.cos(w);
      im += sampled[i]! * Math.sin(w);
    }
    const scale = k === 0 ? 1 / FIT_POINTS : 2 / FIT_POINTS;
    a[k] = re * scale;
    b[k] = im * scale;
  }
  return {
    value(q) {
      let s = a[0]!;
      for (let k = 1; k <= harmonics; k++) {
        const w = 2 * Math.PI * k * q;
        s += a[k]! * Math.cos(w) + b[k]! * Math.sin(w);
      }
      return s;
    },
    slope(q) {
      let s = 0;
      for (let k = 1; k <= harmonics; k++) {
        const w = 2 * Math.PI * k * q;
        s += 2 * Math.PI * k * (-a[k]! * Math.sin(w) + b[k]! * Math.cos(w));
      }
      return s;
    },
    harmonic(k) {
      if (k > harmonics) return { re: 0, im: 0 };
      // a cos w + b sin w = |c| cos(w + arg c) with c = a − i b.
      return { re: a[k]!, im: -b[k]! };
    },
  };
}

/** Linear interpolation of a periodic table (percent of cycle 0–100, wrapping at 100). */
function interpolatePeriodic(pct: readonly number[], values: readonly number[], x: number): number {
  const n = pct.length;
  for (let i = 0; i < n; i++) {
    const x0 = pct[i]!;
    const x1 = i + 1 < n ? pct[i + 1]! : pct[0]! + 100;
    if (x >= x0 && x < x1) return values[i]! + ((values[(i + 1) % n]! - values[i]!) * (x - x0)) / (x1 - x0);
  }
  // Before the first point: wrap from the last.
  const x0 = pct[n - 1]! - 100;
  return values[n - 1]! + ((values[0]! - values[n - 1]!) * (x - x0)) / (pct[0]! - x0);
}
