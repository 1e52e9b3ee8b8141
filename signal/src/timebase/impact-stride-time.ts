// Stride time from one leg sensor's impact train, used to size the clock-offset search.

/** Stride-time search range for the envelope autocorrelation (s): 0.5 s is a fast run-like stride, 3 s a very slow impaired one (common practice). */
export const STRIDE_SEARCH_S: readonly [number, number] = [0.5, 3];

/**
 * Stride time (s) of one leg sensor: the lag of the highest autocorrelation of its impact envelope
 * over STRIDE_SEARCH_S (own strikes repeat every stride; own-vs-other strikes give a weaker peak at
 * one step). Computed on 50 ms block maxima so the cost stays small; null when nothing repeats.
 */
export function strideTimeFromImpacts(envelope: Float32Array, valid: Uint8Array, active: Uint8Array, rateHz: number): number | null {
  const block = Math.max(1, Math.round(rateHz * 0.05));
  const m = Math.floor(envelope.length / block);
  const x = new Float64Array(m);
  const ok = new Uint8Array(m);
  const cnt = blockPeaks(envelope, valid, active, block, x, ok);
  if (cnt < 10) return null;
  const mean = okSum(x, ok) / cnt;
  const v = okSquaredDeviations(x, ok, mean);
  if (!(v > 0)) return null;
  const blockS = block / rateHz;
  const lo = Math.max(1, Math.floor(STRIDE_SEARCH_S[0] / blockS));
  const hi = Math.min(m - 1, Math.ceil(STRIDE_SEARCH_S[1] / blockS));
  const centred = centredOrZero(x, ok, mean);
  let best = -1;
  let bestR = -Infinity;
  const rs = new Float64Array(hi + 2);
  for (let lag = lo; lag <= hi; lag++) {
    const s = laggedProductSum(centred, lag);
    rs[lag] = s / v;
    if (rs[lag]! > bestR) {
      bestR = rs[lag]!;
      best = lag;
    }
  }
  // A clearly periodic train has r well above 0 at one stride (0.2: common practice).
  if (best < 0 || bestR < 0.2) return null;
  return best * blockS;
}

// The loops are small functions of their own that end in a plain return: compiled once for both
// legs, instead of strideTimeFromImpacts being compiled in the middle of each loop in turn.

/** Per block: x = the largest envelope value, ok = every sample valid and active; returns the ok count. */
function blockPeaks(envelope: Float32Array, valid: Uint8Array, active: Uint8Array, block: number, x: Float64Array, ok: Uint8Array): number {
  let cnt = 0;
  for (let k = 0; k < x.length; k++) {
    let peak = 0;
    let good = 1;
    for (let i = k * block; i < (k + 1) * block; i++) {
      if (!valid[i] || !active[i]) good = 0;
      else if (envelope[i]! > peak) peak = envelope[i]!;
    }
    x[k] = peak;
    ok[k] = good;
    cnt += good;
  }
  return cnt;
}

/** Σ x[k] over ok blocks, in index order. */
function okSum(x: Float64Array, ok: Uint8Array): number {
  let sum = 0;
  for (let k = 0; k < x.length; k++) if (ok[k]) sum += x[k]!;
  return sum;
}

/** Σ (x[k] − mean)² over ok blocks, in index order. */
function okSquaredDeviations(x: Float64Array, ok: Uint8Array, mean: number): number {
  let v = 0;
  for (let k = 0; k < x.length; k++) if (ok[k]) v += (x[k]! - mean) ** 2;
  return v;
}

/**
 * x − mean where ok, else 0. The peaks come from a Float32Array, so each ok x − mean is finite once
 * v > 0 has ruled out an infinite or NaN mean; a block that is not ok then adds 0 · (finite) = ±0
 * to the lagged sums below, which leaves every partial sum as it was (a sum that starts at +0
 * never becomes −0, and s + (±0) = s otherwise). The sums therefore equal the ones that skip such
 * pairs, bit for bit, without a branch per product.
 */
function centredOrZero(x: Float64Array, ok: Uint8Array, mean: number): Float64Array {
  const out = new Float64Array(x.length);
  for (let k = 0; k < x.length; k++) if (ok[k]) out[k] = x[k]! - mean;
  return out;
}

/** Σ_k c[k]·c[k + lag] in increasing k. */
function laggedProductSum(c: Float64Array, lag: number): number {
  let s = 0;
  for (let k = 0, end = c.length - lag; k < end; k++) s += c[k]! * c[k + lag]!;
  return s;
}
