import type { Knex } from "knex";

export interface TrendRow {
  metric_key: string;
  unit: string;
  value: number;
  session_id: string;
  recorded_at: Date;
  /** Strides/steps behind the value (null when the analysis gave no count). */
  n: number | null;
  walking_aid: string | null;
}

/**
 * Metric rows of processed sessions, with the metric columns of a trend. The patient_id join
 * condition lets the planner read the patient's sessions by index instead of hashing every
 * processed session; the metric columns come from the covering index.
 */
function processedMetricRows(db: Knex) {
  return db("session_metrics as m")
    .join("walk_sessions as s", (j) => j.on("s.id", "m.session_id").andOn("s.patient_id", "m.patient_id"))
    .where("s.status", "done")
    .select("m.metric_key", "m.unit", "m.value", "m.session_id", "m.recorded_at", "m.n", "s.walking_aid");
}

/** Trend rows: one per processed session and metric, oldest first (index patient_id, metric_key, recorded_at). */
export function trendRows(db: Knex, patientId: string, keys: string[] | null, from?: string, to?: string): Promise<TrendRow[]> {
  const q = processedMetricRows(db)
    .andWhere("m.patient_id", patientId)
    .orderBy([{ column: "m.metric_key" }, { column: "m.recorded_at" }]);
  if (keys) q.whereIn("m.metric_key", keys);
  if (from) q.andWhere("m.recorded_at", ">=", from);
  if (to) q.andWhere("m.recorded_at", "<=", to);
  return q;
}

/**
 * Per patient, what its trend annotations depend on besides the patient's own fields: the number
 * of processed sessions and the latest update and processing times. Changes whenever a session is
 * processed, reprocessed or re-timed (the caseload flag cache's key).
 */
export async function trendFingerprints(db: Knex, patientIds: string[]): Promise<Map<string, string>> {
  const out = new Map(patientIds.map((id) => [id, "0||"]));
  if (patientIds.length === 0) return out;
  const rows: Array<{ patient_id: string; n: number; u: string; p: string }> = await db("walk_sessions")
    .whereIn("patient_id", patientIds)
    .andWhere("status", "done")
    .groupBy("patient_id")
    .select("patient_id", db.raw("count(*)::int AS n"), db.raw("max(updated_at)::text AS u"), db.raw("max(processed_at)::text AS p"));
  for (const r of rows) out.set(r.patient_id, `${r.n}|${r.u}|${r.p ?? ""}`);
  return out;
}

/** trendRows for several patients at once (the caseload's flags), grouped by patient. */
export async function trendRowsByPatient(db: Knex, patientIds: string[], keys: string[]): Promise<Map<string, TrendRow[]>> {
  const out = new Map<string, TrendRow[]>();
  if (patientIds.length === 0) return out;
  const rows: Array<TrendRow & { patient_id: string }> = await processedMetricRows(db)
    .select("m.patient_id")
    .whereIn("m.patient_id", patientIds)
    .whereIn("m.metric_key", keys)
    .orderBy([{ column: "m.patient_id" }, { column: "m.metric_key" }, { column: "m.recorded_at" }]);
  for (const r of rows) {
    let list = out.get(r.patient_id);
    if (!list) out.set(r.patient_id, (list = []));
    list.push(r);
  }
  return out;
}
