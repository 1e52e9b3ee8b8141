/**
 * Real-change flags for one patient and one metric.
 *
 * Session rule: the baseline is the first N sessions in time (default 3). Each later session is
 * compared with the baseline mean: |value − mean| ≤ MDC95 → `within-error`; beyond it the metric's
 * clinical direction decides `improved` or `worsened`. Comparing one session with a mean of N is
 * slightly conservative next to the two-single-measurements case MDC95 was derived for (common
 * practice). Metrics without a clinical direction get no flags.
 *
 * Slope rule: over the sessions in the last K weeks up to the latest one (default 6, inclusive),
 * fit an OLS line value ~ weeks; change over the window = slope × span actually covered (first to
 * last session in the window). |change| ≤ MDC95 → `within-error`, beyond it direction as above.
 * Needs ≥ 3 sessions covering at least half of the window, so one outlier pair cannot make a trend.
 *
 * Angles (metrics marked `circular`, e.g. mean relative phase): the baseline mean is the circular
 * mean, the spread the SD of the wrapped deviations from it, and each session's change the
 * circular difference wrapped to ±180°, so 175° and −178° are 7° apart, not 353°. With no
 * better/worse direction, a change beyond MDC95 is flagged `changed`. No slope is fitted to angles.
 *
 * Points carrying `excludedReason` (e.g. a phase whose coupling strength did not show a real phase
 * relation) are kept for display but take no part in the baseline, the MDC or the flags.
 */
import { metricDefinition, type MetricDirection } from "../contracts/metric-catalog";
import { resolveMdc, type Baseline, type Mdc } from "./reliability";
import { mean, standardDeviation } from "@pendula/signal";
import { circularDeviationSd, circularDifferenceDeg, circularSummary, olsFit, requireFinite } from "./statistics";

export type ChangeFlag = "improved" | "worsened" | "within-error" | "changed";

export interface SeriesPoint {
  sessionId: string;
  recordedAt: string;
  value: number;
  /** Why this point is shown but not compared (e.g. "weak-coupling", "few-strides"). */
  excludedReason?: string;
  /** Strides (or steps, arm cycles) behind the value, when the analysis reported it. */
  n?: number | null;
}

export interface FlaggedPoint extends SeriesPoint {
  flag?: ChangeFlag;
  /** True for the sessions that form the baseline. */
  baseline?: boolean;
}

export interface SlopeFlag {
  flag: ChangeFlag;
  slopePerWeek: number;
  changeOverWindow: number;
  windowWeeks: number;
  spanWeeks: number;
  n: number;
  fromSessionId: string;
  toSessionId: string;
}

export interface ChangeOptions {
  baselineSessions?: number;
  slopeWeeks?: number;
}

export const DEFAULT_BASELINE_SESSIONS = 3;
export const DEFAULT_SLOPE_WEEKS = 6;
export const MIN_SLOPE_SESSIONS = 3;
const MS_PER_WEEK = 7 * 24 * 3600 * 1000;

export function classifyChange(delta: number, mdc: number, direction: MetricDirection, circular = false): ChangeFlag | undefined {
  if (circular) return Math.abs(delta) <= mdc ? "within-error" : "changed";
  if (direction === null) return undefined;
  if (Math.abs(delta) <= mdc) return "within-error";
  const rose = delta > 0;
  return rose === (direction === "higher-is-better") ? "improved" : "worsened";
}

function timeMs(p: SeriesPoint): number {
  const t = Date.parse(p.recordedAt);
  if (Number.isNaN(t)) throw new RangeError(`recordedAt is not a date: ${p.recordedAt}`);
  return t;
}

/** Finite values in time order (ties keep input order); a NaN value is a missing measurement. */
export function orderSeries<T extends SeriesPoint>(points: readonly T[]): T[] {
  return points
    .filter((p) => Number.isFinite(p.value))
    .map((p, i) => ({ p, i, t: timeMs(p) }))
    .sort((a, b) => a.t - b.t || a.i - b.i)
    .map((x) => x.p);
}

function checkCount(name: string, v: number, min: number): void {
  if (!Number.isInteger(v) || v < min) throw new RangeError(`${name} must be an integer ≥ ${min}`);
}

