/** At most this many samples are sorted for a quantile; longer inputs are strided evenly. */
const MAX_QUANTILE_SAMPLES = 65_536;

/**
 * Quantile q (0..1, linear interpolation between order statistics) of the values where mask is 1
 * (all values when mask is omitted); null when none. Long inputs are decimated evenly first, which
 * is accurate enough for the thresholds it feeds.
 */
export function quantileOfMasked(values: ArrayLike<number>, mask: Uint8Array | null, q: number): number | null {
  return quantilesOfMasked(values, mask, [q])?.[0] ?? null;
}

/** Several quantiles of the same masked values (one subsample, one sort); null when none. */
export function quantilesOfMasked(values: ArrayLike<number>, mask: Uint8Array | null, qs: readonly number[]): number[] | null {
  const n = values.length;
  let count = 0;
  for (let i = 0; i < n; i++) if (!mask || mask[i]) count++;
  if (count === 0) return null;
  const step = Math.max(1, Math.ceil(count / MAX_QUANTILE_SAMPLES));
  const buf = new Float64Array(Math.ceil(count / step));
  let seen = 0;
  let m = 0;
  for (let i = 0; i < n; i++) {
    if (mask && !mask[i]) continue;
    if (seen % step === 0 && m < buf.length) buf[m++] = values[i]!;
    seen++;
  }
  const sorted = buf.subarray(0, m).sort();
  return qs.map((q) => {
    const pos = q * (m - 1);
    const lo = Math.floor(pos);
    const hi = Math.min(m - 1, lo + 1);
    return sorted[lo]! + (sorted[hi]! - sorted[lo]!) * (pos - lo);
  });
}
