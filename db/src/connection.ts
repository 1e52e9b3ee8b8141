import knex, { type Knex } from "knex";
import pg from "pg";
import { migrationSource } from "./migration-source";

/**
 * Connection settings come from DATABASE_URL (set by scripts/start.sh and scripts/test.sh, which
 * run their own loopback cluster). Failing loudly beats silently connecting to some default server.
 */
export function databaseUrl(env: NodeJS.ProcessEnv = process.env): string {
  const url = env.DATABASE_URL;
  if (!url) throw new Error("DATABASE_URL is not set (scripts/start.sh and scripts/test.sh set it)");
  return url;
}

/**
 * A DATE is a calendar day, not an instant. node-postgres' default turns it into local midnight,
 * so every reader had to undo that and the ways of undoing it disagreed by a day east of UTC.
 * Each pooled connection therefore hands DATE columns over as the stored 'YYYY-MM-DD' text, in
 * every time zone; readers use that string as it is.
 */
function readDatesAsText(connection: pg.Client, done: (err: Error | null, connection: pg.Client) => void): void {
  connection.setTypeParser(pg.types.builtins.DATE, "text", (value: string) => value);
  done(null, connection);
}

export function knexConfig(url = databaseUrl()): Knex.Config {
  return {
    client: "pg",
    connection: url,
    pool: { min: 0, max: Number(process.env.DB_POOL_MAX ?? 10), afterCreate: readDatesAsText },
    migrations: { migrationSource, tableName: "knex_migrations" },
  };
}

export function createDb(url = databaseUrl()): Knex {
  return knex(knexConfig(url));
}
