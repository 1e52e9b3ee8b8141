import {
  DRIFT_SEARCH_S,
  DRIFT_WINDOW_S,
  type DriftFit,
  type EnvelopeInput,
  fitDrift,
  impactLag,
  MAX_CLOCK_OFFSET_S,
  MIN_DRIFT_WINDOWS,
  MIN_PEAK_CORRELATION,
  searchSpan,
  STEP_FRACTION_SEARCH,
} from "./clock-offset";
import { lagCorrelation, lagPeak } from "./impact-correlation";

/**
 * Clock offset of a wrist sensor against the legs, from heel-strike impacts.
 *
 * Why it works: each heel strike sends a transient up the body, so a wrist feels every strike of
 * both feet, attenuated. Its impact envelope (acceleration high-passed well above the arm-swing band,
 * impact-signal.ts) is therefore a step-periodic train that lines up with the legs' combined train:
 * the sum of the two leg sensors' envelopes once the right leg is on the left leg's clock.
 *
 * Why the search spans less than half a step: the combined train repeats every step, so its
 * correlation with the wrist has a peak every step, all about as high. Within ±STEP_FRACTION_SEARCH
 * step there is exactly one; a wider range could lock onto the neighbouring step and "correct" the
 * wrist by a whole step. The price: an offset beyond that range (e.g. > 0.25 s at 1.1 s strides) is
 * seen one step off, or on the edge of the range (then not strong). Wireless start-up errors are far
 * smaller (MAX_CLOCK_OFFSET_S, common practice).
 *
 * What it assumes: the impact reaches the wrist with no delay that matters next to the 20 ms report
 * threshold (the transient crosses the body in a few ms; the arm's response to it is not measured
 * here — unvalidated: no recording with wrists and legs on one clock). Unlike the left–right leg
 * offset, this delay does not cancel, so any real delay is read as clock offset.
 *
 * Why both legs are checked separately: an arm on a walking aid feels the aid's taps, which follow one
 * foot and not at its heel strike. Then the wrist correlates with one leg's own train only, or at a
 * different lag than with the other's. The offset is taken only when each leg's own train reaches the
 * wrist (peak ≥ MIN_PEAK_CORRELATION and ≥ half the other's) at lags that agree within
 * MAX_LEG_LAG_DISAGREEMENT_S. A tap that coincides with a heel strike passes unnoticed (caveat).
 */

/** The two legs' lags to the wrist must agree within this (s): the report threshold (common practice). */
export const MAX_LEG_LAG_DISAGREEMENT_S = 0.02;
/** Each leg's lag is looked for this far around the combined one (s): a broad impact peak's half width (common practice). */
const PER_LEG_SEARCH_S = 0.06;

export interface WristClockEstimate {
  /** Add to the wrist's clock to put it on the legs' (s). */
  offsetS: number;
  strong: boolean;
  /** Normalised correlation at the offset, and the best other peak within the search range. */
  peak: number;
  runnerUp: number;
  /** Lag of each leg's own train (s); null when that leg's peak is not found. */
  leftLagS: number | null;
  rightLagS: number | null;
  /** Why the estimate is not strong, when it is not. */
  reason: string | null;
}

/** The legs' combined impact train: the sum of the two envelopes where both are valid (same clock). */
export function combinedImpactTrain(left: EnvelopeInput, right: EnvelopeInput): EnvelopeInput {
  const m = Math.min(left.envelope.length, right.envelope.length);
  const envelope = new Float32Array(m);
  const valid = new Uint8Array(m);
  for (let k = 0; k < m; k++) {
    if (!left.valid[k] || !right.valid[k]) continue;
    envelope[k] = left.envelope[k]! + right.envelope[k]!;
    valid[k] = 1;
  }
  return { envelope, valid };
}

/**
 * Offset of one wrist against the legs (left leg's clock, right leg already aligned to it): lag of the
 * legs' combined train behind the wrist's within ±STEP_FRACTION_SEARCH step, coarse scan then sub-bin
 * peak (impactLag); strong when impactLag calls it strong (peak ≥ MIN_PEAK_CORRELATION, ≥
 * MIN_PEAK_TO_RUNNER_UP × the next-best lag, not on the range's edge) and both legs agree (above).
 */
