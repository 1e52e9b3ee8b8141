/** Mean (null when empty), via a running mean for stability. */
export function mean(values: ArrayLike<number>): number | null {
  if (values.length === 0) return null;
  let m = 0;
  for (let i = 0; i < values.length; i++) m += (values[i]! - m) / (i + 1);
  return m;
}

/** Standard deviation with `ddof` (1 = sample SD, the convention for stride-time CV); null when n ≤ ddof. */
export function standardDeviation(values: ArrayLike<number>, ddof = 1): number | null {
  const n = values.length;
  if (n <= ddof) return null;
  const m = mean(values)!;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (values[i]! - m) ** 2;
  return Math.sqrt(ss / (n - ddof));
}

/** CV % = 100·SD/mean (SD with ddof, default 1). */
export function coefficientOfVariationPct(values: ArrayLike<number>, ddof = 1): number | null {
  const m = mean(values);
  const sd = standardDeviation(values, ddof);
  if (m === null || sd === null || m === 0) return null;
  return (100 * sd) / m;
}
