import { lowPassZeroPhaseSegments } from "../filter/zero-phase-butterworth";
import type { LegEvents } from "./gait-events";
import { MS_LOW_PASS_HZ, SALARIAN_MIN_PEAK_DISTANCE_S, findPeaks, signalRelativeThresholds } from "./mid-swing-peaks";

/** Foot events are searched on ω low-passed at this cut-off (Hz): the published low-pass variant against IC bounce. */
export const FOOT_EVENT_LOW_PASS_HZ = 15;
/**
 * Rampp et al. 2015 search the IC from the gyro maximum to 60 % of a stride segmented from push-off to
 * push-off, where mid-swing sits at about 20 %: i.e. up to ~40 % of a stride after MS.
 */
export const FOOT_IC_SEARCH_FRACTION = 0.4;
/** The push-off minimum that precedes toe-off lies within this fraction of a stride before MS. */
export const FOOT_PUSH_OFF_SEARCH_FRACTION = 0.4;

/**
 * Foot-IMU gait events after Rampp et al. 2015 (IEEE TBME 62:1089), with strides segmented by the
 * mid-swing peaks of the sagittal foot ω (forward rotation of the toes upward positive) instead of
 * template matching:
 * - FC (toe-off) = the negative-to-positive zero crossing of ω that follows the push-off minimum
 *   before MS (Rampp: first zero crossing of the mediolateral gyro in the segmented stride);
 * - IC = minimum of ω between the steepest negative slope after MS and the next steepest positive
 *   slope (Rampp's heel-strike candidate, searched from the gyro maximum).
 * Rampp refine the IC to an extremum of the anterior–posterior acceleration within −80/+50 ms; that
 * needs the foot's AP axis, which the unknown mounting does not give reliably, so it is not applied
 * here (documented in signal/README.md).
 */
export function detectFootEvents(omegaDegS: ArrayLike<number>, mask: Uint8Array, sampleRateHz: number): LegEvents {
  const fs = sampleRateHz;
  const msSignal = lowPassZeroPhaseSegments(omegaDegS, mask, fs, MS_LOW_PASS_HZ, 4);
  const ev = lowPassZeroPhaseSegments(omegaDegS, mask, fs, Math.min(FOOT_EVENT_LOW_PASS_HZ, 0.4 * fs), 4);
  const thr = signalRelativeThresholds(msSignal, mask);
  const peaks = findPeaks(msSignal, mask, thr.midSwingDegS, Math.round(SALARIAN_MIN_PEAK_DISTANCE_S * fs));
  const win = Math.round(0.1 * fs);
  const ms = peaks.map((p) => {
    let best = p;
    for (let i = Math.max(0, p - win); i <= Math.min(ev.length - 1, p + win); i++) if (mask[i] && ev[i]! > ev[best]!) best = i;
    return best;
  });
  const intervals = ms.slice(1).map((m, k) => m - ms[k]!);
  const typical = median(intervals.filter((d) => d <= 2.25 * fs)) ?? Math.round(1.1 * fs);
  const ic: number[] = [];
  const fc: number[] = [];
  for (let k = 0; k < ms.length; k++) {
    const m = ms[k]!;
    const before = k > 0 ? Math.min(m - ms[k - 1]!, 2 * typical) : typical;
    const after = k + 1 < ms.length ? Math.min(ms[k + 1]! - m, 2 * typical) : typical;

    // FC: push-off minimum, then the zero crossing towards MS.
    const fcFrom = Math.max(1, m - Math.round(FOOT_PUSH_OFF_SEARCH_FRACTION * before));
    let pushOff = -1;
    let ok = true;
    for (let i = m; i >= fcFrom; i--) {
      if (!mask[i]) {
        ok = false;
        break;
      }
      if (pushOff < 0 || ev[i]! < ev[pushOff]!) pushOff = i;
    }
    if (ok && pushOff >= 0 && ev[pushOff]! < thr.finalContactDegS) {
      for (let i = pushOff; i < m; i++) {
        if (ev[i]! < 0 && ev[i + 1]! >= 0) {
          fc.push((i + ev[i]! / (ev[i]! - ev[i + 1]!)) / fs);
          break;
        }
      }
    }

    // IC: steepest fall after MS, then the next steepest rise; the minimum between them.
    const icTo = Math.min(ev.length - 2, m + Math.round(FOOT_IC_SEARCH_FRACTION * after));
    let steepFall = -1;
    for (let i = m; i <= icTo; i++) {
      if (!mask[i] || !mask[i + 1]) break;
      const g = ev[i + 1]! - ev[i]!;
      if (steepFall < 0 || g < ev[steepFall + 1]! - ev[steepFall]!) steepFall = i;
    }
    if (steepFall < 0) continue;
    let steepRise = -1;
    for (let i = steepFall; i <= icTo; i++) {
      if (!mask[i] || !mask[i + 1]) break;
      const g = ev[i + 1]! - ev[i]!;
      if (steepRise < 0 || g > ev[steepRise + 1]! - ev[steepRise]!) steepRise = i;
    }
    if (steepRise <= steepFall) continue;
    let best = steepFall;
    for (let i = steepFall; i <= steepRise; i++) if (ev[i]! < ev[best]!) best = i;
    if (ev[best]! < thr.initialContactDegS) ic.push(best / fs);
  }
  return { initialContactsS: ic, finalContactsS: fc, midSwingsS: ms.map((i) => i / fs) };
}

function median(values: number[]): number | null {
  if (values.length === 0) return null;
  const s = [...values].sort((a, b) => a - b);
  const h = s.length >> 1;
  return s.length % 2 ? s[h]! : (s[h - 1]! + s[h]!) / 2;
}
