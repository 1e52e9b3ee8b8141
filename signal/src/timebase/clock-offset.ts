import { lagCandidates, lagCorrelation, lagPeak } from "./impact-correlation";

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
 * Why the candidates are told apart by the legs' alternation: the bridge's train repeats every step,
 * so its correlation with a leg has a peak every step, all about as high. The left (reference) leg's
 * lag is the physical delay plus the bridge's own clock error, and is searched within ±0.45 step, where
 * there is one peak. The right leg's lag also holds the offset: each of its peaks within
 * MAX_CLOCK_OFFSET_S is a candidate, and only the true one keeps the legs swinging in alternation (the
 * others put them in step). Two
 * alternating candidates (one stride apart, strides under 1 s) leave the offset unverified.
 */

/** Largest offset looked for (s): wireless start-up synchronisation errors are far smaller (common practice). */
export const MAX_CLOCK_OFFSET_S = 0.5;
/** Fraction of a step the lag search may span either side of 0 (< 0.5, see above). */
export const STEP_FRACTION_SEARCH = 0.45;
/** A peak must exceed the next-best peak at another lag by this factor to count (common practice). */
export const MIN_PEAK_TO_RUNNER_UP = 1.2;
/**
 * Longest plausible delay (s) between a heel strike felt by the leg and by a bridge sensor: the
 * transient crosses the body in well under 20 ms and the segments' responses peak within tens of
 * ms (common practice bound).
 */
export const MAX_IMPACT_DELAY_S = 0.1;
/** Minimum normalised correlation of a usable peak (common practice). */
export const MIN_PEAK_CORRELATION = 0.1;
/** Window for drift (s of session time) and the fewest strong windows for a drift fit (common practice). */
export const DRIFT_WINDOW_S = 120;
export const MIN_DRIFT_WINDOWS = 4;
/** Drift is corrected only when it moves the offset by at least this much over the session (s)… */
export const MIN_DRIFT_EFFECT_S = 0.01;
/** …and the slope is at least this many standard errors from 0 (common practice). */
export const MIN_DRIFT_T = 4;
/** Per-window lags are searched this far around the whole-session ones (s): 2 min of a few ms/min drift stays well inside (common practice). */
export const DRIFT_SEARCH_S = 0.1;

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

/** Longest stretch of the session (s) the whole-session lags are searched over: ten minutes hold several hundred strides, plenty for the lag, and bound the cost on long sessions (common practice). */
export const WHOLE_SEARCH_MAX_S = 600;

export interface Span {
  from: number;
  to: number;
}

/** At most WHOLE_SEARCH_MAX_S of bins, centred on the median walking bin. */
export function searchSpan(active: Uint8Array, rateHz: number): Span {
  const m = active.length;
  const max = Math.round(WHOLE_SEARCH_MAX_S * rateHz);
  if (m <= max) return { from: 0, to: m };
  let total = 0;
  for (let k = 0; k < m; k++) total += active[k]!;
  let seen = 0;
  let mid = m >> 1;
  for (let k = 0; k < m; k++) {
    seen += active[k]!;
    if (2 * seen >= total && total > 0) {
      mid = k;
      break;
    }
  }
  const from = Math.max(0, Math.min(m - max, mid - (max >> 1)));
  return { from, to: from + max };
}

function coarseSpan(span: Span): Span {
  return { from: Math.floor(span.from / COARSE_FACTOR), to: Math.ceil(span.to / COARSE_FACTOR) };
}

/** Bins of the coarse search: the lag range is scanned at half the envelope rate, then refined. */
const COARSE_FACTOR = 2;
/** Peaks closer than this are one broad peak, not two (s; common practice). */
const PEAK_SEPARATION_S = 0.06;

interface Coarse {
  a: EnvelopeInput;
  active: Uint8Array;
}

const coarseCache = new WeakMap<Float32Array, { active: Uint8Array; coarse: Coarse }>();

/** Block maximum of an envelope (and AND of its masks) over COARSE_FACTOR bins (cached per envelope). */
export function coarsen(x: EnvelopeInput, active: Uint8Array): Coarse {
  const hit = coarseCache.get(x.envelope);
  if (hit && hit.active === active) return hit.coarse;
  const coarse = coarsenNow(x, active);
  coarseCache.set(x.envelope, { active, coarse });
  return coarse;
}

