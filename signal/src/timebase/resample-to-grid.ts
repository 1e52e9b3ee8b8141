import type { Bout, Placement, SensorRecording } from "../types";
import type { SessionGrid } from "./session-grid";

/** Gaps up to this long are bridged by linear interpolation; longer ones invalidate their span. */
export const MAX_INTERPOLATED_GAP_S = 0.15;
/** An interval longer than this many nominal periods counts as a gap (at least one sample missing). */
export const GAP_PERIOD_FACTOR = 1.5;

export interface TimeGap {
  startS: number;
  endS: number;
  interpolated: boolean;
}

export interface ResampledSensor {
  fileName: string;
  placement: Placement | null;
  nominalSampleRateHz: number;
  /** Mean sampling rate over the intervals that are not gaps (the device clock as written in t_s). */
  effectiveSampleRateHz: number;
  accX: Float32Array;
  accY: Float32Array;
  accZ: Float32Array;
  gyroX: Float32Array;
  gyroY: Float32Array;
  gyroZ: Float32Array;
  /** 1 where the sample is covered by the recording and not inside a long gap. */
  valid: Uint8Array;
  gaps: TimeGap[];
  /** Long gaps (> MAX_INTERPOLATED_GAP_S) on the session time base. */
  invalidSpans: Bout[];
  coveredFromS: number;
  coveredToS: number;
}

/**
 * median(Δt) + k·1.4826·MAD(Δt) over at most ~4096 evenly spaced intervals (robust to the gaps
 * themselves; the subsample keeps this O(n) on 30-minute files).
 */
export function intervalSpreadLimit(t: Float64Array, k: number): number {
  const n = t.length;
  if (n < 3) return Number.POSITIVE_INFINITY;
  const step = Math.max(1, Math.floor((n - 1) / 4096));
  const d = new Float64Array(Math.floor((n - 2) / step) + 1);
  let plain = true;
  for (let i = 1, j = 0; i < n; i += step, j++) {
    const x = t[i]! - t[i - 1]!;
    d[j] = x;
    if (x - x !== 0 || (x === 0 && 1 / x < 0)) plain = false;
  }
  // A typed array sorts numerically with no comparator call per pair; for finite values other
  // than −0 that is the order (a, b) => a − b gives, so the median picked is the same number, and
  // their |x − median| are finite and never −0 either.
  if (!plain) return spreadLimitOfList(Array.from(d), k);
  d.sort();
  const med = d[d.length >> 1]!;
  for (let j = 0; j < d.length; j++) d[j] = Math.abs(d[j]! - med);
  d.sort();
  const mad = d[d.length >> 1]!;
  return med + k * 1.4826 * mad;
}

/** intervalSpreadLimit's rule on a plain list (NaN or −0 in it sort as the comparator says). */
function spreadLimitOfList(d: number[], k: number): number {
  d.sort((a, b) => a - b);
  const med = d[d.length >> 1]!;
  const dev = d.map((x) => Math.abs(x - med)).sort((a, b) => a - b);
  const mad = dev[dev.length >> 1]!;
  return med + k * 1.4826 * mad;
}

/**
 * Linear resampling of one recording onto the session grid in one forward pass (O(n + m)). Grid
 * samples outside the recording, or between two samples further apart than MAX_INTERPOLATED_GAP_S,
 * are marked invalid and set to 0. All six channels are interpolated together: the analysis reads
 * every sensor's accelerometer (impact signals, strap check, wrist orientation), and one pass
 * finds each grid sample's interval and weight once instead of once per three channels.
 */
