/**
 * Coordination-mode events on a patient's trend.
 *
 * - `arm-leg-mode-change`: arm–leg frequency locking moves between 2:1 (arms at step frequency) and
 *   1:1 (arms at stride frequency). Wagenaar & van Emmerik 2000 (J Biomech 33:853, treadmill,
 *   n = 7) saw 2:1 at 0.3–0.7 m/s and 1:1 from 0.8 m/s, and Donker et al. 2001 found 2:1
 *   consistent in only 3 of 8 people at 1–2 km/h: the mode follows walking speed. So a mode change
 *   is raised only when it is NOT explained by a change of pace: the mean cadence (and walking
 *   speed, when the series exists) of the sessions that confirm the new mode is compared with the
 *   sessions held in the old mode just before; a difference beyond that metric's MDC95 (published
 *   or patient-baseline, reliability.ts) explains the switch and no event is raised. When pace
 *   cannot be checked (no value or no MDC yet) the event is raised and says so. The text always
 *   says at what speed and cadence the change happened.
 *   Hysteresis, two layers (both common practice):
 *   1. value bands: a ratio ≥ 1.7 reads as 2:1, ≤ 1.3 as 1:1, anything between keeps the current mode;
 *   2. persistence: the new mode must hold for `confirmSessions` consecutive sessions (default 2)
 *      before the event is emitted, on the confirming session. A 2,1,2,1 series emits nothing.
 * - `coupling-drop`: coupling strength R falls below its baseline band, baseline mean − MDC95
 *   (patient baseline). Emitted once on entering; re-armed only after R returns above
 *   mean − MDC95/2, so values hovering at the edge do not repeat the event.
 * - `pci-rise`: left–right PCI rises more than MDC95 above its baseline mean; same once-and-re-arm
 *   rule (re-armed below mean + MDC95/2).
 */
import { metricDefinition, PAIR_WORDS, type ArmLegPair } from "../contracts/metric-catalog";
import { computeBaseline, orderSeries, type SeriesPoint } from "./change-flags";
import { resolveMdc } from "./reliability";

export type CoordinationEventKind = "arm-leg-mode-change" | "coupling-drop" | "pci-rise";

/** Pace around a mode change: the mean over the old-mode sessions before and the confirming sessions. */
export interface PaceComparison {
  before: number | null;
  after: number | null;
  /** MDC95 used for the comparison; null when none could be formed yet. */
  mdc: number | null;
  /** true: |after − before| > MDC95; false: within it; null: could not be checked. */
  beyondMdc: boolean | null;
}

export interface CoordinationEvent {
  kind: CoordinationEventKind;
  sessionId: string;
  recordedAt: string;
  metricKey: string;
  from: number;
  to: number;
  message: string;
  /** Mode changes only: cadence and walking speed before and after. */
  pace?: { cadenceStepsPerMin: PaceComparison; walkingSpeedMPerS: PaceComparison | null };
}

export interface CoordinationOptions {
  baselineSessions?: number;
  /** Consecutive sessions a new arm–leg mode must hold before it is reported (default 2). */
  confirmSessions?: number;
  condition?: string;
}

export const MODE_2_TO_1_MIN_RATIO = 1.7;
export const MODE_1_TO_1_MAX_RATIO = 1.3;
export const DEFAULT_CONFIRM_SESSIONS = 2;
export const CADENCE_KEY = "cadenceStepsPerMin";
export const WALKING_SPEED_KEY = "walkingSpeedMPerS";

export type LockingMode = 1 | 2;

/** Reads a ratio as a mode, or `null` for the undecided zone between the two bands. */
export function lockingMode(ratio: number): LockingMode | null {
  if (ratio >= MODE_2_TO_1_MIN_RATIO) return 2;
  if (ratio <= MODE_1_TO_1_MAX_RATIO) return 1;
  return null;
}

/** The catalogue's pair words with spaced dashes, as they stand in brackets after a sentence. */
const pairLabel = (pair: ArmLegPair) => PAIR_WORDS[pair].replace("–", " – ");

/** Cadence and walking-speed series of the same patient, used to tell a pace-driven switch from others. */
export interface PaceSeries {
  cadence?: readonly SeriesPoint[];
  walkingSpeed?: readonly SeriesPoint[];
  condition?: string;
  baselineSessions?: number;
}

function meanAt(series: readonly SeriesPoint[], sessionIds: readonly string[]): number | null {
  const ids = new Set(sessionIds);
  const values = series.filter((p) => ids.has(p.sessionId) && Number.isFinite(p.value)).map((p) => p.value);
  return values.length ? values.reduce((a, b) => a + b, 0) / values.length : null;
}

function comparePace(
  key: string,
  series: readonly SeriesPoint[],
  beforeIds: readonly string[],
  afterIds: readonly string[],
  pace: PaceSeries,
): PaceComparison {
  const before = meanAt(series, beforeIds);
  const after = meanAt(series, afterIds);
  const baseline = computeBaseline(orderSeries(series), pace.baselineSessions ?? 3);
  const mdc = resolveMdc(key, pace.condition ?? "other", baseline)?.value ?? null;
  const beyondMdc = before === null || after === null || mdc === null ? null : Math.abs(after - before) > mdc;
  return { before, after, mdc, beyondMdc };
}

const fmt = (v: number | null, digits: number) => (v === null ? "unknown" : v.toFixed(digits));

