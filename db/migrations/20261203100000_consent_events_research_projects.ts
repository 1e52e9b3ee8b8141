import type { Knex } from "knex";

/**
 * Research consent as a history of events, and research projects with their own pseudonym keys.
 *
 * consent_events is append-only (an UPDATE is refused). Whether an event counts is stored with it
 * and checked here, so no code path can make a staff member's word stand in for the patient's:
 * - a withdrawal always counts, whoever records it;
 * - a "given" counts when the patient records it themself, or when an admin records it with a
 *   reason (e.g. a signed paper form on file);
 * - a "given" recorded by a clinician is a proposal the patient still has to confirm.
 *
 * patients.research_consent stays as a cache of "consent in force now", kept by triggers from the
 * counting events only: a patient row is always inserted without consent and the column cannot be
 * set by hand. Existing `true` values become a "given" event recorded by the earlier flag
 * ('migration'), which does not count: that flag was set by staff alone.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("consent_events", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    // Ties on `at` are ordered by insertion.
    t.specificType("seq", "bigint GENERATED ALWAYS AS IDENTITY").notNullable().unique();
    t.uuid("patient_id").notNullable().references("patients.id").onDelete("CASCADE");
    t.text("kind").notNullable();
    t.uuid("recorded_by").references("users.id").onDelete("SET NULL");
    t.text("recorder_role").notNullable();
    t.text("reason");
    t.boolean("counts").notNullable();
    t.timestamp("at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["patient_id", "at"]);
  });
  await knex.raw(`ALTER TABLE consent_events
    ADD CONSTRAINT consent_events_kind CHECK (kind IN ('given', 'withdrawn')),
    ADD CONSTRAINT consent_events_recorder_role CHECK (recorder_role IN ('patient', 'clinician', 'admin', 'migration')),
    ADD CONSTRAINT consent_events_reason_length CHECK (reason IS NULL OR char_length(reason) <= 500),
    ADD CONSTRAINT consent_events_admin_reason CHECK (recorder_role <> 'admin' OR char_length(btrim(coalesce(reason, ''))) >= 10),
    ADD CONSTRAINT consent_events_counts_rule CHECK (
      counts = (kind = 'withdrawn' OR recorder_role = 'patient' OR recorder_role = 'admin'))`);
  await knex.raw(`
    CREATE FUNCTION pendula_consent_in_force(p uuid) RETURNS boolean LANGUAGE sql STABLE AS $$
      SELECT coalesce((SELECT kind = 'given' FROM consent_events
                        WHERE patient_id = p AND counts ORDER BY at DESC, seq DESC LIMIT 1), false)
    $$;
    CREATE FUNCTION pendula_consent_events_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      RAISE EXCEPTION 'consent_events is append-only';
    END $$;
    CREATE TRIGGER consent_events_no_update BEFORE UPDATE ON consent_events
      FOR EACH ROW EXECUTE FUNCTION pendula_consent_events_append_only();
    CREATE FUNCTION pendula_consent_events_refresh() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      UPDATE patients SET research_consent = pendula_consent_in_force(NEW.patient_id) WHERE id = NEW.patient_id;
      RETURN NULL;
    END $$;
    CREATE TRIGGER consent_events_refresh AFTER INSERT ON consent_events
      FOR EACH ROW EXECUTE FUNCTION pendula_consent_events_refresh();
    CREATE FUNCTION pendula_patients_consent_from_events() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF TG_OP = 'INSERT' THEN
        NEW.research_consent := false;
      ELSE
        NEW.research_consent := pendula_consent_in_force(NEW.id);
      END IF;
      RETURN NEW;
    END $$;
  `);
  // Existing flags become history before the guard trigger exists, so the cache is recomputed once below.
  await knex.raw(`
    INSERT INTO consent_events (patient_id, kind, recorded_by, recorder_role, reason, counts, at)
    SELECT id, 'given', NULL, 'migration', 'recorded as a yes/no flag before consent history existed; awaiting confirmation', false, created_at
      FROM patients WHERE research_consent
  `);
  await knex.raw(`
    CREATE TRIGGER patients_consent_from_events BEFORE INSERT OR UPDATE OF research_consent ON patients
      FOR EACH ROW EXECUTE FUNCTION pendula_patients_consent_from_events();
    UPDATE patients SET research_consent = false WHERE research_consent;
  `);

  await knex.schema.createTable("research_projects", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.text("name").notNullable();
    t.text("purpose");
    t.uuid("owner_id").notNullable().references("users.id").onDelete("RESTRICT");
    // The project's pseudonym key is derived from this salt and the server's research secret, so a
    // database copy alone cannot turn exported ids back into patients.
    t.binary("key_salt").notNullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw(`ALTER TABLE research_projects
    ADD CONSTRAINT research_projects_name_length CHECK (char_length(btrim(name)) BETWEEN 3 AND 120),
    ADD CONSTRAINT research_projects_purpose_length CHECK (purpose IS NULL OR char_length(purpose) <= 1000),
    ADD CONSTRAINT research_projects_salt_length CHECK (octet_length(key_salt) = 32)`);
  await knex.raw("CREATE UNIQUE INDEX research_projects_owner_name ON research_projects (owner_id, lower(btrim(name)))");
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("research_projects");
  await knex.raw("DROP TRIGGER IF EXISTS patients_consent_from_events ON patients");
  // The cache holds exactly the counting history, which is what the flag meant from here on.
  await knex.schema.dropTable("consent_events");
  await knex.raw(`
    DROP FUNCTION IF EXISTS pendula_patients_consent_from_events();
    DROP FUNCTION IF EXISTS pendula_consent_events_refresh();
    DROP FUNCTION IF EXISTS pendula_consent_events_append_only();
    DROP FUNCTION IF EXISTS pendula_consent_in_force(uuid);
  `);
}