/** Baseline of the first N compared points (points with `excludedReason` are skipped). */
export function computeBaseline(
  ordered: readonly SeriesPoint[],
  baselineSessions = DEFAULT_BASELINE_SESSIONS,
  circular = false,
): Baseline | null {
  checkCount("baselineSessions", baselineSessions, 2);
  const usable = ordered.filter((p) => !p.excludedReason);
  if (usable.length < baselineSessions) return null;
  const values = usable.slice(0, baselineSessions).map((p) => p.value);
  if (circular) {
    const { meanDeg } = circularSummary(values);
    // Phases spread evenly round the circle have no mean direction: no baseline.
    if (Number.isNaN(meanDeg)) return null;
    return { mean: meanDeg, sd: circularDeviationSd(values), n: values.length };
  }
  requireFinite(values, "baseline");
  const baselineMean = mean(values);
  const sd = standardDeviation(values, 1);
  // Null only below 2 values, which the count check above rules out; no baseline then, as with too few sessions.
  if (baselineMean === null || sd === null) return null;
  return { mean: baselineMean, sd, n: values.length };
}

export function slopeFlag(
  ordered: readonly SeriesPoint[],
  mdc: number,
  direction: MetricDirection,
  slopeWeeks = DEFAULT_SLOPE_WEEKS,
): SlopeFlag | null {
  if (!(slopeWeeks > 0)) throw new RangeError("slopeWeeks must be > 0");
  if (direction === null || ordered.length === 0) return null;
  const lastT = timeMs(ordered[ordered.length - 1]!);
  const inWindow = ordered.filter((p) => timeMs(p) >= lastT - slopeWeeks * MS_PER_WEEK);
  if (inWindow.length < MIN_SLOPE_SESSIONS) return null;
  const weeks = inWindow.map((p) => (timeMs(p) - lastT) / MS_PER_WEEK);
  const spanWeeks = weeks[weeks.length - 1]! - weeks[0]!;
  if (spanWeeks < slopeWeeks / 2) return null;
  const { slope } = olsFit(weeks, inWindow.map((p) => p.value));
  const change = slope * spanWeeks;
  return {
    flag: classifyChange(change, mdc, direction)!,
    slopePerWeek: slope,
    changeOverWindow: change,
    windowWeeks: slopeWeeks,
    spanWeeks,
    n: inWindow.length,
    fromSessionId: inWindow[0]!.sessionId,
    toSessionId: inWindow[inWindow.length - 1]!.sessionId,
  };
}

export interface MetricChange {
  points: FlaggedPoint[];
  baseline: Baseline | null;
  mdc: Mdc | null;
  slopeFlag: SlopeFlag | null;
  direction: MetricDirection;
}

/** Baseline, MDC, per-session flags and slope flag for one metric series of one patient. */
export function flagMetricChanges(
  metricKey: string,
  points: readonly SeriesPoint[],
  condition: string,
  options: ChangeOptions = {},
): MetricChange {
  const n = options.baselineSessions ?? DEFAULT_BASELINE_SESSIONS;
  const ordered = orderSeries(points);
  const info = metricDefinition(metricKey);
  const circular = info?.circular === true;
  const baseline = computeBaseline(ordered, n, circular);
  const mdc = resolveMdc(metricKey, condition, baseline);
  const direction = info?.direction ?? null;
  const baselinePoints = new Set(ordered.filter((p) => !p.excludedReason).slice(0, n).map((p) => p));
  const flagged: FlaggedPoint[] = ordered.map((p) => {
    if (p.excludedReason) return { ...p };
    if (baseline && baselinePoints.has(p)) return { ...p, baseline: true };
    if (!baseline || !mdc) return { ...p };
    const delta = circular ? circularDifferenceDeg(p.value, baseline.mean) : p.value - baseline.mean;
    const flag = classifyChange(delta, mdc.value, direction, circular);
    return flag ? { ...p, flag } : { ...p };
  });
  const compared = ordered.filter((p) => !p.excludedReason);
  const slope = mdc && !circular ? slopeFlag(compared, mdc.value, direction, options.slopeWeeks ?? DEFAULT_SLOPE_WEEKS) : null;
  return { points: flagged, baseline, mdc, slopeFlag: slope, direction };
}