function coarsenNow(x: EnvelopeInput, active: Uint8Array): Coarse {
  const m = Math.floor(x.envelope.length / COARSE_FACTOR);
  const envelope = new Float32Array(m);
  const valid = new Uint8Array(m);
  const act = new Uint8Array(m);
  for (let k = 0; k < m; k++) {
    let v = 0;
    let ok = 1;
    let on = 1;
    for (let i = k * COARSE_FACTOR; i < (k + 1) * COARSE_FACTOR; i++) {
      if (x.envelope[i]! > v) v = x.envelope[i]!;
      ok &= x.valid[i]!;
      on &= active[i]!;
    }
    envelope[k] = v;
    valid[k] = ok;
    act[k] = on;
  }
  return { a: { envelope, valid }, active: act };
}

/** Sub-bin lag (bins) of the highest correlation within ±3 bins of `centreBins`, at the full rate. */
function refineLag(a: EnvelopeInput, b: EnvelopeInput, active: Uint8Array, centreBins: number, span: Span): { lagBins: number; peak: number } | null {
  const { r, bins } = lagCorrelation(a.envelope, b.envelope, a.valid, b.valid, active, 3, span.from, span.to, centreBins);
  if (bins === 0) return null;
  const p = lagPeak(r, 7);
  return p ? { lagBins: centreBins + p.lagBins, peak: p.peak } : null;
}

/**
 * Lag (s) at which `b` best matches `a` (b(t + lag) ≈ a(t)) within ±maxLagS over the whole session:
 * scanned on coarse bins, then refined at the full rate around the best coarse lag.
 */
export function impactLag(a: EnvelopeInput, b: EnvelopeInput, active: Uint8Array, rateHz: number, maxLagS: number, span: Span = searchSpan(active, rateHz)): LagEstimate | null {
  const ca = coarsen(a, active);
  const cb = coarsen(b, active);
  const coarseRate = rateHz / COARSE_FACTOR;
  const maxLagBins = Math.max(1, Math.floor(maxLagS * coarseRate));
  const cs = coarseSpan(span);
  const { r, bins } = lagCorrelation(ca.a.envelope, cb.a.envelope, ca.a.valid, cb.a.valid, ca.active, maxLagBins, cs.from, cs.to);
  if (bins < 2 * coarseRate) return null;
  const p = lagPeak(r, Math.max(1, Math.round(PEAK_SEPARATION_S * coarseRate)));
  if (!p) return null;
  const edge = Math.abs(p.lagBins) >= maxLagBins - 0.5;
  const fine = refineLag(a, b, active, Math.round(p.lagBins * COARSE_FACTOR), span);
  if (!fine) return null;
  const strong = !edge && p.peak >= MIN_PEAK_CORRELATION && p.peak >= MIN_PEAK_TO_RUNNER_UP * Math.max(0, p.runnerUp);
  return { lagS: fine.lagBins / rateHz, peak: fine.peak, runnerUp: p.runnerUp, strong };
}

/**
 * Correlation of the two legs' |ω| with the right leg's clock moved by offsetS: walking legs swing
 * half a stride apart, so the true offset gives a negative value and one step off a positive one.
 */
export type Alternation = (offsetS: number) => number;

export interface BridgeEstimate {
  /** Add to the right leg sensor's clock to put it on the left one's (s). */
  offsetS: number;
  strong: boolean;
  peak: number;
  leftLagS: number;
  rightLagS: number;
  /** Why the estimate is not strong, when it is not. */
  reason: string | null;
}

/**
 * Right-vs-left offset through one bridge sensor: lag(right → bridge) − lag(left → bridge).
 *
 * The left leg is the reference, so its lag to the bridge is only the physical delay (small): it is
 * searched within ±STEP_FRACTION_SEARCH step, where the bridge's step-periodic train has one peak.
 * The right leg's lag also holds the unknown offset (up to MAX_CLOCK_OFFSET_S), so every peak of its
 * correlation is a candidate, one step apart; the candidate whose offset keeps the legs alternating
 * (and the only one doing so) is taken.
 */
