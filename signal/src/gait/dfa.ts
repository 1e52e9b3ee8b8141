/** DFA needs this many strides before α is reported (common practice; ≈ 600 recommended, PMC5360325). */
export const DFA_MIN_STRIDES = 256;
export const DFA_MIN_BOX = 4;

export interface DfaResult {
  alpha: number;
  /**
   * Standard error of the log–log slope from the least-squares fit. The box sizes share data, so
   * this understates the spread between sessions; it is a floor on α's uncertainty, not a CI.
   */
  alphaStandardError: number;
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
  const alpha = num / den2;
  let rss = 0;
  for (let i = 0; i < lx.length; i++) rss += (ly[i]! - my - alpha * (lx[i]! - mx)) ** 2;
  const alphaStandardError = lx.length > 2 ? Math.sqrt(rss / (lx.length - 2) / den2) : Number.NaN;
  return { alpha, alphaStandardError, boxSizes: sizes, fluctuations: fluct };
}

/** α recommended from about this many strides for a stable estimate (Hausdorff et al. 1997; PMC5360325). */
export const DFA_RECOMMENDED_STRIDES = 600;

export interface DfaAlphaOutcome {
  alpha: number | null;
  /** Standard error of the log–log slope (see DfaResult); null when α is null. */
  uncertainty: number | null;
  /** Why α is null, or the caution that applies to it; null when neither. */
  reason: string | null;
  /** Strides in the series. */
  strideCount: number;
}

/**
 * α for ONE run of consecutive strides (one leg, one bout, nothing left out in between: DFA's
 * integration assumes an unbroken series, so joining across pauses, turns or excluded strides
 * would add artificial jumps). Null with the reason below DFA_MIN_STRIDES; from there up to
 * DFA_RECOMMENDED_STRIDES the reason carries the caution that α is not yet stable.
 */
export function dfaAlphaOrReason(strideTimesS: readonly number[]): DfaAlphaOutcome {
  const n = strideTimesS.length;
  if (n < DFA_MIN_STRIDES) {
    return {
      alpha: null,
      uncertainty: null,
      strideCount: n,
      reason: `the longest run of consecutive steady strides of one leg in one bout has ${n} strides; DFA needs at least ${DFA_MIN_STRIDES} (about ${DFA_RECOMMENDED_STRIDES} recommended)`,
    };
  }
  const r = detrendedFluctuation(strideTimesS);
  if (!r) return { alpha: null, uncertainty: null, strideCount: n, reason: "series too short for DFA" };
  return {
    alpha: r.alpha,
    uncertainty: r.alphaStandardError,
    strideCount: n,
    reason:
      n < DFA_RECOMMENDED_STRIDES
        ? `from ${n} consecutive strides, fewer than the ${DFA_RECOMMENDED_STRIDES} recommended for a stable α: interpret with caution`
        : null,
  };
}
