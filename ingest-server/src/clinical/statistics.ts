import { mean, standardDeviation } from "@pendula/signal";

/**
 * Line fit and circular statistics used by the clinical rules. Mean and SD are the analysis's own
 * (`mean`, `standardDeviation` of @pendula/signal, gait/descriptive.ts: null when undefined for the
 * input). Inputs here must be finite; callers drop NaN first.
 */

/** Throws a RangeError naming `what` when any value is NaN or ±Infinity. */
export function requireFinite(values: readonly number[], what: string): void {
  for (const v of values) if (!Number.isFinite(v)) throw new RangeError(`${what}: every value must be finite`);
}

export interface LinearFit {
  slope: number;
  intercept: number;
}

/** Ordinary least-squares line y = intercept + slope·x (SciPy `stats.linregress`). */
export function olsFit(x: readonly number[], y: readonly number[]): LinearFit {
  if (x.length !== y.length) throw new RangeError("olsFit: x and y differ in length");
  if (x.length < 2) throw new RangeError("olsFit: needs at least 2 points");
  requireFinite(x, "olsFit x");
  requireFinite(y, "olsFit y");
  const mx = mean(x);
  const my = mean(y);
  if (mx === null || my === null) throw new RangeError("olsFit: needs at least 2 points");
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < x.length; i++) {
    const dx = x[i]! - mx;
    sxx += dx * dx;
    sxy += dx * (y[i]! - my);
  }
  if (sxx === 0) throw new RangeError("olsFit: all x values are equal");
  const slope = sxy / sxx;
  return { slope, intercept: my - slope * mx };
}

// ---------------------------------------------------------------------------------------------
// Circular statistics for phase angles (degrees). Definitions as in
// docs/methods.md#circular-statistics (mean direction θ̄ = atan2(Σ sin θ, Σ cos θ), mean resultant
// length R = |mean(e^{iθ})|, circular SD √(−2 ln R)); the tests check them against
// scipy.stats.circmean / circstd.

const RAD = Math.PI / 180;

/** An angle in degrees wrapped to (−180, 180]; the shortest signed difference when given a − b. */
export function wrapDeg(angleDeg: number): number {
  if (!Number.isFinite(angleDeg)) throw new RangeError("wrapDeg: angle must be finite");
  const w = angleDeg - 360 * Math.floor((angleDeg + 180) / 360); // [−180, 180)
  return w === -180 ? 180 : w;
}

/** Signed circular difference a − b in degrees, in (−180, 180]. */
export function circularDifferenceDeg(aDeg: number, bDeg: number): number {
  return wrapDeg(aDeg - bDeg);
}

export interface CircularSummary {
  /** Mean direction, degrees in (−180, 180]. NaN when R is 0 (no mean direction). */
  meanDeg: number;
  /** Mean resultant length R, 0..1. */
  resultantLength: number;
  /** Circular SD √(−2 ln R), degrees (scipy.stats.circstd). */
  circularSdDeg: number;
}

export function circularSummary(anglesDeg: readonly number[]): CircularSummary {
  if (anglesDeg.length === 0) throw new RangeError("circularSummary: empty input");
  requireFinite(anglesDeg, "circularSummary");
  let s = 0;
  let c = 0;
  for (const a of anglesDeg) {
    s += Math.sin(a * RAD);
    c += Math.cos(a * RAD);
  }
  const n = anglesDeg.length;
  const r = Math.min(1, Math.hypot(s, c) / n);
  // Below ~1e-12 the direction is numerical noise, not a mean.
  const meanDeg = r < 1e-12 ? Number.NaN : wrapDeg(Math.atan2(s, c) / RAD);
  return { meanDeg, resultantLength: r, circularSdDeg: Math.sqrt(-2 * Math.log(r)) / RAD };
}

/**
 * Spread of angles around their circular mean as a sample SD (n − 1) of the wrapped deviations.
 * For spreads well under 180° this equals the linear sample SD of unwrapped data, so a circular
 * baseline gives the same SEM as a linear one would for data that do not cross ±180°.
 */
export function circularDeviationSd(anglesDeg: readonly number[]): number {
  if (anglesDeg.length < 2) throw new RangeError("circularDeviationSd: needs at least 2 values");
  const { meanDeg } = circularSummary(anglesDeg);
  if (Number.isNaN(meanDeg)) return Number.POSITIVE_INFINITY; // no mean direction: no usable spread
  // At least 2 deviations, so the sample SD exists.
  return standardDeviation(anglesDeg.map((a) => circularDifferenceDeg(a, meanDeg)), 1)!;
}

/**
 * Rayleigh test of uniformity for n angles with mean resultant length R: the probability of an R
 * this large from uniformly scattered phases. Zar's approximation (Biostatistical Analysis, p. 617;
 * the same expression as pycircstat's `rayleigh`): p = exp(√(1 + 4n + 4(n² − Rₙ²)) − (1 + 2n)),
 * Rₙ = n·R. The fixture script checks it against a Monte Carlo of uniform phases.
 */
export function rayleighP(resultantLength: number, n: number): number {
  if (!(resultantLength >= 0 && resultantLength <= 1)) throw new RangeError("rayleighP: R must be in [0, 1]");
  if (!Number.isInteger(n) || n < 2) throw new RangeError("rayleighP: n must be an integer ≥ 2");
  const rn = n * resultantLength;
  const p = Math.exp(Math.sqrt(1 + 4 * n + 4 * (n * n - rn * rn)) - (1 + 2 * n));
  return Math.min(1, Math.max(0, p));
}
