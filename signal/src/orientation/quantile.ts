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
  const count = mask ? countMasked(mask, values.length) : values.length;
  if (count === 0) return null;
  const step = Math.max(1, Math.ceil(count / MAX_QUANTILE_SAMPLES));
  const capacity = Math.ceil(count / step);
  // One spare slot: everyStepMasked writes every sample to the next free slot and only then decides
  // whether the slot is taken.
  const buf = new Float64Array(capacity + 1);
  const kept = buf.subarray(0, everyStepMasked(values, mask, step, buf));
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

// The sample loops are small functions of their own, compiled once for every caller. They read every
// sample and let the mask decide what counts: a walk starts with a stretch outside the mask, and a
// loop that skipped those samples was compiled before it had read or stored a single one, then
// compiled again when it first did. For the same reason their results come back as plain numbers
// (what follows a loop has not run either when the loop is first compiled).

/** Number of set entries among the first n of the mask. */
function countMasked(mask: Uint8Array, n: number): number {
  let count = 0;
  for (let i = 0; i < n; i++) count += mask[i]! > 0 ? 1 : 0;
  return count;
}

/**
 * Every step-th masked value (all values when mask is null), in order, into buf (at least one slot
 * longer than the number taken); returns how many were taken.
 */
function everyStepMasked(values: ArrayLike<number>, mask: Uint8Array | null, step: number, buf: Float64Array): number {
  const n = values.length;
  const capacity = buf.length - 1;
  // phase = (number of masked samples seen so far) mod step, counted up rather than divided out.
  let phase = 0;
  let m = 0;
  for (let i = 0; i < n; i++) {
    const on = mask === null || mask[i]! > 0;
    buf[m] = values[i]!;
    m += on && phase === 0 && m < capacity ? 1 : 0;
    const next = phase + 1 === step ? 0 : phase + 1;
    phase = on ? next : phase;
  }
  return m;
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
  const bounds = new Int32Array(2);
  while (hi > lo) {
    const mid = (lo + hi) >> 1;
    // Median of three as the pivot: sorted or reversed input stays O(m).
    let a = x[lo]!;
    let b = x[mid]!;
    const c = x[hi]!;
    if (a > b) {
      const t = a;
      a = b;
      b = t;
    }
    if (b > c) b = c < a ? a : c;
    partition(x, lo, hi, b, bounds);
    const i = bounds[0]!;
    const j = bounds[1]!;
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else break;
  }
  return x[k]!;
}

/**
 * Hoare's partition of x[lo…hi] around `pivot`: afterwards x[lo…j] ≤ pivot ≤ x[i…hi], with
 * bounds = [i, j]. The loop of its own (the selection around it runs a few dozen times, the loop
 * over every sample); the bounds are stored on every pass of the loop rather than once after it.
 */
function partition(x: Float64Array, lo: number, hi: number, pivot: number, bounds: Int32Array): void {
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
    bounds[0] = i;
    bounds[1] = j;
  }
}

/** Smallest of x[from…]: after selectOrderStatistic(x, from − 1) that is the next order statistic. */
function minFrom(x: Float64Array, from: number): number {
  let v = x[from]!;
  for (let i = from + 1; i < x.length; i++) {
    const w = x[i]!;
    if (w < v) v = w;
  }
  return v;
}
