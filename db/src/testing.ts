import { randomBytes } from "node:crypto";
import knex, { type Knex } from "knex";
import { knexConfig } from "./connection";

/**
 * Throwaway databases for tests. scripts/test.sh runs a private cluster and exports
 * PENDULA_TEST_PG (server URL without a database). Each caller gets a fresh database cloned from a
 * migrated template, so test files never see each other's rows and cloning costs ~100 ms, not a migration.
 */
const TEMPLATE = "pendula_template";

function serverUrl(): string {
  const url = process.env.PENDULA_TEST_PG;
  if (!url) throw new Error("PENDULA_TEST_PG is not set: run tests through `npm test` (scripts/test.sh)");
  return url.replace(/\/+$/, "");
}

async function withAdmin<T>(fn: (admin: Knex) => Promise<T>): Promise<T> {
  const admin = knex({ client: "pg", connection: `${serverUrl()}/postgres`, pool: { min: 0, max: 1 } });
  try {
    return await fn(admin);
  } finally {
    await admin.destroy();
  }
}

// The admin pool holds one connection, so a session-level advisory lock covers every statement
// (CREATE DATABASE cannot run inside a transaction, so a transaction-scoped lock is not an option).
async function locked<T>(admin: Knex, fn: () => Promise<T>): Promise<T> {
  await admin.raw("SELECT pg_advisory_lock(424242)");
  try {
    return await fn();
  } finally {
    await admin.raw("SELECT pg_advisory_unlock(424242)");
  }
}

/** Creates and migrates the template once per cluster; concurrent callers serialise on an advisory lock. */
export async function ensureTemplate(): Promise<void> {
  await withAdmin(async (admin) => {
    await locked(admin, async () => {
      const exists = await admin.raw("SELECT 1 FROM pg_database WHERE datname = ?", [TEMPLATE]);
      if (exists.rows.length === 0) await admin.raw(`CREATE DATABASE ${TEMPLATE}`);
      const db = knex(knexConfig(`${serverUrl()}/${TEMPLATE}`));
      try {
        await db.migrate.latest();
      } finally {
        await db.destroy();
      }
    });
  });
}

export interface TestDatabase {
  url: string;
  name: string;
  drop(): Promise<void>;
}

export async function createTestDatabase(prefix = "t"): Promise<TestDatabase> {
  await ensureTemplate();
  const name = `${prefix.replace(/[^a-z0-9_]/gi, "_").toLowerCase()}_${randomBytes(5).toString("hex")}`;
  await withAdmin(async (admin) => {
    // CREATE DATABASE … TEMPLATE fails while another session is connected to the template.
    await locked(admin, () => admin.raw(`CREATE DATABASE ${name} TEMPLATE ${TEMPLATE}`));
  });
  const url = `${serverUrl()}/${name}`;
  return {
    url,
    name,
    drop: () => withAdmin(async (admin) => void (await admin.raw(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`))),
  };
}