export function estimateWristClockOffset(
  left: EnvelopeInput,
  right: EnvelopeInput,
  wrist: EnvelopeInput,
  active: Uint8Array,
  rateHz: number,
  stepTimeS: number,
): WristClockEstimate | null {
  const legs = combinedImpactTrain(left, right);
  const maxLagS = Math.min(MAX_CLOCK_OFFSET_S, STEP_FRACTION_SEARCH * stepTimeS);
  const span = searchSpan(active, rateHz);
  // legs(t + lag) ≈ wrist(t); the wrist's sample stamped t holds the body at t + offset, so lag = offset.
  const whole = impactLag(wrist, legs, active, rateHz, maxLagS, span);
  if (!whole) return null;
  const base = { offsetS: whole.lagS, peak: whole.peak, runnerUp: whole.runnerUp, leftLagS: null, rightLagS: null };
  if (!whole.strong) {
    return { ...base, strong: false, reason: "the heel-strike impacts felt by the wrist give no clear lag against the legs' (an arm on a walking aid, or held against the body, may feel them too faintly)" };
  }
  const perLeg = (leg: EnvelopeInput): { lagS: number; peak: number } | null => {
    const centre = Math.round(whole.lagS * rateHz);
    const half = Math.max(2, Math.round(PER_LEG_SEARCH_S * rateHz));
    const { r, bins } = lagCorrelation(wrist.envelope, leg.envelope, wrist.valid, leg.valid, active, half, span.from, span.to, centre);
    if (bins === 0) return null;
    const p = lagPeak(r, half);
    if (!p || Math.abs(p.lagBins) >= half - 0.5) return null; // on the edge: no peak of its own here
    return { lagS: (centre + p.lagBins) / rateHz, peak: p.peak };
  };
  const l = perLeg(left);
  const r = perLeg(right);
  const lagged = { ...base, leftLagS: l?.lagS ?? null, rightLagS: r?.lagS ?? null };
  const bothFelt = l && r && Math.min(l.peak, r.peak) >= MIN_PEAK_CORRELATION && Math.min(l.peak, r.peak) >= 0.5 * Math.max(l.peak, r.peak);
  if (!bothFelt) {
    return { ...lagged, strong: false, reason: "the wrist does not feel both feet's heel strikes alike (an arm on a walking aid feels the aid's taps, which follow one foot)" };
  }
  if (Math.abs(l.lagS - r.lagS) > MAX_LEG_LAG_DISAGREEMENT_S) {
    return { ...lagged, strong: false, reason: `the two legs' impacts reach the wrist ${(1000 * Math.abs(l.lagS - r.lagS)).toFixed(0)} ms apart (a walking aid's taps, or legs not on one clock)` };
  }
  return { ...lagged, strong: true, reason: null };
}

/**
 * The wrist's offset along the session, for drift (a wrist's crystal drifts like a leg's): per
 * DRIFT_WINDOW_S window the lag of the legs' combined train behind the wrist's, searched only within
 * ±DRIFT_SEARCH_S of the whole-session offset (a window has too few steps to settle which step is
 * which on its own), kept when it peaks inside that range at r ≥ MIN_PEAK_CORRELATION; then the same
 * straight-line rule as the legs' (fitDrift: MIN_DRIFT_WINDOWS windows, significance and effect).
 * Null on sessions shorter than two windows or with too few usable ones: the whole-session offset
 * stands.
 */
export function wristClockDrift(
  left: EnvelopeInput,
  right: EnvelopeInput,
  wrist: EnvelopeInput,
  active: Uint8Array,
  rateHz: number,
  wholeOffsetS: number,
): DriftFit | null {
  const windowBins = Math.round(DRIFT_WINDOW_S * rateHz);
  const m = active.length;
  if (m < 2 * windowBins) return null;
  const legs = combinedImpactTrain(left, right);
  const centre = Math.round(wholeOffsetS * rateHz);
  const half = Math.max(2, Math.ceil(DRIFT_SEARCH_S * rateHz));
  const points: Array<{ centreS: number; offsetS: number }> = [];
  for (let from = 0; from + windowBins <= m; from += windowBins) {
    const { r, bins } = lagCorrelation(wrist.envelope, legs.envelope, wrist.valid, legs.valid, active, half, from, from + windowBins, centre);
    // At least a minute of walking in the window (tens of steps; common practice).
    if (bins < 60 * rateHz) continue;
    const p = lagPeak(r, half);
    if (!p || p.peak < MIN_PEAK_CORRELATION || Math.abs(p.lagBins) >= half - 0.5) continue;
    points.push({ centreS: (from + windowBins / 2) / rateHz, offsetS: (centre + p.lagBins) / rateHz });
  }
  return points.length >= MIN_DRIFT_WINDOWS ? fitDrift(points) : null;
}
