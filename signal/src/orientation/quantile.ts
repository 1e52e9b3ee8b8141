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
  const count = countMasked(values.length, mask);
  if (count === 0) return null;
  const step = Math.max(1, Math.ceil(count / MAX_QUANTILE_SAMPLES));
  const kept = everyStepMasked(values, mask, step, Math.ceil(count / step));
  const m = kept.length;
  const hasNaN = containsNaN(kept);
  // Only two order statistics per quantile are read, so selecting them (O(m)) gives the same values
  // as sorting (O(m log m)); with NaN present the sort's ordering (NaN last) is kept instead.
  if (hasNaN) kept.sort();
  return qs.map((q) => {
    const pos = q * (m - 1);
    const lo = Math.floor(pos);
    const hi = Math.min(m - 1, lo + 1);
    const a = hasNaN ? kept[lo]! : selectOrderStatistic(kept, lo);
    const b = hasNaN || hi === lo ? kept[hi]! : minFrom(kept, hi);
    return a + (b - a) * (pos - lo);
  });
}

// The sample loops are small functions of their own, compiled once for every caller.

function countMasked(n: number, mask: Uint8Array | null): number {
  if (!mask) return n;
  let count = 0;
  for (let i = 0; i < n; i++) if (mask[i]) count++;
  return count;
}

/** Every step-th masked value (at most `capacity`), in order. */
function everyStepMasked(values: ArrayLike<number>, mask: Uint8Array | null, step: number, capacity: number): Float64Array {
  const buf = new Float64Array(capacity);
  let seen = 0;
  let m = 0;
  for (let i = 0; i < values.length; i++) {
    if (mask && !mask[i]) continue;
    if (seen % step === 0 && m < buf.length) buf[m++] = values[i]!;
    seen++;
  }
  return buf.subarray(0, m);
}

function containsNaN(x: Float64Array): boolean {
  for (let i = 0; i < x.length; i++) if (x[i] !== x[i]) return true;
  return false;
}

/**
 * Rearranges x so that x[k] holds the value it would hold if x were sorted ascending, everything
 * before it ≤ and everything after it ≥ (Hoare's selection with a median-of-three pivot); returns
 * x[k]. x must hold no NaN.
 */
function selectOrderStatistic(x: Float64Array, k: number): number {
  let lo = 0;
  let hi = x.length - 1;
  while (hi > lo) {
    const mid = (lo + hi) >> 1;
    // Median of three as the pivot: sorted or reversed input stays O(m).
    let a = x[lo]!;
    let b = x[mid]!;
    const c = x[hi]!;
    if (a > b) [a, b] = [b, a];
    if (b > c) b = c < a ? a : c;
    const pivot = b;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (x[i]! < pivot) i++;
      while (x[j]! > pivot) j--;
      if (i <= j) {
        const t = x[i]!;
        x[i] = x[j]!;
        x[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else break;
  }
  return x[k]!;
}

/** Smallest of x[from…]: after selectOrderStatistic(x, from − 1) that is the next order statistic. */
function minFrom(x: Float64Array, from: number): number {
  let v = x[from]!;
  for (let i = from + 1; i < x.length; i++) if (x[i]! < v) v = x[i]!;
  return v;
}
