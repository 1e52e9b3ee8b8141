import { randomBytes } from "node:crypto";
import { tmpdir } from "node:os";
import { join } from "node:path";
import knex, { type Knex } from "knex";
import PgBoss from "pg-boss";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb, createTestDatabase, quoteIdent, type TestDatabase } from "@pendula/db";
import { ensureClinicalSchedules } from "../../ingest-server/src/clinical/notifications";
import { PgBossQueue, QUEUES } from "../../ingest-server/src/queue/queue";
import { prepareDatabase } from "../../ingest-server/src/setup/prepare-database";

/**
 * The application role that `npm start` gives the server and workers (DATABASE_URL), prepared by
 * the same code the start scripts run (setup/prepare-database.ts) on a throwaway database. The test
 * cluster authenticates with trust, so what is checked here is what the role may do once signed
 * in; the password check itself is exercised by `npm start`'s scram-sha-256 cluster (README).
 * What must be refused is PostgreSQL's documented privilege model (PostgreSQL 15 manual: COPY
 * "TO PROGRAM" needs superuser or pg_execute_server_program; pg_authid is readable by superusers only).
 */
let database: TestDatabase;
let owner: Knex;
let app: Knex;
let appUrl: string;
const role = `pendula_app_t${randomBytes(4).toString("hex")}`;
const queueSchema = "pgboss";

beforeAll(async () => {
  database = await createTestDatabase("approle");
  owner = createDb(database.url);
  const u = new URL(database.url);
  u.username = role;
  u.password = randomBytes(16).toString("hex");
  appUrl = u.toString();
  const lines: string[] = [];
  await prepareDatabase({ migrationUrl: database.url, appUrl, queueSchema, log: (l) => lines.push(l) });
  expect(lines.join("\n")).toContain(`role ${role}`);
  app = knex({ client: "pg", connection: appUrl, pool: { min: 0, max: 2 } });
}, 60_000);

afterAll(async () => {
  await app?.destroy();
  await owner?.destroy();
  await database?.drop();
  // The role's grants lived in the dropped database; only the role itself is left.
  const admin = knex({ client: "pg", connection: database.url.replace(/\/[^/]+$/, "/postgres"), pool: { min: 0, max: 1 } });
  try {
    await admin.raw(`DROP ROLE IF EXISTS ${quoteIdent(role)}`);
  } finally {
    await admin.destroy();
  }
});

