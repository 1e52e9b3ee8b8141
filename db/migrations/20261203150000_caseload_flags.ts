import type { Knex } from "knex";

/**
 * The caseload table's flags, stored per patient when a session is processed, so the first
 * caseload read after a start is a join instead of every patient's trend series run through the
 * change rules. `source_fingerprint` names the inputs the flags were computed from (processed
 * sessions, the patient's fields, the rules' version); a read whose fingerprint differs recomputes
 * the row, so a writer that forgot to refresh it can never show a stale flag.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("caseload_flags", (t) => {
    t.uuid("patient_id").primary().references("patients.id").onDelete("CASCADE");
    // [{ metricKey, flag }] of the patient's latest processed session; described (words, severity) on read.
    t.jsonb("flags").notNullable();
    t.uuid("latest_session_id").references("walk_sessions.id").onDelete("SET NULL");
    t.text("rules_version").notNullable();
    t.text("source_fingerprint").notNullable();
    t.timestamp("computed_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("caseload_flags");
}
