import type { Knex } from "knex";

// Trend and caseload reads fetch every metric row of a patient in (metric_key, recorded_at) order.
// With the selected columns in the index the read is an index-only scan in that order: no heap
// page per row (a patient's rows are spread over one page per session) and no sort.
export async function up(knex: Knex): Promise<void> {
  await knex.raw("DROP INDEX IF EXISTS session_metrics_patient_id_metric_key_recorded_at_index");
  await knex.raw(
    "CREATE INDEX session_metrics_trend_read_index ON session_metrics (patient_id, metric_key, recorded_at) INCLUDE (value, unit, session_id)",
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw("DROP INDEX IF EXISTS session_metrics_trend_read_index");
  await knex.raw("CREATE INDEX session_metrics_patient_id_metric_key_recorded_at_index ON session_metrics (patient_id, metric_key, recorded_at)");
}
