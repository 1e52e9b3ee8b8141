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
  const d: number[] = [];
  for (let i = 1; i < n; i += step) d.push(t[i]! - t[i - 1]!);
  d.sort((a, b) => a - b);
  const med = d[d.length >> 1]!;
  const dev = d.map((x) => Math.abs(x - med)).sort((a, b) => a - b);
  const mad = dev[dev.length >> 1]!;
  return med + k * 1.4826 * mad;
}

/**
 * Linear resampling of one recording onto the session grid in one forward pass (O(n + m)). Grid
 * samples outside the recording, or between two samples further apart than MAX_INTERPOLATED_GAP_S,
 * are marked invalid and set to 0.
 */
export function resampleToGrid(rec: SensorRecording, grid: SessionGrid, index: number): ResampledSensor {
  const offset = grid.offsetsS[index] ?? 0;
  const t = rec.timeS;
  const n = t.length;
  const m = grid.length;
  const fs = grid.sampleRateHz;
  const src = [rec.accX, rec.accY, rec.accZ, rec.gyroX, rec.gyroY, rec.gyroZ];
  const out = src.map(() => new Float32Array(m));
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
  // One pass, the six channels unrolled (no per-sample channel array look-ups, no index buffers).
  const [ax, ay, az, gx, gy, gz] = src as [Float32Array, Float32Array, Float32Array, Float32Array, Float32Array, Float32Array];
  const [oax, oay, oaz, ogx, ogy, ogz] = out as [Float32Array, Float32Array, Float32Array, Float32Array, Float32Array, Float32Array];
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
    let v = ax[j]!;
    oax[k] = v + (ax[r]! - v) * w;
    v = ay[j]!;
    oay[k] = v + (ay[r]! - v) * w;
    v = az[j]!;
    oaz[k] = v + (az[r]! - v) * w;
    v = gx[j]!;
    ogx[k] = v + (gx[r]! - v) * w;
    v = gy[j]!;
    ogy[k] = v + (gy[r]! - v) * w;
    v = gz[j]!;
    ogz[k] = v + (gz[r]! - v) * w;
    valid[k] = 1;
  }

  return {
    fileName: rec.fileName,
    placement: rec.placement,
    nominalSampleRateHz: rec.nominalSampleRateHz,
    effectiveSampleRateHz,
    accX: out[0]!,
    accY: out[1]!,
    accZ: out[2]!,
    gyroX: out[3]!,
    gyroY: out[4]!,
    gyroZ: out[5]!,
    valid,
    gaps,
    invalidSpans,
    coveredFromS: first,
    coveredToS: last,
  };
}
