import type { Knex } from "knex";

/**
 * Refresh rotation with a short reuse grace: two tabs loading at once present the same refresh
 * token, and the slower one must not be taken for a thief.
 * - replaced_by: the session that took over when this token was rotated. Only rotation sets it, so
 *   a token ended by sign-out, password reset or theft detection never has a successor to lean on.
 * - grace_until: until when this rotated token may be presented once more (cleared when used).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("refresh_tokens", (t) => {
    t.uuid("replaced_by").references("refresh_tokens.id").onDelete("SET NULL");
    t.timestamp("grace_until", { useTz: true });
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("refresh_tokens", (t) => {
    t.dropColumn("grace_until");
    t.dropColumn("replaced_by");
  });
}