function paceSentence(cadence: PaceComparison, speed: PaceComparison | null): string {
  const at = [speed ? `${fmt(speed.after, 2)} m/s` : null, `${fmt(cadence.after, 0)} steps/min`].filter(Boolean).join(" and ");
  const before = [speed ? `${fmt(speed.before, 2)} m/s` : null, `${fmt(cadence.before, 0)} steps/min`].filter(Boolean).join(", ");
  const checked = [cadence, ...(speed ? [speed] : [])];
  const verdict = checked.some((c) => c.beyondMdc === null)
    ? "Whether the pace changed could not be checked (a value or its MDC95 is not available yet), so a change of speed may explain it."
    : `${speed ? "Cadence and walking speed" : "Cadence"} changed less than ${speed ? "their" : "its"} MDC95, so walking faster or slower does not explain it.`;
  return `It happened at ${at} (before: ${before}). ${verdict}`;
}

export function detectModeChanges(
  metricKey: string,
  points: readonly SeriesPoint[],
  confirmSessions = DEFAULT_CONFIRM_SESSIONS,
  pace: PaceSeries = {},
): CoordinationEvent[] {
  if (!Number.isInteger(confirmSessions) || confirmSessions < 1) throw new RangeError("confirmSessions must be an integer ≥ 1");
  const pair = metricDefinition(metricKey)?.pair;
  const where = pair ? ` (${pairLabel(pair)})` : "";
  const events: CoordinationEvent[] = [];
  let current: LockingMode | null = null;
  let candidate: LockingMode | null = null;
  let run: SeriesPoint[] = [];
  // The latest decided sessions in the current mode (at most confirmSessions): the "before" of a switch.
  let held: SeriesPoint[] = [];
  for (const p of orderSeries(points)) {
    const mode = lockingMode(p.value);
    if (mode === null) continue; // undecided: neither confirms nor breaks a run
    if (current === null) {
      current = mode;
      held = [p];
      continue;
    }
    if (mode === current) {
      candidate = null;
      run = [];
      held = [...held, p].slice(-confirmSessions);
      continue;
    }
    if (mode === candidate) run.push(p);
    else {
      candidate = mode;
      run = [p];
    }
    if (run.length >= confirmSessions) {
      const beforeIds = held.map((h) => h.sessionId);
      const afterIds = run.map((r) => r.sessionId);
      const cadence = comparePace(CADENCE_KEY, pace.cadence ?? [], beforeIds, afterIds, pace);
      const speed = pace.walkingSpeed?.length ? comparePace(WALKING_SPEED_KEY, pace.walkingSpeed, beforeIds, afterIds, pace) : null;
      const explainedByPace = cadence.beyondMdc === true || speed?.beyondMdc === true;
      if (!explainedByPace) {
        const n = run.length;
        events.push({
          kind: "arm-leg-mode-change",
          sessionId: p.sessionId,
          recordedAt: p.recordedAt,
          metricKey,
          from: current,
          to: mode,
          pace: { cadenceStepsPerMin: cadence, walkingSpeedMPerS: speed },
          message:
            `Arm–leg locking changed from ${current}:1 to ${mode}:1${where}, held for ${n} session${n > 1 ? "s" : ""}. ` +
            paceSentence(cadence, speed),
        });
      }
      current = mode;
      candidate = null;
      held = run.slice(-confirmSessions);
      run = [];
    }
  }
  return events;
}

function detectBandExit(
  kind: "coupling-drop" | "pci-rise",
  metricKey: string,
  points: readonly SeriesPoint[],
  options: CoordinationOptions,
): CoordinationEvent[] {
  const n = options.baselineSessions ?? 3;
  // Points shown but not compared (too few strides, weak coupling) take no part in events either.
  const ordered = orderSeries(points).filter((p) => !p.excludedReason);
  const baseline = computeBaseline(ordered, n);
  const mdc = resolveMdc(metricKey, options.condition ?? "other", baseline);
  if (!baseline || !mdc) return [];
  const sign = kind === "pci-rise" ? 1 : -1;
  const edge = baseline.mean + sign * mdc.value;
  const rearm = baseline.mean + (sign * mdc.value) / 2;
  const events: CoordinationEvent[] = [];
  let armed = true;
  for (const p of ordered.slice(n)) {
    const beyond = sign > 0 ? p.value > edge : p.value < edge;
    if (armed && beyond) {
      armed = false;
      events.push({
        kind,
        sessionId: p.sessionId,
        recordedAt: p.recordedAt,
        metricKey,
        from: baseline.mean,
        to: p.value,
        message:
          kind === "pci-rise"
            ? "Left–right Phase Coordination Index rose beyond its minimal detectable change from baseline."
            : "Arm–leg coupling strength dropped below its baseline band (baseline mean − MDC95).",
      });
    } else if (!armed && (sign > 0 ? p.value < rearm : p.value > rearm)) {
      armed = true;
    }
  }
  return events;
}

/** All coordination events over a patient's metric series, in time order. */
export function detectCoordinationEvents(
  metrics: readonly { key: string; points: readonly SeriesPoint[] }[],
  options: CoordinationOptions = {},
): CoordinationEvent[] {
  const events: CoordinationEvent[] = [];
  const seriesOf = (base: string) => metrics.find((m) => metricDefinition(m.key)?.base === base)?.points;
  const pace: PaceSeries = {
    cadence: seriesOf(CADENCE_KEY),
    walkingSpeed: seriesOf(WALKING_SPEED_KEY),
    condition: options.condition,
    baselineSessions: options.baselineSessions,
  };
  for (const m of metrics) {
    const base = metricDefinition(m.key)?.base;
    if (base === "frequencyRatio") events.push(...detectModeChanges(m.key, m.points, options.confirmSessions ?? DEFAULT_CONFIRM_SESSIONS, pace));
    else if (base === "couplingStrength") events.push(...detectBandExit("coupling-drop", m.key, m.points, options));
    else if (base === "phaseCoordinationIndexPct") events.push(...detectBandExit("pci-rise", m.key, m.points, options));
  }
  return events.sort((a, b) => Date.parse(a.recordedAt) - Date.parse(b.recordedAt));
}
