import { prepareDatabase } from "./setup/prepare-database";

/**
 * `tsx ingest-server/src/prepare-database.ts`, after the migrations: installs the queue, creates
 * its queues and prepares the application role (setup/prepare-database.ts). Reads
 * MIGRATION_DATABASE_URL (the tables' owner), DATABASE_URL (the application) and QUEUE_SCHEMA.
 */
const migrationUrl = process.env.MIGRATION_DATABASE_URL || process.env.DATABASE_URL;
const appUrl = process.env.DATABASE_URL;
if (!migrationUrl || !appUrl) {
  console.error("prepare-database: DATABASE_URL (and MIGRATION_DATABASE_URL for a separate owner) must be set");
  process.exit(2);
}
const queueSchema = process.env.QUEUE_SCHEMA || "pgboss";
if (!/^[a-z_][a-z0-9_]*$/.test(queueSchema)) {
  console.error("prepare-database: QUEUE_SCHEMA must be a lower-case SQL identifier");
  process.exit(2);
}
await prepareDatabase({ migrationUrl, appUrl, queueSchema });