export function resampleToGrid(rec: SensorRecording, grid: SessionGrid, index: number): ResampledSensor {
  const offset = grid.offsetsS[index] ?? 0;
  const t = rec.timeS;
  const n = t.length;
  const m = grid.length;
  const fs = grid.sampleRateHz;
  const valid = new Uint8Array(m);

  const period = 1 / rec.nominalSampleRateHz;
  // Jittered timestamps spread the intervals; a dropped packet must stand out from that spread
  // (median + 5 robust SDs), not merely exceed 1.5 periods, or every jittery file is full of "gaps".
  const gapLimit = Math.max(GAP_PERIOD_FACTOR * period, intervalSpreadLimit(t, 5));
  const gaps: TimeGap[] = [];
  const invalidSpans: Bout[] = [];
  const missingSamples = scanGaps(t, gapLimit, offset, period, gaps, invalidSpans);
  // The device clock's rate over the whole file, counting the samples the gaps lost: unbiased under
  // jitter (a mean over "non-gap" intervals leans high because long jittered intervals are dropped).
  const spanS = n > 1 ? t[n - 1]! - t[0]! : 0;
  const effectiveSampleRateHz = spanS > 0 ? (n - 1 + missingSamples) / spanS : rec.nominalSampleRateHz;

  const first = offset + t[0]!;
  const last = offset + t[n - 1]!;
  const kStart = Math.max(0, Math.ceil((first - 1e-9) * fs));
  const kEnd = Math.min(m - 1, Math.floor((last + 1e-9) * fs));
  const gyroX = new Float32Array(m);
  const gyroY = new Float32Array(m);
  const gyroZ = new Float32Array(m);
  const accX = new Float32Array(m);
  const accY = new Float32Array(m);
  const accZ = new Float32Array(m);
  interpolateOnGrid(t, fs, offset, kStart, kEnd, valid, rec.gyroX, rec.gyroY, rec.gyroZ, rec.accX, rec.accY, rec.accZ, gyroX, gyroY, gyroZ, accX, accY, accZ);
  return {
    fileName: rec.fileName,
    placement: rec.placement,
    nominalSampleRateHz: rec.nominalSampleRateHz,
    effectiveSampleRateHz,
    accX,
    accY,
    accZ,
    gyroX,
    gyroY,
    gyroZ,
    valid,
    gaps,
    invalidSpans,
    coveredFromS: first,
    coveredToS: last,
  };
}

/**
 * Intervals longer than gapLimit, pushed to `gaps` (and, beyond MAX_INTERPOLATED_GAP_S, to
 * `invalidSpans`) on the session time base; returns the number of samples they lost. A small
 * function of its own so resampleToGrid is not compiled in the middle of this loop.
 */
function scanGaps(t: Float64Array, gapLimit: number, offset: number, period: number, gaps: TimeGap[], invalidSpans: Bout[]): number {
  let missingSamples = 0;
  for (let i = 1; i < t.length; i++) {
    const dt = t[i]! - t[i - 1]!;
    if (dt > gapLimit) {
      const interpolated = dt <= MAX_INTERPOLATED_GAP_S + 1e-9;
      gaps.push({ startS: offset + t[i - 1]!, endS: offset + t[i]!, interpolated });
      if (!interpolated) invalidSpans.push({ startS: offset + t[i - 1]!, endS: offset + t[i]! });
      missingSamples += Math.max(0, Math.round(dt / period) - 1);
    }
  }
  return missingSamples;
}

/**
 * The six channels linearly interpolated onto grid samples kStart…kEnd (k / fs − offset on the
 * recording's clock), in one pass that finds each sample's interval and weight once for all six;
 * samples inside a gap longer than MAX_INTERPOLATED_GAP_S stay 0, the others are set to 1 in `mark`.
 */
function interpolateOnGrid(
  t: Float64Array,
  fs: number,
  offset: number,
  kStart: number,
  kEnd: number,
  mark: Uint8Array,
  x: Float32Array,
  y: Float32Array,
  z: Float32Array,
  a: Float32Array,
  b: Float32Array,
  c: Float32Array,
  ox: Float32Array,
  oy: Float32Array,
  oz: Float32Array,
  oa: Float32Array,
  ob: Float32Array,
  oc: Float32Array,
): void {
  const n = t.length;
  let j = 0;
  for (let k = kStart; k <= kEnd; k++) {
    const tl = k / fs - offset;
    while (j < n - 2 && t[j + 1]! <= tl) j++;
    const t0 = t[j]!;
    const t1 = n > 1 ? t[j + 1]! : t0;
    const span = t1 - t0;
    if (span > MAX_INTERPOLATED_GAP_S + 1e-9 && tl > t0 + 1e-9 && tl < t1 - 1e-9) continue;
    const w = span > 0 ? Math.min(1, Math.max(0, (tl - t0) / span)) : 0;
    const r = j + 1 < n ? j + 1 : n - 1;
    let v = x[j]!;
    ox[k] = v + (x[r]! - v) * w;
    v = y[j]!;
    oy[k] = v + (y[r]! - v) * w;
    v = z[j]!;
    oz[k] = v + (z[r]! - v) * w;
    v = a[j]!;
    oa[k] = v + (a[r]! - v) * w;
    v = b[j]!;
    ob[k] = v + (b[r]! - v) * w;
    v = c[j]!;
    oc[k] = v + (c[r]! - v) * w;
    mark[k] = 1;
  }
}
