import { lowPassZeroPhaseSegments } from "../filter/zero-phase-butterworth";
import type { LegEvents } from "./gait-events";
import {
  MS_LOW_PASS_HZ,
  SALARIAN_MIN_PEAK_DISTANCE_S,
  SALARIAN_SEARCH_WINDOW_S,
  allMasked,
  findPeaks,
  signalRelativeThresholds,
} from "./mid-swing-peaks";

/** IC/FC minima are searched on ω low-passed at this cut-off (Hz; removes impact ringing, common practice). */
export const SHANK_EVENT_LOW_PASS_HZ = 15;

/**
 * Shank gait events by the mid-swing-peak method (Aminian et al. 2002, J Biomech 35:689; Salarian
 * et al. 2004, IEEE TBME 51:1434): mid-swing (MS) = peaks of sagittal ω (forward swing positive)
 * ≥ 0.5 s apart on a 3 Hz low-passed copy; IC = first local minimum below the IC threshold within
 * 1.5 s after MS; FC = last local minimum below the FC threshold within 1.5 s before MS. Searches stop
 * at the neighbouring MS and never cross a sample outside `mask` (walking and valid). Thresholds are
 * relative to the signal (signalRelativeThresholds) so very slow gait still works.
 */
export function detectShankEvents(omegaDegS: ArrayLike<number>, mask: Uint8Array, sampleRateHz: number): LegEvents {
  const fs = sampleRateHz;
  const msSignal = lowPassZeroPhaseSegments(omegaDegS, mask, fs, MS_LOW_PASS_HZ, 4);
  const eventCut = Math.min(SHANK_EVENT_LOW_PASS_HZ, 0.4 * fs);
  const ev = lowPassZeroPhaseSegments(omegaDegS, mask, fs, eventCut, 4);
  const thr = signalRelativeThresholds(msSignal, mask);
  const peaks = findPeaks(msSignal, mask, thr.midSwingDegS, Math.round(SALARIAN_MIN_PEAK_DISTANCE_S * fs));
  // Re-centre each MS on the less-smoothed signal (the 3 Hz copy shifts asymmetric peaks a little).
  const win = Math.round(0.1 * fs);
  const ms = peaks.map((p) => {
    let best = p;
    for (let i = Math.max(0, p - win); i <= Math.min(ev.length - 1, p + win); i++) if (mask[i] && ev[i]! > ev[best]!) best = i;
    return best;
  });
  const search = Math.round(SALARIAN_SEARCH_WINDOW_S * fs);
  const ic: number[] = [];
  const fc: number[] = [];
  const isMin = (i: number) => ev[i]! < ev[i - 1]! && ev[i]! <= ev[i + 1]!;
  for (let k = 0; k < ms.length; k++) {
    const m = ms[k]!;
    const next = k + 1 < ms.length ? ms[k + 1]! : ev.length - 1;
    const prev = k > 0 ? ms[k - 1]! : 0;
    for (let i = m + 1; i < Math.min(m + search, next, ev.length - 1); i++) {
      if (!mask[i]) break;
      if (ev[i]! < thr.initialContactDegS && isMin(i)) {
        ic.push(i);
        break;
      }
    }
    for (let i = m - 1; i > Math.max(m - search, prev, 0); i--) {
      if (!mask[i]) break;
      if (ev[i]! < thr.finalContactDegS && isMin(i)) {
        if (allMasked(mask, i, m)) fc.push(i);
        break;
      }
    }
  }
  return {
    initialContactsS: ic.map((i) => i / fs),
    finalContactsS: fc.map((i) => i / fs),
    midSwingsS: ms.map((i) => i / fs),
  };
}
