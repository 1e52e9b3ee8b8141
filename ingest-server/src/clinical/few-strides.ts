/**
 * Sessions with too few strides behind a variability value are shown but not compared.
 *
 * Galna, Lord & Rochester 2013 (Gait & Posture; abstract: older adults and early Parkinson's
 * disease, a week apart) recommend a continuous walk and "no fewer than 30 steps" for reliable
 * gait variability, most of the gain coming over the first 30 steps. The count each trend point carries (`n`, the
 * strides or steps the analysis used) is compared with that: a pooled left+right stride count needs
 * 30 (each stride ends at one step, so 30 strides span at least 30 steps); a one-side count needs 15
 * (15 strides of one foot span 30 steps). Points below it get `excludedReason: "few-strides"`, so
 * they take no part in baselines, MDC or flags, and the caseload can say why a session was not
 * compared. Points without a count are compared as before (older sessions stored no count).
 */
import { metricDefinition, type BaseMetric } from "../contracts/metric-catalog";
import type { SeriesPoint } from "./change-flags";

export const MIN_STEPS_FOR_VARIABILITY = 30;

const VARIABILITY_METRICS = new Set<BaseMetric>(["strideTimeCvPct", "swingTimeCvPct"]);

/** Minimum count for this key, or null when the key is not a variability metric. */
export function minimumCountFor(metricKey: string): number | null {
  const r = metricDefinition(metricKey);
  if (!r || !VARIABILITY_METRICS.has(r.base)) return null;
  return r.side ? MIN_STEPS_FOR_VARIABILITY / 2 : MIN_STEPS_FOR_VARIABILITY;
}

export function gateFewStrides<T extends { key: string; points: readonly SeriesPoint[] }>(metrics: readonly T[]): T[] {
  return metrics.map((m) => {
    const min = minimumCountFor(m.key);
    if (min === null) return m;
    const points = m.points.map((p) =>
      !p.excludedReason && typeof p.n === "number" && Number.isFinite(p.n) && p.n < min ? { ...p, excludedReason: "few-strides" } : p,
    );
    return { ...m, points };
  });
}