describe("the application role", () => {
  it("is a plain login role: no superuser, no role or database creation, member of no other role", async () => {
    const { rows } = await owner.raw(
      "SELECT rolsuper, rolcreaterole, rolcreatedb, rolreplication, rolbypassrls, rolinherit, rolcanlogin FROM pg_roles WHERE rolname = ?",
      [role],
    );
    expect(rows).toEqual([
      { rolsuper: false, rolcreaterole: false, rolcreatedb: false, rolreplication: false, rolbypassrls: false, rolinherit: false, rolcanlogin: true },
    ]);
    const members = await owner.raw("SELECT 1 FROM pg_auth_members m JOIN pg_roles u ON u.oid = m.member WHERE u.rolname = ?", [role]);
    expect(members.rows).toHaveLength(0);
  });

  it("reads and writes the app's rows", async () => {
    const [d] = await app("devices").insert({ serial: "ROLE-0001", kind: "imu6", firmware: "1.0" }).returning("id");
    await app("devices").where({ id: d.id }).update({ firmware: "1.1" });
    expect(await app("devices").where({ id: d.id }).first("firmware")).toEqual({ firmware: "1.1" });
    await app("devices").where({ id: d.id }).delete();
  });

  it("cannot run a program on the server through COPY … TO PROGRAM", async () => {
    await expect(app.raw("COPY (SELECT 1) TO PROGRAM 'true'")).rejects.toThrow(/permission denied|must be superuser|pg_execute_server_program/);
  });

  it("cannot read or write server files", async () => {
    await expect(app.raw("SELECT pg_read_file('postgresql.conf')")).rejects.toThrow(/permission denied/);
    // An absolute path (COPY refuses relative ones before checking privileges), in this machine's temp folder.
    const target = join(tmpdir(), "pendula-role-test");
    await expect(app.raw(`COPY (SELECT 1) TO '${target}'`)).rejects.toThrow(/permission denied|must be superuser|pg_write_server_files/);
  });

  it("cannot read password hashes (pg_authid)", async () => {
    await expect(app.raw("SELECT rolpassword FROM pg_authid")).rejects.toThrow(/permission denied/);
  });

  it("cannot change the schema: no CREATE TABLE, ALTER, DROP or TRUNCATE, in the app's schema or the queue's", async () => {
    await expect(app.raw("CREATE TABLE public.intruder (x int)")).rejects.toThrow(/permission denied/);
    await expect(app.raw(`CREATE TABLE ${queueSchema}.intruder (x int)`)).rejects.toThrow(/permission denied/);
    await expect(app.raw("ALTER TABLE users ADD COLUMN intruder int")).rejects.toThrow(/must be owner/);
    await expect(app.raw("DROP TABLE devices")).rejects.toThrow(/must be owner/);
    await expect(app.raw("TRUNCATE devices")).rejects.toThrow(/permission denied/);
    await expect(app.raw("CREATE SCHEMA intruder")).rejects.toThrow(/permission denied/);
  });

  it("cannot touch the migration bookkeeping or rewrite the audit trail", async () => {
    await expect(app("knex_migrations").select("name")).rejects.toThrow(/permission denied/);
    await expect(app("audit_events").delete()).rejects.toThrow(/permission denied/);
    await expect(app("audit_events").update({ action: "x" })).rejects.toThrow(/permission denied/);
    expect(Array.isArray(await app("audit_events").select("id").limit(1))).toBe(true);
  });

  it("gets the same rights on a table a later migration adds (default privileges)", async () => {
    await owner.raw("CREATE TABLE later_table (id int PRIMARY KEY)");
    try {
      await app("later_table").insert({ id: 1 });
      expect(await app("later_table").pluck("id")).toEqual([1]);
      await expect(app.raw("DROP TABLE later_table")).rejects.toThrow(/must be owner/);
    } finally {
      await owner.raw("DROP TABLE later_table");
    }
  });

  it("runs the queue: send, work, maintenance and the weekly schedules, with no DDL", async () => {
    const queue = new PgBossQueue(appUrl, { schema: queueSchema, application: "role-test" });
    try {
      const got = new Promise<{ n: number }>((resolve) => {
        void queue.work<{ n: number }>(QUEUES.sendEmail, async (job) => resolve(job.data), { pollingIntervalSeconds: 0.5 });
      });
      await queue.send(QUEUES.sendEmail, { n: 7 });
      expect(await got).toEqual({ n: 7 });
    } finally {
      await queue.stop();
    }
    const boss = new PgBoss({ connectionString: appUrl, schema: queueSchema, supervise: false, schedule: false, max: 1 });
    await boss.start();
    try {
      await expect(boss.maintain()).resolves.toBeDefined();
    } finally {
      await boss.stop({ graceful: false, wait: true });
    }
    await expect(ensureClinicalSchedules({ databaseUrl: appUrl, queueSchema, publicUrl: "" })).resolves.toBeUndefined();
    // A queue nobody prepared needs a new partition, which the role may not create.
    const stray = new PgBoss({ connectionString: appUrl, schema: queueSchema, supervise: false, schedule: false, max: 1 });
    await stray.start();
    try {
      await expect(stray.createQueue("unprepared-queue")).rejects.toThrow(/permission denied|must be owner/);
    } finally {
      await stray.stop({ graceful: false, wait: true });
    }
  }, 60_000);

  it("is prepared again without error (every start runs the same step)", async () => {
    await expect(prepareDatabase({ migrationUrl: database.url, appUrl, queueSchema, log: () => undefined })).resolves.toBeUndefined();
  }, 60_000);
});
