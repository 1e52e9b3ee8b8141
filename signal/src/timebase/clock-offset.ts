import { lagCorrelation, lagPeak } from "./impact-correlation";

/**
 * Clock offset between the left and right leg sensor, from heel-strike impacts felt by a third
 * "bridge" sensor that sees both feet about equally (lower back, or a wrist).
 *
 * Why a bridge and not the two legs directly: each leg sensor feels its OWN heel strike several
 * times more strongly than the other leg's. The impact trains of the two legs therefore correlate
 * best when the left strikes are laid on the right strikes, one step apart; shifting one clock is
 * then indistinguishable from stepping asymmetrically (the very thing PCI measures). A sensor on the
 * trunk or an arm is struck by both feet, so its impact train has no own leg.
 *
 * Why the physical delay does not bias the estimate: lag(left leg → bridge) contains the bridge's
 * offset plus the time the impact takes to reach the bridge and to build up there; lag(right leg →
 * bridge) contains the same two terms. Their difference is the right leg's clock offset relative to
 * the left, provided the delay leg → bridge is the same for both legs (assumption: the body is
 * mechanically near-symmetric at this scale — a few ms; not verified on impaired gait).
 *
 * Why the search is limited to ±0.45 step: the bridge's train repeats every step, so its
 * correlation with a leg repeats every step too; beyond half a step the neighbouring strike would
 * win. Offsets larger than that are outside what this method can tell; the anti-phase check of the
 * legs (analyze step) catches a lock onto the wrong step.
 */

/** Largest offset looked for (s): wireless start-up synchronisation errors are far smaller (common practice). */
export const MAX_CLOCK_OFFSET_S = 0.5;
/** Fraction of a step the lag search may span either side of 0 (< 0.5, see above). */
export const STEP_FRACTION_SEARCH = 0.45;
/** A peak must exceed the next-best peak at another lag by this factor to count (common practice). */
export const MIN_PEAK_TO_RUNNER_UP = 1.2;
/** Minimum normalised correlation of a usable peak (common practice). */
export const MIN_PEAK_CORRELATION = 0.1;
/** Window for drift (s of session time) and the fewest strong windows for a drift fit (common practice). */
export const DRIFT_WINDOW_S = 120;
export const MIN_DRIFT_WINDOWS = 4;
/** Drift is corrected only when it moves the offset by at least this much over the session (s)… */
export const MIN_DRIFT_EFFECT_S = 0.01;
/** …and the slope is at least this many standard errors from 0 (common practice). */
export const MIN_DRIFT_T = 4;

export interface EnvelopeInput {
  envelope: Float32Array;
  valid: Uint8Array;
}

export interface LagEstimate {
  lagS: number;
  peak: number;
  runnerUp: number;
  strong: boolean;
}

/** Lag (s) at which `b` best matches `a` (b(t + lag) ≈ a(t)), over bins [from, to). */
export function impactLag(a: EnvelopeInput, b: EnvelopeInput, active: Uint8Array, rateHz: number, maxLagS: number, from = 0, to = active.length): LagEstimate | null {
  const maxLagBins = Math.max(1, Math.floor(maxLagS * rateHz));
  const { r, bins } = lagCorrelation(a.envelope, b.envelope, a.valid, b.valid, active, maxLagBins, from, to);
  if (bins < 2 * rateHz) return null;
  // Peaks closer than 60 ms are one broad peak, not two (common practice).
  const p = lagPeak(r, Math.max(1, Math.round(0.06 * rateHz)));
  if (!p) return null;
  const edge = Math.abs(p.lagBins) >= maxLagBins - 0.5;
  const strong = !edge && p.peak >= MIN_PEAK_CORRELATION && p.peak >= MIN_PEAK_TO_RUNNER_UP * Math.max(0, p.runnerUp);
  return { lagS: p.lagBins / rateHz, peak: p.peak, runnerUp: p.runnerUp, strong };
}

export interface BridgeEstimate {
  /** Add to the right leg sensor's clock to put it on the left one's (s). */
  offsetS: number;
  strong: boolean;
  peak: number;
}

/** Right-vs-left offset through one bridge sensor: lag(left → bridge) − lag(right → bridge). */
export function offsetThroughBridge(
  left: EnvelopeInput,
  right: EnvelopeInput,
  bridge: EnvelopeInput,
  active: Uint8Array,
  rateHz: number,
  maxLagS: number,
  from = 0,
  to = active.length,
): BridgeEstimate | null {
  const l = impactLag(left, bridge, active, rateHz, maxLagS, from, to);
  const r = impactLag(right, bridge, active, rateHz, maxLagS, from, to);
  if (!l || !r) return null;
  // Right data describing a moment s later than its clock: its strikes show s early, so the lag to
  // the bridge grows by s; the correction to add to the right clock is that growth.
  return { offsetS: r.lagS - l.lagS, strong: l.strong && r.strong, peak: Math.min(l.peak, r.peak) };
}

