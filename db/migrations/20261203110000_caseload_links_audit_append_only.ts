import type { Knex } from "knex";

/**
 * Caseload links as a resource with history, and an append-only audit trail.
 *
 * - `caseload` stays the table every access check reads (one row per open link, primary key on
 *   the pair), so the hot read paths are unchanged. `caseload_links` keeps every link ever made:
 *   who made it, when and why, and who ended it, when and why. The caseload-links service writes
 *   both in one transaction; triggers on `caseload` record links written by anything else (the demo
 *   seed, test fixtures, a cascade) so the history cannot miss one.
 * - `audit_events` refuses UPDATE, DELETE and TRUNCATE for every role through statement triggers
 *   (a grant would not bind the table's owner, which the application may be). Its foreign keys
 *   were ON DELETE SET NULL, i.e. an UPDATE of audit rows whenever a user or patient was deleted;
 *   they become RESTRICT: accounts are disabled, never deleted, once they have a history.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("caseload_links", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("clinician_id").notNullable().references("users.id").onDelete("RESTRICT");
    t.uuid("patient_id").notNullable().references("patients.id").onDelete("RESTRICT");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    /** Null for links recorded before this table existed or written outside the service. */
    t.uuid("created_by").references("users.id").onDelete("RESTRICT");
    t.text("reason");
    t.timestamp("ended_at", { useTz: true });
    t.uuid("ended_by").references("users.id").onDelete("RESTRICT");
    t.text("end_reason");
    t.index(["patient_id", "created_at"]);
    t.index(["clinician_id", "created_at"]);
  });
  await knex.raw(`ALTER TABLE caseload_links
    ADD CONSTRAINT caseload_links_end_after_start CHECK (ended_at IS NULL OR ended_at >= created_at),
    ADD CONSTRAINT caseload_links_end_fields CHECK (ended_at IS NOT NULL OR (ended_by IS NULL AND end_reason IS NULL))`);
  // One open link per pair; ended ones accumulate as history.
  await knex.raw(`CREATE UNIQUE INDEX caseload_links_one_open ON caseload_links (clinician_id, patient_id) WHERE ended_at IS NULL`);

  await knex.raw(`INSERT INTO caseload_links (clinician_id, patient_id, created_at) SELECT clinician_id, patient_id, since FROM caseload`);

  await knex.raw(`
    CREATE FUNCTION caseload_links_record_insert() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      INSERT INTO caseload_links (clinician_id, patient_id, created_at)
      SELECT NEW.clinician_id, NEW.patient_id, NEW.since
      WHERE NOT EXISTS (
        SELECT 1 FROM caseload_links l
        WHERE l.clinician_id = NEW.clinician_id AND l.patient_id = NEW.patient_id AND l.ended_at IS NULL);
      RETURN NULL;
    END $$`);
  await knex.raw(`
    CREATE FUNCTION caseload_links_record_delete() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      UPDATE caseload_links SET ended_at = greatest(now(), created_at)
      WHERE clinician_id = OLD.clinician_id AND patient_id = OLD.patient_id AND ended_at IS NULL;
      RETURN NULL;
    END $$`);
  await knex.raw(`CREATE TRIGGER caseload_links_record_insert AFTER INSERT ON caseload FOR EACH ROW EXECUTE FUNCTION caseload_links_record_insert()`);
  await knex.raw(`CREATE TRIGGER caseload_links_record_delete AFTER DELETE ON caseload FOR EACH ROW EXECUTE FUNCTION caseload_links_record_delete()`);

  await knex.raw(`
    CREATE FUNCTION audit_events_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      RAISE EXCEPTION 'audit_events is append-only: % refused', TG_OP USING ERRCODE = 'insufficient_privilege';
    END $$`);
  // Statement level: fires even when the WHERE clause matches nothing, and covers TRUNCATE.
  await knex.raw(
    `CREATE TRIGGER audit_events_append_only BEFORE UPDATE OR DELETE OR TRUNCATE ON audit_events FOR EACH STATEMENT EXECUTE FUNCTION audit_events_append_only()`,
  );
  await knex.raw(`ALTER TABLE audit_events
    DROP CONSTRAINT audit_events_actor_id_foreign,
    DROP CONSTRAINT audit_events_patient_id_foreign,
    ADD CONSTRAINT audit_events_actor_id_foreign FOREIGN KEY (actor_id) REFERENCES users(id) ON DELETE RESTRICT,
    ADD CONSTRAINT audit_events_patient_id_foreign FOREIGN KEY (patient_id) REFERENCES patients(id) ON DELETE RESTRICT`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(`ALTER TABLE audit_events
    DROP CONSTRAINT audit_events_actor_id_foreign,
    DROP CONSTRAINT audit_events_patient_id_foreign,
    ADD CONSTRAINT audit_events_actor_id_foreign FOREIGN KEY (actor_id) REFERENCES users(id) ON DELETE SET NULL,
    ADD CONSTRAINT audit_events_patient_id_foreign FOREIGN KEY (patient_id) REFERENCES patients(id) ON DELETE SET NULL`);
  await knex.raw(`DROP TRIGGER audit_events_append_only ON audit_events`);
  await knex.raw(`DROP FUNCTION audit_events_append_only()`);
  await knex.raw(`DROP TRIGGER caseload_links_record_delete ON caseload`);
  await knex.raw(`DROP TRIGGER caseload_links_record_insert ON caseload`);
  await knex.raw(`DROP FUNCTION caseload_links_record_delete()`);
  await knex.raw(`DROP FUNCTION caseload_links_record_insert()`);
  await knex.schema.dropTable("caseload_links");
}
