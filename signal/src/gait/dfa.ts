/** DFA needs this many strides before α is reported (common practice; ≈ 600 recommended, PMC5360325). */
export const DFA_MIN_STRIDES = 256;
export const DFA_MIN_BOX = 4;

export interface DfaResult {
  alpha: number;
  boxSizes: number[];
  fluctuations: number[];
}

/**
 * Detrended fluctuation analysis (Hausdorff et al. 1995, J Appl Physiol 78:349): integrate the
 * centred series, split it into non-overlapping boxes of n samples, remove a least-squares line per
 * box, F(n) = RMS of the residuals; α = slope of log F(n) vs log n over box sizes from 4 to N/8,
 * about 16 sizes spaced evenly in log n. Null when the series is shorter than 2·DFA_MIN_BOX·8.
 */
export function detrendedFluctuation(series: ArrayLike<number>): DfaResult | null {
  const n = series.length;
  const maxBox = Math.floor(n / 8);
  if (maxBox < DFA_MIN_BOX * 2) return null;
  let m = 0;
  for (let i = 0; i < n; i++) m += series[i]!;
  m /= n;
  const y = new Float64Array(n);
  let acc = 0;
  for (let i = 0; i < n; i++) {
    acc += series[i]! - m;
    y[i] = acc;
  }
  const sizes: number[] = [];
  const steps = 16;
  for (let k = 0; k < steps; k++) {
    const s = Math.round(DFA_MIN_BOX * (maxBox / DFA_MIN_BOX) ** (k / (steps - 1)));
    if (sizes[sizes.length - 1] !== s) sizes.push(s);
  }
  const fluct: number[] = [];
  for (const s of sizes) {
    const boxes = Math.floor(n / s);
    // x = 0..s-1 within a box: closed-form sums for the least-squares line.
    const sx = (s * (s - 1)) / 2;
    const sxx = ((s - 1) * s * (2 * s - 1)) / 6;
    const den = s * sxx - sx * sx;
    let total = 0;
    for (let b = 0; b < boxes; b++) {
      const o = b * s;
      let sy = 0;
      let sxy = 0;
      for (let i = 0; i < s; i++) {
        sy += y[o + i]!;
        sxy += i * y[o + i]!;
      }
      const slope = (s * sxy - sx * sy) / den;
      const icpt = (sy - slope * sx) / s;
      for (let i = 0; i < s; i++) total += (y[o + i]! - (icpt + slope * i)) ** 2;
    }
    fluct.push(Math.sqrt(total / (boxes * s)));
  }
  const lx = sizes.map(Math.log);
  const ly = fluct.map((f) => Math.log(f));
  const mx = lx.reduce((a, b) => a + b, 0) / lx.length;
  const my = ly.reduce((a, b) => a + b, 0) / ly.length;
  let num = 0;
  let den2 = 0;
  for (let i = 0; i < lx.length; i++) {
    num += (lx[i]! - mx) * (ly[i]! - my);
    den2 += (lx[i]! - mx) ** 2;
  }
  return { alpha: num / den2, boxSizes: sizes, fluctuations: fluct };
}

/** α for a stride-time series when it has ≥ DFA_MIN_STRIDES strides, else null with the reason. */
export function dfaAlphaOrReason(strideTimesS: readonly number[]): { alpha: number | null; reason: string | null } {
  if (strideTimesS.length < DFA_MIN_STRIDES) {
    return {
      alpha: null,
      reason: `${strideTimesS.length} steady strides on one side; DFA needs at least ${DFA_MIN_STRIDES} (about 600 recommended)`,
    };
  }
  const r = detrendedFluctuation(strideTimesS);
  return r ? { alpha: r.alpha, reason: null } : { alpha: null, reason: "series too short for DFA" };
}
