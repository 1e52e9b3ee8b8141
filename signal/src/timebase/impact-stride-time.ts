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
  for (let k = 0; k < m; k++) {
    let peak = 0;
    let good = 1;
    for (let i = k * block; i < (k + 1) * block; i++) {
      if (!valid[i] || !active[i]) good = 0;
      else if (envelope[i]! > peak) peak = envelope[i]!;
    }
    x[k] = peak;
    ok[k] = good;
  }
  let sum = 0;
  let cnt = 0;
  for (let k = 0; k < m; k++) if (ok[k]) {
    sum += x[k]!;
    cnt++;
  }
  if (cnt < 10) return null;
  const mean = sum / cnt;
  let v = 0;
  for (let k = 0; k < m; k++) if (ok[k]) v += (x[k]! - mean) ** 2;
  if (!(v > 0)) return null;
  const blockS = block / rateHz;
  const lo = Math.max(1, Math.floor(STRIDE_SEARCH_S[0] / blockS));
  const hi = Math.min(m - 1, Math.ceil(STRIDE_SEARCH_S[1] / blockS));
  let best = -1;
  let bestR = -Infinity;
  const rs = new Float64Array(hi + 2);
  for (let lag = lo; lag <= hi; lag++) {
    let s = 0;
    for (let k = 0; k + lag < m; k++) if (ok[k] && ok[k + lag]) s += (x[k]! - mean) * (x[k + lag]! - mean);
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
