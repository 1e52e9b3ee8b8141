import { butterworthSections } from "../filter/butterworth-sections";
import { zeroPhaseSegments3 } from "../filter/zero-phase-butterworth";
import type { LegEvents } from "./gait-events";
import {
  MS_LOW_PASS_HZ,
  SALARIAN_MIN_PEAK_DISTANCE_S,
  allMasked,
  findPeaks,
  mergeSwingsWithoutStance,
  signalRelativeThresholds,
} from "./mid-swing-peaks";
import { type ShankAcceleration, refineContactsToImpact, shankImpactMagnitude } from "./shank-impact";

/**
 * IC/FC minima are read on ω low-passed at this cut-off (Hz): strap and soft-tissue vibration and
 * impact ringing above it are removed (common practice; the same cut-off as the foot rule and the
 * reference events of the stroke treadmill data).
 */
export const SHANK_EVENT_LOW_PASS_HZ = 15;
/**
 * The stance lobe that holds the final contact is located on ω low-passed at this cut-off (Hz), the
 * 5 Hz of Greene et al. 2010's adaptive shank method as re-implemented
 * (docs/methods.md#shank-gyroscope-events): ripples shorter than ~100 ms cannot form a lobe of
 * their own there.
 */
export const SHANK_LOBE_LOW_PASS_HZ = 5;
/**
 * Contacts are searched from a mid-swing up to this fraction of the interval to the neighbouring
 * mid-swing: between two mid-swings the stance is centred half-way (IC and FC sit about half a
 * swing on either side of MS), so the IC search stops at mid-stance, as Rampp et al. 2015's does,
 * and the FC search starts there (common practice). No fixed ceiling in seconds: a 3.4 s stride
 * (35 steps/min) gets a 1.7 s window.
 */
export const SHANK_SEARCH_FRACTION_OF_STRIDE = 0.5;

/**
 * Shank gait events by the mid-swing-peak method (Aminian et al. 2002, J Biomech 35:689; Salarian
 * et al. 2004, IEEE TBME 51:1434), made robust for impaired gait:
 * - MS = peaks of sagittal ω (forward swing positive) ≥ 0.5 s apart on a 3 Hz low-passed copy, with
 *   signal-relative thresholds (signalRelativeThresholds), re-centred on the 15 Hz copy; two peaks
 *   with no stance (backward rotation) between them are one swing (mergeSwingsWithoutStance);
 * - IC = the first negative minimum (below the IC threshold) after MS that ends the swing. A minimum
 *   is passed over when the shank then swings forward again — ω climbs back to swing level (the MS
 *   threshold) and faster than the backward rotation at that minimum was. That is a terminal-swing
 *   dip of a hesitant limb, not a contact: a contact reverses the shank (ground reaction), and any
 *   rebound after it is smaller than the reversal. Checked against each shank's own impact on the
 *   stroke treadmill walks (signal/README.md).
 * - FC = the last negative minimum (below the FC threshold) before MS, inside the pre-swing lobe of
 *   the 5 Hz copy: the lobe is the last local minimum of the 5 Hz copy below the threshold, and the
 *   15 Hz minimum is taken within half a 5 Hz period of it, so a ripple on the rise into swing
 *   cannot be taken for push-off. Falls back to Salarian's rule when the 5 Hz copy has no lobe.
 * - With the shank's accelerometer (`acceleration`), each IC is then moved to the heel-strike impact
 *   the same shank feels (shank-impact.ts): the ω minimum is the loading response, which follows the
 *   contact by up to 10 % of the cycle; without a clear impact the ω minimum is kept.
 * Searches run between neighbouring mid-swings (SHANK_SEARCH_FRACTION_OF_STRIDE) and never cross a
 * sample outside `mask` (walking and valid).
 */
