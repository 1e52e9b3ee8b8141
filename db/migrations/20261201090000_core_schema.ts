import type { Knex } from "knex";
import {
  CONDITIONS,
  DEVICE_KINDS,
  DEVICE_STATUSES,
  FILE_FORMATS,
  PLACEMENTS,
  ROLES,
  SESSION_STATUSES,
  SEXES,
  TRAINING_KINDS,
  USER_STATUSES,
} from "../src/enums";

const list = (values: readonly string[]) => values.map((v) => `'${v}'`).join(", ");

export async function up(knex: Knex): Promise<void> {
  // btree_gist lets one exclusion constraint mix uuid equality with time-range overlap.
  await knex.raw("CREATE EXTENSION IF NOT EXISTS btree_gist");

  await knex.schema.createTable("patients", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.text("display_name").notNullable();
    t.text("research_id").notNullable().unique();
    t.integer("birth_year").notNullable();
    t.text("sex").notNullable();
    t.text("condition").notNullable();
    t.text("condition_detail");
    t.date("enrolled_on").notNullable();
    t.boolean("research_consent").notNullable().defaultTo(false);
    t.integer("expected_uploads_per_week").notNullable().defaultTo(1);
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw(`ALTER TABLE patients
    ADD CONSTRAINT patients_birth_year_range CHECK (birth_year BETWEEN 1900 AND 2100),
    ADD CONSTRAINT patients_sex_enum CHECK (sex IN (${list(SEXES)})),
    ADD CONSTRAINT patients_condition_enum CHECK (condition IN (${list(CONDITIONS)})),
    ADD CONSTRAINT patients_expected_uploads_range CHECK (expected_uploads_per_week BETWEEN 0 AND 14)`);

  await knex.schema.createTable("users", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.text("email").notNullable();
    t.text("display_name").notNullable();
    t.text("password_hash");
    t.text("role").notNullable();
    t.text("status").notNullable().defaultTo("invited");
    t.uuid("patient_id").references("patients.id").onDelete("RESTRICT");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("last_login_at", { useTz: true });
  });
  await knex.raw(`CREATE UNIQUE INDEX users_email_lower_unique ON users (lower(email))`);
  await knex.raw(`ALTER TABLE users
    ADD CONSTRAINT users_role_enum CHECK (role IN (${list(ROLES)})),
    ADD CONSTRAINT users_status_enum CHECK (status IN (${list(USER_STATUSES)})),
    ADD CONSTRAINT users_patient_link CHECK ((role = 'patient') = (patient_id IS NOT NULL)),
    ADD CONSTRAINT users_active_has_password CHECK (status <> 'active' OR password_hash IS NOT NULL)`);

  await knex.schema.createTable("caseload", (t) => {
    t.uuid("clinician_id").notNullable().references("users.id").onDelete("CASCADE");
    t.uuid("patient_id").notNullable().references("patients.id").onDelete("CASCADE");
    t.timestamp("since", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.primary(["clinician_id", "patient_id"]);
    t.index(["patient_id"]);
  });

  await knex.schema.createTable("devices", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.text("serial").notNullable().unique();
    t.text("kind").notNullable();
    t.text("firmware").notNullable();
    t.text("status").notNullable().defaultTo("in_stock");
    t.double("acc_range_g").notNullable().defaultTo(16);
    t.double("gyro_range_dps").notNullable().defaultTo(2000);
    t.text("notes");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw(`ALTER TABLE devices
    ADD CONSTRAINT devices_kind_enum CHECK (kind IN (${list(DEVICE_KINDS)})),
    ADD CONSTRAINT devices_status_enum CHECK (status IN (${list(DEVICE_STATUSES)})),
    ADD CONSTRAINT devices_ranges_positive CHECK (acc_range_g > 0 AND gyro_range_dps > 0)`);

  await knex.schema.createTable("device_assignments", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("device_id").notNullable().references("devices.id").onDelete("RESTRICT");
    t.uuid("patient_id").notNullable().references("patients.id").onDelete("RESTRICT");
    t.text("placement").notNullable();
    t.timestamp("valid_from", { useTz: true }).notNullable();
    t.timestamp("valid_to", { useTz: true });
    t.uuid("created_by").references("users.id").onDelete("SET NULL");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["patient_id", "valid_from"]);
  });
  // A device is on one body at a time, and one placement of one patient carries one device at a time.
  await knex.raw(`ALTER TABLE device_assignments
    ADD CONSTRAINT device_assignments_placement_enum CHECK (placement IN (${list(PLACEMENTS)})),
    ADD CONSTRAINT device_assignments_range_order CHECK (valid_to IS NULL OR valid_to > valid_from),
    ADD CONSTRAINT device_assignments_no_device_overlap
      EXCLUDE USING gist (device_id WITH =, tstzrange(valid_from, valid_to, '[)') WITH &&),
    ADD CONSTRAINT device_assignments_no_placement_overlap
      EXCLUDE USING gist (patient_id WITH =, placement WITH =, tstzrange(valid_from, valid_to, '[)') WITH &&)`);

  await knex.schema.createTable("walk_sessions", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("patient_id").notNullable().references("patients.id").onDelete("RESTRICT");
    t.timestamp("recorded_at", { useTz: true }).notNullable();
    t.uuid("uploaded_by").references("users.id").onDelete("SET NULL");
    t.text("status").notNullable().defaultTo("queued");
    t.integer("progress_pct").notNullable().defaultTo(0);
    t.integer("attempts").notNullable().defaultTo(0);
    t.text("algorithm_version");
    t.jsonb("analysis");
    t.text("error");
    // sha256 over the sorted per-file digests: the same set of files is the same session.
    t.text("content_sha256").notNullable();
    t.double("duration_s");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("processed_at", { useTz: true });
    t.unique(["patient_id", "content_sha256"]);
    t.index(["patient_id", "recorded_at"]);
    t.index(["status"]);
  });
  await knex.raw(`ALTER TABLE walk_sessions
    ADD CONSTRAINT walk_sessions_status_enum CHECK (status IN (${list(SESSION_STATUSES)})),
    ADD CONSTRAINT walk_sessions_progress_range CHECK (progress_pct BETWEEN 0 AND 100),
    ADD CONSTRAINT walk_sessions_done_has_analysis CHECK (status <> 'done' OR analysis IS NOT NULL)`);

  await knex.schema.createTable("raw_files", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("session_id").notNullable().references("walk_sessions.id").onDelete("RESTRICT");
    t.text("storage_key").notNullable().unique();
    t.text("sha256").notNullable();
    t.bigInteger("size_bytes").notNullable();
    t.text("original_name").notNullable();
    t.text("format").notNullable();
    t.text("device_serial").notNullable();
    t.uuid("device_id").references("devices.id").onDelete("RESTRICT");
    t.text("placement").notNullable();
    t.timestamp("start_utc", { useTz: true }).notNullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["session_id"]);
    t.index(["sha256"]);
  });
  await knex.raw(`ALTER TABLE raw_files
    ADD CONSTRAINT raw_files_format_enum CHECK (format IN (${list(FILE_FORMATS)})),
    ADD CONSTRAINT raw_files_placement_enum CHECK (placement IN (${list(PLACEMENTS)})),
    ADD CONSTRAINT raw_files_size_positive CHECK (size_bytes > 0)`);

  // Long format keeps trend queries one index range scan per patient and metric.
  await knex.schema.createTable("session_metrics", (t) => {
    t.uuid("session_id").notNullable().references("walk_sessions.id").onDelete("CASCADE");
    t.uuid("patient_id").notNullable().references("patients.id").onDelete("RESTRICT");
    t.timestamp("recorded_at", { useTz: true }).notNullable();
    t.text("metric_key").notNullable();
    t.double("value").notNullable();
    t.text("unit").notNullable();
    t.primary(["session_id", "metric_key"]);
    t.index(["patient_id", "metric_key", "recorded_at"]);
  });

  await knex.schema.createTable("strides", (t) => {
    t.bigIncrements("id");
    t.uuid("session_id").notNullable().references("walk_sessions.id").onDelete("CASCADE");
    t.integer("ordinal").notNullable();
    t.text("side").notNullable();
    t.double("ic_s").notNullable();
    t.double("next_ic_s").notNullable();
    t.double("fc_s");
    t.double("stride_time_s").notNullable();
    t.double("stance_pct");
    t.double("swing_pct");
    t.double("double_support_pct");
    t.boolean("steady").notNullable();
    t.text("excluded_reason");
    t.unique(["session_id", "ordinal"]);
  });
  await knex.raw(`ALTER TABLE strides
    ADD CONSTRAINT strides_side_enum CHECK (side IN ('left', 'right')),
    ADD CONSTRAINT strides_time_positive CHECK (stride_time_s > 0),
    ADD CONSTRAINT strides_pct_range CHECK (
      (stance_pct IS NULL OR stance_pct BETWEEN 0 AND 100) AND (swing_pct IS NULL OR swing_pct BETWEEN 0 AND 100))`);

  await knex.schema.createTable("clinician_notes", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("patient_id").notNullable().references("patients.id").onDelete("RESTRICT");
    t.uuid("session_id").references("walk_sessions.id").onDelete("SET NULL");
    t.uuid("author_id").notNullable().references("users.id").onDelete("RESTRICT");
    t.text("body").notNullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["patient_id", "created_at"]);
  });
  await knex.raw(`ALTER TABLE clinician_notes ADD CONSTRAINT clinician_notes_body_length CHECK (length(body) BETWEEN 1 AND 10000)`);

  await knex.schema.createTable("training_log", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("patient_id").notNullable().references("patients.id").onDelete("RESTRICT");
    t.uuid("author_id").notNullable().references("users.id").onDelete("RESTRICT");
    t.date("performed_on").notNullable();
    t.text("kind").notNullable();
    t.integer("minutes").notNullable();
    t.text("description");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["patient_id", "performed_on"]);
  });
  await knex.raw(`ALTER TABLE training_log
    ADD CONSTRAINT training_log_kind_enum CHECK (kind IN (${list(TRAINING_KINDS)})),
    ADD CONSTRAINT training_log_minutes_range CHECK (minutes BETWEEN 1 AND 600)`);

  await knex.schema.createTable("audit_events", (t) => {
    t.bigIncrements("id");
    t.timestamp("at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.uuid("actor_id").references("users.id").onDelete("SET NULL");
    t.text("actor_role");
    t.text("action").notNullable();
    t.text("resource_type").notNullable();
    t.text("resource_id");
    t.uuid("patient_id").references("patients.id").onDelete("SET NULL");
    t.text("ip");
    t.text("user_agent");
    t.jsonb("details");
    t.index(["at"]);
    t.index(["actor_id", "at"]);
    t.index(["patient_id", "at"]);
    t.index(["action", "at"]);
  });

  await knex.schema.createTable("refresh_tokens", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("user_id").notNullable().references("users.id").onDelete("CASCADE");
    t.text("token_sha256").notNullable().unique();
    t.timestamp("expires_at", { useTz: true }).notNullable();
    t.timestamp("revoked_at", { useTz: true });
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["user_id"]);
  });

  await knex.schema.createTable("invitations", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("user_id").notNullable().references("users.id").onDelete("CASCADE");
    t.text("token_sha256").notNullable().unique();
    t.uuid("invited_by").references("users.id").onDelete("SET NULL");
    t.timestamp("expires_at", { useTz: true }).notNullable();
    t.timestamp("accepted_at", { useTz: true });
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });

  await knex.schema.createTable("password_resets", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("user_id").notNullable().references("users.id").onDelete("CASCADE");
    t.text("token_sha256").notNullable().unique();
    t.timestamp("expires_at", { useTz: true }).notNullable();
    t.timestamp("used_at", { useTz: true });
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });

  // One row per message ever handed to SMTP: the unique key makes a retried job send nothing twice.
  await knex.schema.createTable("outbound_emails", (t) => {
    t.bigIncrements("id");
    t.text("idempotency_key").notNullable().unique();
    t.text("kind").notNullable();
    t.text("to_address").notNullable();
    t.text("subject").notNullable();
    t.timestamp("sent_at", { useTz: true });
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of [
    "outbound_emails",
    "password_resets",
    "invitations",
    "refresh_tokens",
    "audit_events",
    "training_log",
    "clinician_notes",
    "strides",
    "session_metrics",
    "raw_files",
    "walk_sessions",
    "device_assignments",
    "devices",
    "caseload",
    "users",
    "patients",
  ]) {
    await knex.schema.dropTableIfExists(table);
  }
}
