import type { Metrics } from "@pendula/signal";
import { METRICS, type MetricDefinition, type MetricKey } from "../contracts/metric-catalog";

/*
 * Where an analysis' metrics become `session_metrics` rows (contracts/metric-catalog.ts describes
 * each metric). Every row is one catalogue entry read by its accessor, so a key the catalogue does
 * not list is never written.
 */

export interface MetricValue {
  key: MetricKey;
  value: number;
  unit: string;
  /** Strides/steps the value rests on (from `Metrics.counts`); null when the analysis gave none. */
  n: number | null;
}

/** The count behind one metric: the first of its count keys the analysis filled with a whole number ≥ 0. */
export function metricCount(def: Pick<MetricDefinition, "countKeys">, metrics: Pick<Metrics, "counts">): number | null {
  const counts = metrics.counts ?? {};
  for (const k of def.countKeys) {
    const n = counts[k];
    if (typeof n === "number" && Number.isInteger(n) && n >= 0) return n;
  }
  return null;
}

/** Flattens an analysis' metrics to long-format rows; null and non-finite values are left out, not stored as 0. */
export function metricRows(metrics: Metrics): MetricValue[] {
  const rows: MetricValue[] = [];
  for (const def of METRICS) {
    const value = def.read(metrics);
    if (typeof value === "number" && Number.isFinite(value)) rows.push({ key: def.key, value, unit: def.unit, n: metricCount(def, metrics) });
  }
  return rows;
}