export function offsetThroughBridge(
  left: EnvelopeInput,
  right: EnvelopeInput,
  bridge: EnvelopeInput,
  active: Uint8Array,
  rateHz: number,
  stepTimeS: number,
  alternation: Alternation,
): BridgeEstimate | null {
  const est = offsetFromReference(left, right, bridge, active, rateHz, stepTimeS, alternation);
  if (est?.strong || est?.reason !== REFERENCE_WEAK) return est;
  // The left leg's strikes may be too soft (a paretic leg lands flat-footed): the right leg serves as
  // the reference instead, with every sign turned round.
  const swapped = offsetFromReference(right, left, bridge, active, rateHz, stepTimeS, (o) => alternation(-o));
  if (!swapped?.strong) return est;
  return { ...swapped, offsetS: -swapped.offsetS, leftLagS: swapped.rightLagS, rightLagS: swapped.leftLagS };
}

const REFERENCE_WEAK = "neither leg's impacts are clearly felt by the bridge sensor";

function offsetFromReference(
  left: EnvelopeInput,
  right: EnvelopeInput,
  bridge: EnvelopeInput,
  active: Uint8Array,
  rateHz: number,
  stepTimeS: number,
  alternation: Alternation,
): BridgeEstimate | null {
  const leftMaxS = Math.min(MAX_CLOCK_OFFSET_S, STEP_FRACTION_SEARCH * stepTimeS);
  const span = searchSpan(active, rateHz);
  const l = impactLag(left, bridge, active, rateHz, leftMaxS, span);
  if (!l) return null;
  // The reference leg's lag is the physical delay to the bridge plus the bridge's own clock error,
  // which may be as large as the right leg's (a wrist's clock is no better than a shank's): anything
  // longer means its strongest coincidence with the bridge is not its heel strike. A bridge more than
  // the search range off is seen a step away; the alternation test below still picks the right leg's
  // offset, because the candidates are differences of the two lags.
  const referenceOk = l.strong && Math.abs(l.lagS) <= MAX_IMPACT_DELAY_S + MAX_CLOCK_OFFSET_S;
  const cr = coarsen(right, active);
  const cb = coarsen(bridge, active);
  const coarseRate = rateHz / COARSE_FACTOR;
  const maxLagBins = Math.ceil((MAX_CLOCK_OFFSET_S + leftMaxS) * coarseRate);
  const cs = coarseSpan(span);
  const { r, bins } = lagCorrelation(cr.a.envelope, cb.a.envelope, cr.a.valid, cb.a.valid, cr.active, maxLagBins, cs.from, cs.to);
  if (bins < 2 * coarseRate) return null;
  const all = lagCandidates(r, Math.max(1, Math.round(PEAK_SEPARATION_S * coarseRate)));
  const best = all[0]?.peak ?? 0;
  // A candidate must be one of the train's main peaks (half the best: common practice), not a
  // ripple, and the other leg's strikes must reach the bridge comparably to the reference leg's
  // (at least half as well: both legs strike the same body; common practice).
  const candidates = all
    .filter((c) => c.peak >= MIN_PEAK_CORRELATION && c.peak >= 0.5 * best && c.peak >= 0.5 * l.peak)
    .map((c) => refineLag(right, bridge, active, Math.round(c.lagBins * COARSE_FACTOR), span))
    .filter((c): c is { lagBins: number; peak: number } => c !== null)
    .map((c) => ({ ...c, rightLagS: c.lagBins / rateHz, offsetS: c.lagBins / rateHz - l.lagS }))
    .filter((c) => Math.abs(c.offsetS) <= MAX_CLOCK_OFFSET_S)
    .map((c) => ({ ...c, alternation: alternation(c.offsetS) }));
  const alternating = candidates.filter((c) => c.alternation < 0);
  const weak = (reason: string, c = candidates[0]): BridgeEstimate => ({
    offsetS: c?.offsetS ?? Number.NaN,
    strong: false,
    peak: c?.peak ?? 0,
    leftLagS: l.lagS,
    rightLagS: c?.rightLagS ?? Number.NaN,
    reason,
  });
  if (!referenceOk) return weak(REFERENCE_WEAK);
  if (alternating.length === 0) return weak("no impact lag keeps the legs alternating");
  if (alternating.length > 1) return weak("more than one impact lag keeps the legs alternating");
  const c = alternating[0]!;
  return { offsetS: c.offsetS, strong: true, peak: Math.min(l.peak, c.peak), leftLagS: l.lagS, rightLagS: c.rightLagS, reason: null };
}

