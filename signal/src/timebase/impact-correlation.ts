/**
 * Lag correlation of two impact envelopes (same bin rate, same session grid) over a bounded lag
 * range, computed directly (no FFT): cost is bins × lags, and the lag range is small.
 *
 * r(τ) = Σ a′(t)·b′(t+τ) / √(Σ a′² · Σ b′²), a′ and b′ the envelopes minus their mean over the
 * bins used, summed over bins where both are valid and `active`. Lags run over
 * lagCentreBins ± maxLagBins; r[i] is the lag lagCentreBins + i − maxLagBins.
 */
export function lagCorrelation(
  a: Float32Array,
  b: Float32Array,
  validA: Uint8Array,
  validB: Uint8Array,
  active: Uint8Array,
  maxLagBins: number,
  fromBin: number,
  toBin: number,
  lagCentreBins = 0,
): { r: Float64Array; bins: number } {
  const m = Math.min(a.length, b.length, active.length);
  const from = Math.max(0, fromBin);
  const to = Math.min(m, toBin);
  const r = new Float64Array(2 * maxLagBins + 1);
  let sa = 0;
  let sb = 0;
  let na = 0;
  let nb = 0;
  for (let t = from; t < to; t++) {
    if (!active[t]) continue;
    if (validA[t]) {
      sa += a[t]!;
      na++;
    }
    if (validB[t]) {
      sb += b[t]!;
      nb++;
    }
  }
  if (na < 2 || nb < 2) return { r: r.fill(Number.NaN), bins: 0 };
  const ma = sa / na;
  const mb = sb / nb;
  let va = 0;
  let vb = 0;
  for (let t = from; t < to; t++) {
    if (!active[t]) continue;
    if (validA[t]) va += (a[t]! - ma) ** 2;
    if (validB[t]) vb += (b[t]! - mb) ** 2;
  }
  const norm = Math.sqrt(va * vb);
  if (!(norm > 0)) return { r: r.fill(Number.NaN), bins: 0 };
  // Centred, zeroed where unusable, so the inner loop is one multiply–add per (t, τ); only the
  // stretch each signal contributes is built (a window's correlation costs its own length).
  const ca = new Float64Array(to - from);
  for (let t = from; t < to; t++) ca[t - from] = active[t] && validA[t] ? a[t]! - ma : 0;
  const bFrom = Math.max(0, from + lagCentreBins - maxLagBins);
  const bTo = Math.min(m, to + lagCentreBins + maxLagBins + 1);
  const cb = new Float64Array(Math.max(0, bTo - bFrom));
  for (let t = bFrom; t < bTo; t++) cb[t - bFrom] = active[t] && validB[t] ? b[t]! - mb : 0;
  for (let li = 0; li < r.length; li++) {
    const lag = lagCentreBins + li - maxLagBins;
    const t0 = Math.max(from, bFrom - lag);
    const t1 = Math.min(to, bTo - lag);
    let s = 0;
    for (let t = t0, u = t0 + lag - bFrom; t < t1; t++, u++) s += ca[t - from]! * cb[u]!;
    r[li] = s / norm;
  }
  return { r, bins: na };
}

export interface LagPeak {
  /** Lag of the highest correlation (bins, sub-bin by parabolic interpolation). */
  lagBins: number;
  peak: number;
  /** Highest other local maximum at least `separationBins` away (0 when there is none). */
  runnerUp: number;
}

/**
 * Highest value of r (after a [1 2 1]/4 smoothing, which steadies the top of a broad peak) with a
 * parabolic sub-bin vertex, and the best other local maximum at least `separationBins` away.
 */
export function lagPeak(r: Float64Array, separationBins: number): LagPeak | null {
  const n = r.length;
  if (n < 3) return null;
  const s = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const l = r[Math.max(0, i - 1)]!;
    const c = r[i]!;
    const h = r[Math.min(n - 1, i + 1)]!;
    s[i] = (l + 2 * c + h) / 4;
  }
  let best = -1;
  for (let i = 0; i < n; i++) if (Number.isFinite(s[i]!) && (best < 0 || s[i]! > s[best]!)) best = i;
  if (best < 0) return null;
  let lag = best;
  if (best > 0 && best < n - 1) {
    const y0 = s[best - 1]!;
    const y1 = s[best]!;
    const y2 = s[best + 1]!;
    const den = y0 - 2 * y1 + y2;
    if (den < 0) lag = best + Math.max(-0.5, Math.min(0.5, (0.5 * (y0 - y2)) / den));
  }
  let runnerUp = 0;
  for (let i = 1; i < n - 1; i++) {
    if (Math.abs(i - best) < separationBins) continue;
    if (s[i]! > s[i - 1]! && s[i]! >= s[i + 1]! && s[i]! > runnerUp) runnerUp = s[i]!;
  }
  // An edge of the range still rising is a possible peak outside it.
  if (Math.abs(0 - best) >= separationBins && s[0]! > s[1]! && s[0]! > runnerUp) runnerUp = s[0]!;
  if (Math.abs(n - 1 - best) >= separationBins && s[n - 1]! > s[n - 2]! && s[n - 1]! > runnerUp) runnerUp = s[n - 1]!;
  return { lagBins: lag - (n - 1) / 2, peak: s[best]!, runnerUp };
}

export interface LagCandidate {
  /** Lag (bins from the centre of r, sub-bin by parabolic interpolation). */
  lagBins: number;
  peak: number;
}

/**
 * Every local maximum of r (after the same [1 2 1]/4 smoothing as lagPeak), highest first, with a
 * parabolic sub-bin vertex; a maximum within `separationBins` of a higher one is dropped. The ends
 * of the range are not candidates (a peak there may lie outside it).
 */
export function lagCandidates(r: Float64Array, separationBins: number): LagCandidate[] {
  const n = r.length;
  const s = new Float64Array(n);
  for (let i = 0; i < n; i++) s[i] = (r[Math.max(0, i - 1)]! + 2 * r[i]! + r[Math.min(n - 1, i + 1)]!) / 4;
  const found: Array<{ i: number; lag: number; peak: number }> = [];
  for (let i = 1; i < n - 1; i++) {
    if (!(s[i]! > s[i - 1]! && s[i]! >= s[i + 1]!)) continue;
    const den = s[i - 1]! - 2 * s[i]! + s[i + 1]!;
    const d = den < 0 ? Math.max(-0.5, Math.min(0.5, (0.5 * (s[i - 1]! - s[i + 1]!)) / den)) : 0;
    found.push({ i, lag: i + d - (n - 1) / 2, peak: s[i]! });
  }
  found.sort((a, b) => b.peak - a.peak);
  const kept: typeof found = [];
  for (const f of found) if (kept.every((k) => Math.abs(k.i - f.i) >= separationBins)) kept.push(f);
  return kept.map((k) => ({ lagBins: k.lag, peak: k.peak }));
}
