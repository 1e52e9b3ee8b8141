import type { Knex } from "knex";
import { METRIC_KEYS } from "../contracts/metric-catalog";

/**
 * The one place where stored `session_metrics` rows (one per session and metric key, written by
 * the worker) become the shapes the server answers with. Two shapes, one function each:
 *
 * - per session: `metricsBySession` / `readSessionMetrics` — a session's values and the number of
 *   strides, steps or arm cycles behind each (session list and detail, caseload latest values,
 *   research export);
 * - per metric: `metricSeries` — one time series per metric key in catalogue order (trend page,
 *   caseload flags, clinical e-mails), so the three readers of a patient's history build the same
 *   series and cannot judge it differently.
 */

/** A stored value and how many strides, steps or arm cycles it rests on (null when the analysis gave no count). */
export interface StoredMetric {
  value: number;
  n: number | null;
}

/** One session's stored metrics by key, in the order the rows came. */
export type SessionMetrics = Map<string, StoredMetric>;

/** The columns of a `session_metrics` row the per-session shape reads. */
export interface SessionMetricRow {
  session_id: string;
  metric_key: string;
  /** `double precision`; a string only if a driver setting ever hands numbers over as text. */
  value: number | string;
  n?: number | string | null;
}

const countOf = (n: number | string | null | undefined): number | null => (n === null || n === undefined ? null : Number(n));

/** Rows → a map per session; a session without rows is absent. */
export function metricsBySession(rows: Iterable<SessionMetricRow>): Map<string, SessionMetrics> {
  const out = new Map<string, SessionMetrics>();
  for (const r of rows) {
    let session = out.get(r.session_id);
    if (!session) out.set(r.session_id, (session = new Map()));
    session.set(r.metric_key, { value: Number(r.value), n: countOf(r.n) });
  }
  return out;
}

/** Just the values of one session's metrics, keyed by metric ({} for a session without any). */
export function metricValues(metrics: SessionMetrics | undefined): Record<string, number> {
  const out: Record<string, number> = {};
  if (metrics) for (const [key, m] of metrics) out[key] = m.value;
  return out;
}

/**
 * The stored metrics of `sessionIds` (only `keys`, when given), per session. The single read of
 * `session_metrics` by session: the primary key (session_id, metric_key) serves it.
 */
export async function readSessionMetrics(db: Knex, sessionIds: readonly string[], keys?: readonly string[]): Promise<Map<string, SessionMetrics>> {
  if (sessionIds.length === 0 || keys?.length === 0) return new Map();
  const q = db("session_metrics").whereIn("session_id", [...sessionIds]).select("session_id", "metric_key", "value", "n");
  if (keys) q.whereIn("metric_key", [...keys]);
  return metricsBySession((await q) as SessionMetricRow[]);
}

/** The columns of a `session_metrics` row (joined with its session) the per-metric shape reads. */
export interface MetricSeriesRow extends SessionMetricRow {
  unit: string;
  recorded_at: Date | string;
  /** The session's walking aid, when the query joined it. */
  walking_aid?: string | null;
}

export interface MetricSeriesPoint {
  sessionId: string;
  /** ISO 8601 instant in UTC. */
  recordedAt: string;
  value: number;
  n: number | null;
  walkingAid: string | null;
}

export interface MetricSeries {
  key: string;
  unit: string;
  points: MetricSeriesPoint[];
}

const CATALOGUE_ORDER = new Map<string, number>(METRIC_KEYS.map((key, i) => [key, i]));
const catalogueIndex = (key: string) => CATALOGUE_ORDER.get(key) ?? -1;

/**
 * Rows → one series per metric key, in catalogue order (keys the catalogue does not know first);
 * points keep the order of the rows, so callers order their query by time.
 */
export function metricSeries(rows: Iterable<MetricSeriesRow>): MetricSeries[] {
  const grouped = new Map<string, MetricSeries>();
  for (const r of rows) {
    let m = grouped.get(r.metric_key);
    if (!m) grouped.set(r.metric_key, (m = { key: r.metric_key, unit: r.unit, points: [] }));
    m.points.push({
      sessionId: r.session_id,
      recordedAt: new Date(r.recorded_at).toISOString(),
      value: Number(r.value),
      n: countOf(r.n),
      walkingAid: r.walking_aid ?? null,
    });
  }
  return [...grouped.values()].sort((a, b) => catalogueIndex(a.key) - catalogueIndex(b.key));
}
