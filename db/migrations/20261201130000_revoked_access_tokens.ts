import type { Knex } from "knex";

// Access tokens are short-lived JWTs; signing out puts the presented token's id here so it stops
// working at once instead of at its expiry. Rows past expires_at can be deleted at any time.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("revoked_access_tokens", (t) => {
    t.text("jti").primary();
    t.uuid("user_id").notNullable().references("users.id").onDelete("CASCADE");
    t.timestamp("expires_at", { useTz: true }).notNullable().index();
    t.timestamp("revoked_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("revoked_access_tokens");
}