/**
 * The same offset over bins [from, to), searched only within ±toleranceS of the whole-session lags
 * (a window has too few strides to settle which step is which on its own).
 */
export function offsetNear(
  left: EnvelopeInput,
  right: EnvelopeInput,
  bridge: EnvelopeInput,
  active: Uint8Array,
  rateHz: number,
  whole: BridgeEstimate,
  toleranceS: number,
  from: number,
  to: number,
): number | null {
  const coarseRate = rateHz / COARSE_FACTOR;
  const cb = coarsen(bridge, active);
  const cs = coarseSpan({ from, to });
  const lag = (x: EnvelopeInput, centreS: number): number | null => {
    const cx = coarsen(x, active);
    const centre = Math.round(centreS * coarseRate);
    const half = Math.max(2, Math.ceil(toleranceS * coarseRate));
    const { r, bins } = lagCorrelation(cx.a.envelope, cb.a.envelope, cx.a.valid, cb.a.valid, cx.active, half, cs.from, cs.to, centre);
    if (bins < 10 * coarseRate) return null;
    const c = lagCandidates(r, Math.max(1, Math.round(PEAK_SEPARATION_S * coarseRate)))[0];
    if (!c || c.peak < MIN_PEAK_CORRELATION) return null;
    const fine = refineLag(x, bridge, active, Math.round((centre + c.lagBins) * COARSE_FACTOR), { from, to });
    return fine ? fine.lagBins / rateHz : null;
  };
  const l = lag(left, whole.leftLagS);
  const r = lag(right, whole.rightLagS);
  return l === null || r === null ? null : r - l;
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
 * Right-vs-left leg clock offset through every bridge over the whole session; then, on sessions of
 * at least two DRIFT_WINDOW_S windows, once per window near the whole-session lags (a window counts
 * when its strong bridges agree within 20 ms) for the drift fit.
 */
export function estimateLegClockOffset(
  left: EnvelopeInput,
  right: EnvelopeInput,
  bridges: readonly EnvelopeInput[],
  active: Uint8Array,
  rateHz: number,
  stepTimeS: number,
  alternation: Alternation,
): LegClockEstimate {
  if (bridges.length === 0) return { fit: null, bridges: [], reason: "no sensor that feels both feet (lower back or wrist) to compare the legs through" };
  const whole = bridges.map((b, index) => ({ index, estimate: offsetThroughBridge(left, right, b, active, rateHz, stepTimeS, alternation) }));
  const strong = whole.filter((w) => w.estimate?.strong);
  if (strong.length === 0) {
    const why = whole.map((w) => w.estimate?.reason).find((r) => r) ?? "the impacts felt by the bridge sensors do not give a clear lag";
    return { fit: null, bridges: whole, reason: why };
  }
  const agreed = agree(strong.map((s) => s.estimate!.offsetS));
  if (agreed === null) return { fit: null, bridges: whole, reason: "the bridge sensors disagree on the offset by more than 20 ms" };

  const windowBins = Math.round(DRIFT_WINDOW_S * rateHz);
  const points: Array<{ centreS: number; offsetS: number }> = [];
  const m = active.length;
  if (m >= 2 * windowBins) {
    for (let from = 0; from + windowBins <= m; from += windowBins) {
      const ests = strong
        .map((w) => offsetNear(left, right, bridges[w.index]!, active, rateHz, w.estimate!, DRIFT_SEARCH_S, from, from + windowBins))
        .filter((o): o is number => o !== null);
      const o = ests.length > 0 ? agree(ests) : null;
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
