/** Small descriptive statistics used by the clinical rules. Inputs must be finite; callers drop NaN first. */

function requireFinite(values: readonly number[], what: string): void {
  for (const v of values) if (!Number.isFinite(v)) throw new RangeError(`${what}: every value must be finite`);
}

export function mean(values: readonly number[]): number {
  if (values.length === 0) throw new RangeError("mean: empty input");
  requireFinite(values, "mean");
  // Two-pass (mean of deviations) keeps precision for values far from zero.
  const first = values.reduce((s, v) => s + v, 0) / values.length;
  return first + values.reduce((s, v) => s + (v - first), 0) / values.length;
}

/** Sample standard deviation with n − 1 in the denominator (NumPy `std(ddof=1)`). */
export function sampleSd(values: readonly number[]): number {
  if (values.length < 2) throw new RangeError("sampleSd: needs at least 2 values");
  const m = mean(values);
  return Math.sqrt(values.reduce((s, v) => s + (v - m) ** 2, 0) / (values.length - 1));
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
