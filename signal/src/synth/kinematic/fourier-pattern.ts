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
const TABLE = 2048;

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
  // The series is tabulated once (value and slope at TABLE points per cycle) and read by cubic
  // Hermite interpolation: identical to the series within ~1e-7 of its range, and much cheaper per sample.
  const series = (q: number) => {
    let v = a[0]!;
    let d = 0;
    for (let k = 1; k <= harmonics; k++) {
      const w = 2 * Math.PI * k * q;
      const c = Math.cos(w);
      const sn = Math.sin(w);
      v += a[k]! * c + b[k]! * sn;
      d += 2 * Math.PI * k * (-a[k]! * sn + b[k]! * c);
    }
    return [v, d] as const;
  };
  const tv = new Float64Array(TABLE + 1);
  const td = new Float64Array(TABLE + 1);
  for (let i = 0; i <= TABLE; i++) [tv[i], td[i]] = series(i / TABLE);
  const h = 1 / TABLE;
  const locate = (q: number) => {
    const x = (q - Math.floor(q)) * TABLE;
    const i = Math.min(TABLE - 1, Math.floor(x));
    return { i, t: x - i };
  };
  return {
    value(q) {
      const { i, t } = locate(q);
      const t2 = t * t;
      const t3 = t2 * t;
      return (2 * t3 - 3 * t2 + 1) * tv[i]! + (t3 - 2 * t2 + t) * h * td[i]! + (-2 * t3 + 3 * t2) * tv[i + 1]! + (t3 - t2) * h * td[i + 1]!;
    },
    slope(q) {
      const { i, t } = locate(q);
      const t2 = t * t;
      return ((6 * t2 - 6 * t) * (tv[i]! - tv[i + 1]!)) / h + (3 * t2 - 4 * t + 1) * td[i]! + (3 * t2 - 2 * t) * td[i + 1]!;
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
