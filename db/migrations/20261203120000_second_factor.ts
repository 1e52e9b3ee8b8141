import type { Knex } from "knex";

/**
 * Second factor (TOTP, RFC 6238) and the end of already-issued access tokens.
 * - user_totp: one authenticator secret per account, sealed (AES-256-GCM) by the server; a row
 *   with confirmed_at NULL is an enrolment waiting for its first code. last_step is the RFC 6238
 *   time step of the last accepted code, so a code is never accepted twice.
 * - recovery_codes: single-use codes, only their sha256 stored.
 * - sign_in_challenges: the short-lived step between a correct password and a correct code;
 *   failed_attempts caps guessing per challenge and, summed per user, per window.
 * - refresh_tokens.second_factor: whether the session passed the second factor (a staff session
 *   that did not is limited to enrolment).
 * - users.session_epoch: access tokens carry the epoch they were issued in; raising it (password
 *   reset, refresh-token theft, second-factor reset) ends every access token issued before.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("users", (t) => {
    t.integer("session_epoch").notNullable().defaultTo(0);
  });
  await knex.schema.alterTable("refresh_tokens", (t) => {
    t.boolean("second_factor").notNullable().defaultTo(false);
  });
  await knex.schema.createTable("user_totp", (t) => {
    t.uuid("user_id").primary().references("users.id").onDelete("CASCADE");
    t.text("secret_sealed").notNullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("confirmed_at", { useTz: true });
    t.bigInteger("last_step");
  });
  await knex.schema.createTable("recovery_codes", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("user_id").notNullable().references("users.id").onDelete("CASCADE");
    t.text("code_sha256").notNullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("used_at", { useTz: true });
    t.unique(["user_id", "code_sha256"]);
  });
  await knex.schema.createTable("sign_in_challenges", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("user_id").notNullable().references("users.id").onDelete("CASCADE");
    t.text("token_sha256").notNullable().unique();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("expires_at", { useTz: true }).notNullable();
    t.integer("failed_attempts").notNullable().defaultTo(0);
    t.timestamp("used_at", { useTz: true });
    t.index(["user_id", "created_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("sign_in_challenges");
  await knex.schema.dropTableIfExists("recovery_codes");
  await knex.schema.dropTableIfExists("user_totp");
  await knex.schema.alterTable("refresh_tokens", (t) => {
    t.dropColumn("second_factor");
  });
  await knex.schema.alterTable("users", (t) => {
    t.dropColumn("session_epoch");
  });
}
