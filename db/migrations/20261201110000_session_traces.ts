import type { Knex } from "knex";

/**
 * Additions for the processing worker:
 * - session_traces: the sagittal angular velocity of each placement on the session time base, as
 *   written by the worker from the same run that produced the events, so the session chart and the
 *   analysis can never disagree and the chart route does no parsing. Float32 little-endian samples.
 * - raw_files.recording_placements: for a BIDS Motion data file (several tracked points in one file)
 *   the placement of each recording by device serial; null for one-device sensor CSV files.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("session_traces", (t) => {
    t.uuid("session_id").notNullable().references("walk_sessions.id").onDelete("CASCADE");
    t.text("placement").notNullable();
    t.double("sample_rate_hz").notNullable();
    t.double("start_s").notNullable();
    t.integer("sample_count").notNullable();
    t.binary("samples").notNullable();
    t.primary(["session_id", "placement"]);
  });
  await knex.raw(`ALTER TABLE session_traces
    ADD CONSTRAINT session_traces_rate_positive CHECK (sample_rate_hz > 0),
    ADD CONSTRAINT session_traces_length CHECK (octet_length(samples) = 4 * sample_count)`);
  await knex.schema.alterTable("raw_files", (t) => {
    t.jsonb("recording_placements");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("raw_files", (t) => {
    t.dropColumn("recording_placements");
  });
  await knex.schema.dropTableIfExists("session_traces");
}