export function detectShankEvents(
  omegaDegS: ArrayLike<number>,
  mask: Uint8Array,
  sampleRateHz: number,
  acceleration?: ShankAcceleration,
): LegEvents {
  const fs = sampleRateHz;
  // The three low-passed copies in one pass (each identical to its own lowPassZeroPhaseSegments).
  const [msSignal, ev, lobe] = zeroPhaseSegments3(
    [omegaDegS, omegaDegS, omegaDegS],
    [
      butterworthSections("lowpass", 4, MS_LOW_PASS_HZ, fs),
      butterworthSections("lowpass", 4, Math.min(SHANK_EVENT_LOW_PASS_HZ, 0.4 * fs), fs),
      butterworthSections("lowpass", 4, Math.min(SHANK_LOBE_LOW_PASS_HZ, 0.4 * fs), fs),
    ],
    mask,
  );
  const thr = signalRelativeThresholds(msSignal, mask);
  const peaks = findPeaks(msSignal, mask, thr.midSwingDegS, Math.round(SALARIAN_MIN_PEAK_DISTANCE_S * fs));
  // Re-centre each MS on the less-smoothed signal (the 3 Hz copy shifts asymmetric peaks a little).
  const win = Math.round(0.1 * fs);
  const ms = mergeSwingsWithoutStance(peaks, msSignal, ev, mask, fs).map((p) => {
    let best = p;
    for (let i = Math.max(0, p - win); i <= Math.min(ev.length - 1, p + win); i++) if (mask[i] && ev[i]! > ev[best]!) best = i;
    return best;
  });
  const intervals = ms.slice(1).map((m, k) => m - ms[k]!);
  const typical = median(intervals) ?? Math.round(1.1 * fs);
  // Half a period of the 5 Hz lobe copy: how far its minimum can sit from the 15 Hz one.
  const reach = Math.max(1, Math.round(fs / (2 * SHANK_LOBE_LOW_PASS_HZ)));
  let ic: number[] = [];
  const icMidSwing: number[] = [];
  const icStride: number[] = [];
  const fc: number[] = [];
  for (let k = 0; k < ms.length; k++) {
    const m = ms[k]!;
    const after = k + 1 < ms.length ? ms[k + 1]! - m : typical;
    const before = k > 0 ? m - ms[k - 1]! : typical;
    const i = initialContact(ev, mask, m, Math.round(SHANK_SEARCH_FRACTION_OF_STRIDE * after), thr.initialContactDegS, thr.midSwingDegS);
    if (i !== null) {
      ic.push(i);
      icMidSwing.push(m);
      icStride.push(after);
    }
    const f = finalContact(ev, lobe, mask, m, Math.round(SHANK_SEARCH_FRACTION_OF_STRIDE * before), thr.finalContactDegS, reach);
    if (f !== null) fc.push(f);
  }
  // The three low-passed copies are not read again: the impact filter reuses their arrays.
  const impact = acceleration ? shankImpactMagnitude(acceleration, mask, fs, [msSignal, ev, lobe]) : null;
  if (impact) ic = refineContactsToImpact(ic, icMidSwing, icStride, impact, mask, fs);
  return {
    initialContactsS: ic.map((i) => i / fs),
    finalContactsS: fc.map((i) => i / fs),
    midSwingsS: ms.map((i) => i / fs),
  };
}

function isLocalMin(x: ArrayLike<number>, i: number): boolean {
  return i > 0 && i < x.length - 1 && x[i]! < x[i - 1]! && x[i]! <= x[i + 1]!;
}

/** First minimum after MS (within `span` samples) not followed by a renewed forward swing. */
function initialContact(ev: Float64Array, mask: Uint8Array, ms: number, span: number, icThr: number, swingThr: number): number | null {
  const end = Math.min(ms + span, ev.length - 2);
  const candidates: number[] = [];
  for (let i = ms + 1; i <= end; i++) {
    if (!mask[i]) break;
    if (ev[i]! < icThr && isLocalMin(ev, i)) candidates.push(i);
  }
  for (let c = 0; c < candidates.length; c++) {
    const here = candidates[c]!;
    const next = candidates[c + 1];
    if (next === undefined) return here;
    let rebound = -Infinity;
    for (let i = here; i < next; i++) rebound = Math.max(rebound, ev[i]!);
    if (rebound >= swingThr && rebound > -ev[here]!) continue;
    return here;
  }
  return null;
}

/** Last minimum before MS (within `span` samples) inside the 5 Hz copy's pre-swing lobe. */
function finalContact(ev: Float64Array, lobe: Float64Array, mask: Uint8Array, ms: number, span: number, fcThr: number, reach: number): number | null {
  const start = Math.max(1, ms - span);
  let anchor = -1;
  for (let i = ms - 1; i > start; i--) {
    if (!mask[i]) break;
    if (lobe[i]! < fcThr && isLocalMin(lobe, i)) {
      anchor = i;
      break;
    }
  }
  let found = -1;
  if (anchor >= 0) {
    const a = Math.max(start, anchor - reach);
    const b = Math.min(ms - 1, anchor + reach);
    for (let i = b; i >= a; i--) {
      if (ev[i]! < fcThr && isLocalMin(ev, i)) {
        found = i;
        break;
      }
    }
    if (found < 0) {
      found = a;
      for (let i = a; i <= b; i++) if (ev[i]! < ev[found]!) found = i;
    }
  } else {
    // No lobe on the 5 Hz copy (a brief push-off): Salarian's last minimum below the threshold.
    for (let i = ms - 1; i > start; i--) {
      if (!mask[i]) break;
      if (ev[i]! < fcThr && isLocalMin(ev, i)) {
        found = i;
        break;
      }
    }
  }
  if (found < 0 || !allMasked(mask, found, ms)) return null;
  return found;
}

function median(values: number[]): number | null {
  if (values.length === 0) return null;
  const s = [...values].sort((a, b) => a - b);
  const h = s.length >> 1;
  return s.length % 2 ? s[h]! : (s[h - 1]! + s[h]!) / 2;
}
