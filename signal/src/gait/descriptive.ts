/**
 * Descriptive statistics shared by the analysis and the server's clinical rules (one module, one
 * policy). Empty-input policy: a statistic that is not defined for its input is `null` — the mean of
 * no values, an SD with n ≤ ddof, a CV whose mean or SD is null or whose mean is 0. Every caller
 * decides explicitly what null means for it (an unavailable metric, no baseline). Values are not
 * checked for finiteness: NaN or ±Infinity propagate into the result, so callers that must refuse
 * them check first.
 */

/** Mean (null when empty), via a running mean for stability (NumPy `mean` to rounding). */
export function mean(values: ArrayLike<number>): number | null {
  if (values.length === 0) return null;
  let m = 0;
  for (let i = 0; i < values.length; i++) m += (values[i]! - m) / (i + 1);
  return m;
}

/** Standard deviation with `ddof` (1 = sample SD, NumPy `std(ddof=1)`, the convention for stride-time CV); null when n ≤ ddof. */
export function standardDeviation(values: ArrayLike<number>, ddof = 1): number | null {
  const n = values.length;
  if (n <= ddof) return null;
  const m = mean(values)!;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (values[i]! - m) ** 2;
  return Math.sqrt(ss / (n - ddof));
}

/** CV % = 100·SD/mean (SD with ddof, default 1); null when either is null or the mean is 0. */
export function coefficientOfVariationPct(values: ArrayLike<number>, ddof = 1): number | null {
  const m = mean(values);
  const sd = standardDeviation(values, ddof);
  if (m === null || sd === null || m === 0) return null;
  return (100 * sd) / m;
}
