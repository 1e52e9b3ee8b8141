/**
 * Which mean-relative-phase values may be compared across sessions.
 *
 * A mean phase only means something when the phases cluster: with uniformly scattered phases the
 * "mean" is noise. The signal already leaves the phase out when coupling is low; this gate applies
 * the same idea on the server, per session, with a stated test: the Rayleigh test of the session's
 * coupling strength R (statistics.ts `rayleighP`, Zar's approximation) must reject uniform phases
 * at p < 0.05. The number of independent phase observations is the count behind the phase value
 * (`n`, arm cycles) or else the session's steady stride count (one relative phase per cycle: common
 * practice, since samples within a cycle are not independent); without either, 10 — the fewest
 * strides for which the signal reports R.
 * A phase point that fails, or has no R, is kept for display with `excludedReason` and takes no
 * part in baselines, MDC or flags.
 */
import { metricDefinition } from "../contracts/metric-catalog";
import type { SeriesPoint } from "./change-flags";
import { rayleighP } from "./statistics";

export const PHASE_GATE_ALPHA = 0.05;
/** Fewest steady strides for which the signal reports R (signal/src/coordination/arm-leg-coupling.ts MIN_STEADY_STRIDES). */
export const PHASE_GATE_DEFAULT_STRIDES = 10;

export type PhaseExclusion = "weak-coupling" | "no-coupling-strength";

/** Why a phase with this R and stride count is not compared; `null` when it passes the gate. */
export function phaseExclusion(couplingStrength: number | undefined, strides: number | undefined): PhaseExclusion | null {
  if (couplingStrength === undefined || !Number.isFinite(couplingStrength)) return "no-coupling-strength";
  const r = Math.min(1, Math.max(0, couplingStrength));
  const n = strides !== undefined && Number.isInteger(strides) && strides >= 2 ? strides : PHASE_GATE_DEFAULT_STRIDES;
  return rayleighP(r, n) < PHASE_GATE_ALPHA ? null : "weak-coupling";
}

interface KeyedSeries {
  key: string;
  points: readonly SeriesPoint[];
}

/**
 * Returns the metrics with each mean-relative-phase point marked `excludedReason` when its
 * session's coupling strength (same arm–leg pair) fails the gate; other metrics are unchanged.
 */
export function gatePhaseSeries<T extends KeyedSeries>(metrics: readonly T[]): T[] {
  const strideSeries = metrics.find((m) => metricDefinition(m.key)?.base === "steadyStrideCount");
  const strides = new Map(strideSeries?.points.map((p) => [p.sessionId, p.value]) ?? []);
  return metrics.map((m) => {
    const resolved = metricDefinition(m.key);
    if (resolved?.base !== "meanRelativePhaseDeg") return m;
    const coupling = metrics.find((o) => {
      const r = metricDefinition(o.key);
      return r?.base === "couplingStrength" && r.pair === resolved.pair;
    });
    const rBySession = new Map(coupling?.points.map((p) => [p.sessionId, p.value]) ?? []);
    const points = m.points.map((p) => {
      const n = typeof p.n === "number" && Number.isFinite(p.n) ? p.n : strides.get(p.sessionId);
      const reason = phaseExclusion(rBySession.get(p.sessionId), n);
      return reason ? { ...p, excludedReason: reason } : p;
    });
    return { ...m, points };
  });
}
