import knex, { type Knex } from "knex";
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

export function knexConfig(url = databaseUrl()): Knex.Config {
  return {
    client: "pg",
    connection: url,
    pool: { min: 0, max: Number(process.env.DB_POOL_MAX ?? 10) },
    migrations: { migrationSource, tableName: "knex_migrations" },
  };
}

export function createDb(url = databaseUrl()): Knex {
  return knex(knexConfig(url));
}
