import type { Knex } from "knex";
import { WALKING_AIDS } from "../src/enums";

const list = (values: readonly string[]) => values.map((v) => `'${v}'`).join(", ");

/**
 * - patients.height_cm: standing height, entered by the clinician; the analysis scales spatial
 *   estimates (stride length, walking speed) with body size. Nullable: unknown until entered.
 * - walk_sessions.walking_aid: the aid used during that test (recorded by the clinician), because an
 *   aid changes arm swing and speed and a trend must show when it changed.
 * - session_metrics.n: how many strides/steps each stored value rests on (the analysis' counts).
 *   The trend read's covering index gains it, so trend reads stay index-only.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("patients", (t) => {
    t.double("height_cm");
  });
  await knex.raw("ALTER TABLE patients ADD CONSTRAINT patients_height_cm_range CHECK (height_cm IS NULL OR height_cm BETWEEN 100 AND 230)");
  await knex.schema.alterTable("walk_sessions", (t) => {
    t.text("walking_aid");
  });
  await knex.raw(`ALTER TABLE walk_sessions ADD CONSTRAINT walk_sessions_walking_aid_enum CHECK (walking_aid IS NULL OR walking_aid IN (${list(WALKING_AIDS)}))`);
  await knex.schema.alterTable("session_metrics", (t) => {
    t.integer("n");
  });
  await knex.raw("ALTER TABLE session_metrics ADD CONSTRAINT session_metrics_n_non_negative CHECK (n IS NULL OR n >= 0)");
  await knex.raw("DROP INDEX IF EXISTS session_metrics_trend_read_index");
  await knex.raw(
    "CREATE INDEX session_metrics_trend_read_index ON session_metrics (patient_id, metric_key, recorded_at) INCLUDE (value, unit, session_id, n)",
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw("DROP INDEX IF EXISTS session_metrics_trend_read_index");
  await knex.schema.alterTable("session_metrics", (t) => {
    t.dropColumn("n");
  });
  await knex.raw(
    "CREATE INDEX session_metrics_trend_read_index ON session_metrics (patient_id, metric_key, recorded_at) INCLUDE (value, unit, session_id)",
  );
  await knex.schema.alterTable("walk_sessions", (t) => {
    t.dropColumn("walking_aid");
  });
  await knex.schema.alterTable("patients", (t) => {
    t.dropColumn("height_cm");
  });
}
