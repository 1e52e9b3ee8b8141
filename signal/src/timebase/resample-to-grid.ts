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
 * are marked invalid and set to 0. The accelerometer channels are computed on first access (same
 * values either way), so callers that only need the gyroscope never allocate them.
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
  let missingSamples = 0;
  for (let i = 1; i < n; i++) {
    const dt = t[i]! - t[i - 1]!;
    if (dt > gapLimit) {
      const interpolated = dt <= MAX_INTERPOLATED_GAP_S + 1e-9;
      gaps.push({ startS: offset + t[i - 1]!, endS: offset + t[i]!, interpolated });
      if (!interpolated) invalidSpans.push({ startS: offset + t[i - 1]!, endS: offset + t[i]! });
      missingSamples += Math.max(0, Math.round(dt / period) - 1);
    }
  }
  // The device clock's rate over the whole file, counting the samples the gaps lost: unbiased under
  // jitter (a mean over "non-gap" intervals leans high because long jittered intervals are dropped).
  const spanS = n > 1 ? t[n - 1]! - t[0]! : 0;
  const effectiveSampleRateHz = spanS > 0 ? (n - 1 + missingSamples) / spanS : rec.nominalSampleRateHz;

  const first = offset + t[0]!;
  const last = offset + t[n - 1]!;
  const kStart = Math.max(0, Math.ceil((first - 1e-9) * fs));
  const kEnd = Math.min(m - 1, Math.floor((last + 1e-9) * fs));
  const grid3 = (x: Float32Array, y: Float32Array, z: Float32Array, mark: Uint8Array | null) =>
    interpolateOnGrid(t, x, y, z, fs, offset, kStart, kEnd, m, mark);
  const [gyroX, gyroY, gyroZ] = grid3(rec.gyroX, rec.gyroY, rec.gyroZ, valid);
  // The accelerometer is interpolated on first use: analyze() reads it only for the yaw of the
  // leg (or lower-back) sensors, so the wrists' 3 × 4 bytes × grid samples are never allocated.
  let acc: [Float32Array, Float32Array, Float32Array] | null = null;
  const accAxis = (c: number): Float32Array => (acc ??= grid3(rec.accX, rec.accY, rec.accZ, null))[c]!;
  return {
    fileName: rec.fileName,
    placement: rec.placement,
    nominalSampleRateHz: rec.nominalSampleRateHz,
    effectiveSampleRateHz,
    get accX() {
      return accAxis(0);
    },
    get accY() {
      return accAxis(1);
    },
    get accZ() {
      return accAxis(2);
    },
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
 * Three channels linearly interpolated onto grid samples kStart…kEnd (k / fs − offset on the
 * recording's clock); samples inside a gap longer than MAX_INTERPOLATED_GAP_S stay 0. When `mark`
 * is given, the interpolated samples are set to 1 in it. The three channels are unrolled in one pass.
 */
function interpolateOnGrid(
  t: Float64Array,
  x: Float32Array,
  y: Float32Array,
  z: Float32Array,
  fs: number,
  offset: number,
  kStart: number,
  kEnd: number,
  m: number,
  mark: Uint8Array | null,
): [Float32Array, Float32Array, Float32Array] {
  const n = t.length;
  const ox = new Float32Array(m);
  const oy = new Float32Array(m);
  const oz = new Float32Array(m);
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
    if (mark) mark[k] = 1;
  }
  return [ox, oy, oz];
}