export interface DriftFit {
  /** offset(t) = offsetS + driftSPerS · (t − centreS), t in session seconds. */
  offsetS: number;
  driftSPerS: number;
  centreS: number;
  windows: number;
  corrected: boolean;
}

/**
 * Straight-line fit of window offsets against window centre time. The drift is kept only with
 * MIN_DRIFT_WINDOWS strong windows, a slope MIN_DRIFT_T standard errors from zero and an effect of
 * MIN_DRIFT_EFFECT_S over the span; otherwise the offset is the median of the windows (constant).
 */
export function fitDrift(points: ReadonlyArray<{ centreS: number; offsetS: number }>): DriftFit | null {
  const n = points.length;
  if (n === 0) return null;
  const sorted = points.map((p) => p.offsetS).sort((x, y) => x - y);
  const median = n % 2 ? sorted[n >> 1]! : (sorted[n / 2 - 1]! + sorted[n / 2]!) / 2;
  const centreS = points.reduce((s, p) => s + p.centreS, 0) / n;
  const constant: DriftFit = { offsetS: median, driftSPerS: 0, centreS, windows: n, corrected: false };
  if (n < MIN_DRIFT_WINDOWS) return constant;
  const my = points.reduce((s, p) => s + p.offsetS, 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (const p of points) {
    sxx += (p.centreS - centreS) ** 2;
    sxy += (p.centreS - centreS) * (p.offsetS - my);
  }
  if (!(sxx > 0)) return constant;
  const b = sxy / sxx;
  const a = my;
  let rss = 0;
  for (const p of points) rss += (p.offsetS - a - b * (p.centreS - centreS)) ** 2;
  const se = Math.sqrt(rss / (n - 2) / sxx);
  const span = Math.max(...points.map((p) => p.centreS)) - Math.min(...points.map((p) => p.centreS));
  const strongDrift = Math.abs(b) * span >= MIN_DRIFT_EFFECT_S && (se === 0 || Math.abs(b) / se >= MIN_DRIFT_T);
  return strongDrift ? { offsetS: a, driftSPerS: b, centreS, windows: n, corrected: true } : { ...constant, driftSPerS: b };
}

export interface LegClockEstimate {
  fit: DriftFit | null;
  /** Bridge estimates over the whole walking time (for the report). */
  bridges: Array<{ index: number; estimate: BridgeEstimate | null }>;
  reason: string | null;
}

/**
 * Right-vs-left leg clock offset through every bridge, over the whole session and in
 * DRIFT_WINDOW_S windows; windows where the strong bridges agree (within 20 ms) give one point each.
 */
export function estimateLegClockOffset(
  left: EnvelopeInput,
  right: EnvelopeInput,
  bridges: readonly EnvelopeInput[],
  active: Uint8Array,
  rateHz: number,
  stepTimeS: number,
): LegClockEstimate {
  if (bridges.length === 0) return { fit: null, bridges: [], reason: "no sensor that feels both feet (lower back or wrist) to compare the legs through" };
  const maxLagS = Math.min(MAX_CLOCK_OFFSET_S, STEP_FRACTION_SEARCH * stepTimeS);
  const whole = bridges.map((b, index) => ({ index, estimate: offsetThroughBridge(left, right, b, active, rateHz, maxLagS) }));
  const strong = whole.filter((w) => w.estimate?.strong).map((w) => w.estimate!);
  if (strong.length === 0) return { fit: null, bridges: whole, reason: "the impacts felt by the bridge sensors do not give a clear, unambiguous lag" };
  const agreed = agree(strong.map((s) => s.offsetS));
  if (agreed === null) return { fit: null, bridges: whole, reason: "the bridge sensors disagree on the offset by more than 20 ms" };

  const windowBins = Math.round(DRIFT_WINDOW_S * rateHz);
  const points: Array<{ centreS: number; offsetS: number }> = [];
  const m = active.length;
  if (m >= 2 * windowBins) {
    for (let from = 0; from + windowBins <= m; from += windowBins) {
      const ests = bridges
        .map((b) => offsetThroughBridge(left, right, b, active, rateHz, maxLagS, from, from + windowBins))
        .filter((e): e is BridgeEstimate => !!e && e.strong);
      const o = ests.length > 0 ? agree(ests.map((e) => e.offsetS)) : null;
      if (o !== null) points.push({ centreS: (from + windowBins / 2) / rateHz, offsetS: o });
    }
  }
  const fit = points.length >= MIN_DRIFT_WINDOWS ? fitDrift(points) : { offsetS: agreed, driftSPerS: 0, centreS: m / 2 / rateHz, windows: 1, corrected: false };
  return { fit, bridges: whole, reason: null };
}

/** Mean of the values when they all lie within 20 ms of their median, else null (common practice). */
function agree(values: readonly number[]): number | null {
  const s = [...values].sort((a, b) => a - b);
  const med = s[s.length >> 1]!;
  if (s.some((v) => Math.abs(v - med) > 0.02)) return null;
  return s.reduce((a, b) => a + b, 0) / s.length;
}
