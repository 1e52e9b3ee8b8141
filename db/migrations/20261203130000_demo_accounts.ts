import type { Knex } from "knex";

/**
 * users.is_demo marks the invented scenario's accounts (published password), set by the demo seed.
 * A production start refuses to run while any exists. Accounts seeded before this column get it
 * from the demo e-mail domain, which only the seed uses.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("users", (t) => {
    t.boolean("is_demo").notNullable().defaultTo(false);
  });
  await knex.raw(`UPDATE users SET is_demo = true WHERE lower(email) LIKE '%@demo.pendula.test'`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("users", (t) => {
    t.dropColumn("is_demo");
  });
}
