/**
 * Coordination-mode events on a patient's trend.
 *
 * - `arm-leg-mode-change`: arm–leg frequency locking moves between 2:1 (arms at step frequency) and
 *   1:1 (arms at stride frequency) — the two modes Wagenaar & van Emmerik 2000 (J Biomech 33:853)
 *   describe for slow vs faster walking. Hysteresis, two layers (both common practice):
 *   1. value bands: a ratio ≥ 1.7 reads as 2:1, ≤ 1.3 as 1:1, anything between keeps the current mode;
 *   2. persistence: the new mode must hold for `confirmSessions` consecutive sessions (default 2)
 *      before the event is emitted, on the confirming session. A 2,1,2,1 series emits nothing.
 * - `coupling-drop`: coupling strength R falls below its baseline band, baseline mean − MDC95
 *   (patient baseline). Emitted once on entering; re-armed only after R returns above
 *   mean − MDC95/2, so values hovering at the edge do not repeat the event.
 * - `pci-rise`: left–right PCI rises more than MDC95 above its baseline mean; same once-and-re-arm
 *   rule (re-armed below mean + MDC95/2).
 */
import { resolveMetricKey, type ArmLegPair } from "./metric-catalog";
import { computeBaseline, orderSeries, type SeriesPoint } from "./change-flags";
import { resolveMdc } from "./reliability";

export type CoordinationEventKind = "arm-leg-mode-change" | "coupling-drop" | "pci-rise";

export interface CoordinationEvent {
  kind: CoordinationEventKind;
  sessionId: string;
  recordedAt: string;
  metricKey: string;
  from: number;
  to: number;
  message: string;
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

export type LockingMode = 1 | 2;

/** Reads a ratio as a mode, or `null` for the undecided zone between the two bands. */
export function lockingMode(ratio: number): LockingMode | null {
  if (ratio >= MODE_2_TO_1_MIN_RATIO) return 2;
  if (ratio <= MODE_1_TO_1_MAX_RATIO) return 1;
  return null;
}

const PAIR_LABEL: Record<ArmLegPair, string> = {
  leftArmRightLeg: "left arm – right leg",
  rightArmLeftLeg: "right arm – left leg",
};

export function detectModeChanges(
  metricKey: string,
  points: readonly SeriesPoint[],
  confirmSessions = DEFAULT_CONFIRM_SESSIONS,
): CoordinationEvent[] {
  if (!Number.isInteger(confirmSessions) || confirmSessions < 1) throw new RangeError("confirmSessions must be an integer ≥ 1");
  const pair = resolveMetricKey(metricKey)?.pair;
  const where = pair ? ` (${PAIR_LABEL[pair]})` : "";
  const events: CoordinationEvent[] = [];
  let current: LockingMode | null = null;
  let candidate: LockingMode | null = null;
  let run = 0;
  for (const p of orderSeries(points)) {
    const mode = lockingMode(p.value);
    if (mode === null) continue; // undecided: neither confirms nor breaks a run
    if (current === null) {
      current = mode;
      continue;
    }
    if (mode === current) {
      candidate = null;
      run = 0;
      continue;
    }
    if (mode === candidate) run += 1;
    else {
      candidate = mode;
      run = 1;
    }
    if (run >= confirmSessions) {
      events.push({
        kind: "arm-leg-mode-change",
        sessionId: p.sessionId,
        recordedAt: p.recordedAt,
        metricKey,
        from: current,
        to: mode,
        message: `Arm–leg locking changed from ${current}:1 to ${mode}:1${where}, held for ${run} session${run > 1 ? "s" : ""}.`,
      });
      current = mode;
      candidate = null;
      run = 0;
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
  const ordered = orderSeries(points);
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
  for (const m of metrics) {
    const base = resolveMetricKey(m.key)?.base;
    if (base === "frequencyRatio") events.push(...detectModeChanges(m.key, m.points, options.confirmSessions));
    else if (base === "couplingStrength") events.push(...detectBandExit("coupling-drop", m.key, m.points, options));
    else if (base === "phaseCoordinationIndexPct") events.push(...detectBandExit("pci-rise", m.key, m.points, options));
  }
  return events.sort((a, b) => Date.parse(a.recordedAt) - Date.parse(b.recordedAt));
}
